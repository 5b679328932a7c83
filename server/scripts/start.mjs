// `npm start`: everything a fresh machine needs, then the app with demo data on one port.
// Ctrl-C stops the server and the database.
import path from 'node:path';
import { ensureNpmPackages, startCluster, ensureDatabase, repoRoot, run, spawnChild, log } from './system.mjs';

const pgPort = Number(process.env.TWISTLOG_PG_PORT ?? 54329);
const appPort = Number(process.env.PORT ?? 5180);
const smtpPort = Number(process.env.SMTP_PORT ?? 2525);

ensureNpmPackages();
const cluster = await startCluster({ dataDir: path.join(repoRoot, '.data', 'pg'), port: pgPort });
let stopped = false;
const shutdown = (code) => {
  if (stopped) return;
  stopped = true;
  log('stopping the database…');
  cluster.stop();
  process.exit(code);
};
try {
  ensureDatabase(cluster, 'twistlog');
  log('building the client…');
  run('npx', ['vite', 'build', '--logLevel', 'warn'], { cwd: repoRoot });
} catch (err) {
  console.error(err.message);
  shutdown(1);
}

const env = {
  ...process.env,
  NODE_ENV: process.env.NODE_ENV ?? 'development',
  DATABASE_URL: process.env.DATABASE_URL ?? cluster.url('twistlog'),
  PORT: String(appPort),
  SMTP_PORT: String(smtpPort),
  PHOTO_DIR: process.env.PHOTO_DIR ?? path.join(repoRoot, '.data', 'photos'),
  // Fewer glibc malloc arenas: memory freed after a photo decode is reused instead of piling up
  // (sharp's advice for glibc systems; tests/api/photo-memory.test.ts measures it).
  MALLOC_ARENA_MAX: process.env.MALLOC_ARENA_MAX ?? '2',
};
const { child, done } = spawnChild(process.execPath, ['--import', 'tsx', 'server/main.ts', '--seed-demo', '--mail-sink'], { cwd: repoRoot, env });
for (const sig of ['SIGINT', 'SIGTERM']) process.on(sig, () => child.kill('SIGTERM'));
shutdown(await done);
