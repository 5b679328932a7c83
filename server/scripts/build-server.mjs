// `npm run build:server`: bundles the server into dist-server/main.mjs (and the comparison worker
// beside it) with esbuild, npm packages included, so an instance starts without compiling
// TypeScript or resolving several hundred modules (`npm run bench` measures the cold start). What
// stays outside is loaded from node_modules as usual: native code (sharp, the password hashers),
// what the server loads only when first needed (photos, PDFs, S3, migrations, the local mail
// sink), pino (its transports look for files beside it) and the database drivers Sequelize names
// but this app never uses.
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { build } from 'esbuild';
import { repoRoot } from './system.mjs';

export const serverBuildDir = path.join(repoRoot, 'dist-server');

const external = [
  'sharp',
  '@node-rs/*',
  'exifr',
  'pdfkit',
  '@aws-sdk/*',
  'umzug',
  'mailparser',
  'pino',
  'pino-http',
  'pg-native',
  'pg-query-stream',
  'tedious',
  'mysql2',
  'mariadb',
  'sqlite3',
  'oracledb',
  'ibm_db',
  'snowflake-sdk',
];

export async function buildServer(outdir = serverBuildDir) {
  await build({
    entryPoints: { main: path.join(repoRoot, 'server/main.ts'), 'compare-worker': path.join(repoRoot, 'server/services/compare-worker.ts') },
    outdir,
    outExtension: { '.js': '.mjs' },
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    external,
    // CommonJS packages inside an ES module bundle still call require() for Node's own modules.
    banner: { js: "import { createRequire as __twistlogRequire } from 'node:module'; const require = __twistlogRequire(import.meta.url);" },
    sourcemap: 'linked',
    logLevel: 'warning',
  });
  return path.join(outdir, 'main.mjs');
}

if (import.meta.url === pathToFileURL(process.argv[1]).href) {
  console.log(`built ${path.relative(repoRoot, await buildServer())}`);
}
