// Photos in a folder of this machine (PHOTO_DIR): for one instance in development. Each file is
// written under a temporary name and renamed, so a crash never leaves half a photo.
import fs from 'node:fs';
import fsp from 'node:fs/promises';
import path from 'node:path';
import type { PhotoStore } from './photo-store';

export function diskStore(folder: string): PhotoStore {
  const dir = path.resolve(folder);
  const at = (name: string) => path.join(dir, name);
  return {
    where: dir,
    async put(name, data) {
      await fsp.mkdir(dir, { recursive: true });
      const tmp = at(`.${name}.tmp`);
      await fsp.writeFile(tmp, data, { flag: 'wx' });
      await fsp.rename(tmp, at(name));
    },
    async get(name) {
      try {
        const { size } = await fsp.stat(at(name));
        return { body: fs.createReadStream(at(name)), bytes: size };
      } catch (err) {
        if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
        throw err;
      }
    },
    async remove(names) {
      await Promise.all(names.map((n) => fsp.rm(at(n), { force: true })));
    },
    async list() {
      return fs.existsSync(dir) ? (await fsp.readdir(dir)).filter((n) => !n.startsWith('.')) : [];
    },
    async check() {
      await fsp.mkdir(dir, { recursive: true });
      await fsp.access(dir, fs.constants.W_OK);
    },
  };
}
