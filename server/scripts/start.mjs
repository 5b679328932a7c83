// `npm start`: everything a fresh machine needs, then the app with demo data on one port.
// SIGINT (Ctrl-C) or SIGTERM stops the build or the server, then the database, at any moment;
// so does the death of the process that started us (npm killed outright): nothing is left running.
// package.json starts it with `exec`, so the shell npm runs it in becomes this process and a signal
// npm passes on reaches us (a shell waiting on a child ignores SIGINT).
import path from 'node:path';
import { ensureNpmPackages, startCluster, ensureDatabase, repoRoot, spawnChild, log } from './system.mjs';

const pgPort = Number(process.env.TWISTLOG_PG_PORT ?? 54329);
const appPort = Number(process.env.PORT ?? 5180);
const smtpPort = Number(process.env.SMTP_PORT ?? 2525);
const pgDir = path.resolve(repoRoot, process.env.TWISTLOG_PG_DIR ?? path.join('.data', 'pg'));

let cluster;
let running; // the build or the server, whichever runs now
let stopping = false;

async function shutdown(code) {
  if (stopping) return;
  stopping = true;
  if (running && running.child.exitCode === null && running.child.signalCode === null) {
    running.child.kill('SIGTERM');
    await running.done;
  }
  if (cluster) {
    log('stopping the database…');
    cluster.stop();
  }
  process.exit(code);
}
for (const sig of ['SIGINT', 'SIGTERM']) process.on(sig, () => void shutdown(0));
// npm runs this script through a shell; if npm itself is killed outright, we are re-parented.
const parent = process.ppid;
setInterval(() => {
  if (process.ppid !== parent) void shutdown(0);
}, 1000).unref();

/** Run a step as a child we can stop; a failure stops everything. */
async function step(cmd, args, opts) {
  running = spawnChild(cmd, args, { cwd: repoRoot, ...opts });
  const code = await running.done;
  if (code !== 0 && !stopping) {
    console.error(`command failed (${code}): ${cmd} ${args.join(' ')}`);
    await shutdown(1);
  }
  return code;
}

ensureNpmPackages();
try {
  cluster = await startCluster({ dataDir: pgDir, port: pgPort });
  ensureDatabase(cluster, 'twistlog');
} catch (err) {
  console.error(err.message);
  await shutdown(1);
}
if (!stopping) {
  log('building the client…');
  // Vite's own entry, not npx: one process, so a signal reaches the build itself.
  await step(process.execPath, [path.join(repoRoot, 'node_modules', 'vite', 'bin', 'vite.js'), 'build', '--logLevel', 'warn']);
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
if (!stopping) await shutdown(await step(process.execPath, ['--import', 'tsx', 'server/main.ts', '--seed-demo', '--mail-sink'], { env }));
