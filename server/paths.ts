// The repository's root folder, found by walking up from this module to package.json, so paths to
// fonts/, migrations/ and dist/ are the same whether the server runs from its TypeScript sources
// (server/…) or bundled into one file (dist-server/, server/scripts/build-server.mjs).
import fs from 'node:fs';
import path from 'node:path';

function findRoot(from: string): string {
  for (let dir = from; ; dir = path.dirname(dir)) {
    if (fs.existsSync(path.join(dir, 'package.json'))) return dir;
    if (path.dirname(dir) === dir) throw new Error(`no package.json above ${from}`);
  }
}

export const repoRoot = findRoot(import.meta.dirname);

/** True when this code runs from the bundle rather than from its TypeScript sources under tsx. */
export const runsBundled = !import.meta.url.endsWith('.ts');
