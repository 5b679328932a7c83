// Photo files on disk: the re-encoded copy and its thumbnail, under PHOTO_DIR, with names the
// server makes up (a random UUID). A client's file name never reaches the file system.
import fs from 'node:fs/promises';
import path from 'node:path';
import { randomUUID } from 'node:crypto';

/** PHOTO_DIR (server/config.ts), resolved once per call so a test run's folder is honoured. */
export function photoDir(): string {
  return path.resolve(process.env.PHOTO_DIR ?? '.data/photos');
}

export interface StoredPhotoFiles {
  storedName: string;
  thumbName: string;
}

/** Writes both files atomically (temporary name, then rename), so a crash never leaves half a photo. */
export async function writePhotoFiles(photo: Buffer, thumb: Buffer): Promise<StoredPhotoFiles> {
  const dir = photoDir();
  await fs.mkdir(dir, { recursive: true });
  const base = randomUUID();
  const files = { storedName: `${base}.jpg`, thumbName: `${base}.thumb.jpg` };
  for (const [name, data] of [[files.storedName, photo], [files.thumbName, thumb]] as const) {
    const tmp = path.join(dir, `.${name}.tmp`);
    await fs.writeFile(tmp, data, { flag: 'wx' });
    await fs.rename(tmp, path.join(dir, name));
  }
  return files;
}

export async function removePhotoFiles(files: StoredPhotoFiles): Promise<void> {
  const dir = photoDir();
  await Promise.all([files.storedName, files.thumbName].map((n) => fs.rm(path.join(dir, n), { force: true })));
}

/** Absolute path of a stored name; only names this module made (UUID-based) are accepted. */
export function photoPath(name: string): string {
  if (!/^[0-9a-f-]{36}(\.thumb)?\.jpg$/.test(name)) throw new Error(`not a stored photo name: ${name}`);
  return path.join(photoDir(), name);
}
