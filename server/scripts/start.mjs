// `npm start`: everything a fresh machine needs, then the app with demo data. `npm start --
// --instances N` (or TWISTLOG_INSTANCES=N) runs N app processes on ports PORT, PORT+1, … against
// one database, one S3-compatible photo store and one mail sink, as N instances behind a proxy
// would run: the first migrates and seeds, the others start once it is ready.
// SIGINT (Ctrl-C) or SIGTERM stops the build or the servers (each drains its requests), the local
// services, then the database, at any moment; so does the death of the process that started us
// (npm killed outright): nothing is left running. package.json starts it with `exec`, so the
// shell npm runs it in becomes this process and a signal npm passes on reaches us.
import path from 'node:path';
import { ensureNpmPackages, startCluster, ensureDatabase, startLocalServices, repoRoot, spawnChild, log } from './system.mjs';

const argValue = (name) => {
  const i = process.argv.indexOf(name);
  return i >= 0 ? process.argv[i + 1] : undefined;
};
const instances = Number(argValue('--instances') ?? process.env.TWISTLOG_INSTANCES ?? 1);
if (!Number.isInteger(instances) || instances < 1 || instances > 16) {
  console.error(`--instances must be a whole number from 1 to 16 (got ${argValue('--instances') ?? process.env.TWISTLOG_INSTANCES})`);
  process.exit(1);
}
const pgPort = Number(process.env.TWISTLOG_PG_PORT ?? 54329);
const appPort = Number(process.env.PORT ?? 5180);
const smtpPort = Number(process.env.SMTP_PORT ?? 2525);
const pgDir = path.resolve(repoRoot, process.env.TWISTLOG_PG_DIR ?? path.join('.data', 'pg'));
const s3Dir = path.resolve(repoRoot, process.env.TWISTLOG_S3_DIR ?? path.join('.data', 's3'));

let cluster;
let services;
let build; // the client build while it runs
const servers = [];
let stopping = false;

const alive = (c) => c.exitCode === null && c.signalCode === null;

async function shutdown(code) {
  if (stopping) return;
  stopping = true;
  const children = [build, ...servers].filter((r) => r && alive(r.child));
  for (const r of children) r.child.kill('SIGTERM');
  await Promise.all(children.map((r) => r.done));
  await services?.stop();
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

async function waitReady(port, server) {
  for (;;) {
    if (stopping || !alive(server.child)) return false;
    try {
      if ((await fetch(`http://127.0.0.1:${port}/api/ready`)).ok) return true;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 100));
  }
}

ensureNpmPackages();
try {
  cluster = await startCluster({ dataDir: pgDir, port: pgPort });
  ensureDatabase(cluster, 'twistlog');
  // Photos in the local S3 fake (kept under .data/s3 between runs), e-mail in the local sink.
  services = await startLocalServices(['--s3', s3Dir, '--mail', String(smtpPort)]);
} catch (err) {
  console.error(err.message);
  await shutdown(1);
}
if (!stopping) {
  log('building the client…');
  // Vite's own entry, not npx: one process, so a signal reaches the build itself.
  build = spawnChild(process.execPath, [path.join(repoRoot, 'node_modules', 'vite', 'bin', 'vite.js'), 'build', '--logLevel', 'warn'], { cwd: repoRoot });
  const code = await build.done;
  if (code !== 0 && !stopping) {
    console.error(`the client build failed (${code})`);
    await shutdown(1);
  }
}

const env = {
  ...process.env,
  NODE_ENV: process.env.NODE_ENV ?? 'development',
  DATABASE_URL: process.env.DATABASE_URL ?? cluster.url('twistlog'),
  ...services.settings,
  // Fewer glibc malloc arenas: memory freed after a photo decode is reused instead of piling up
  // (sharp's advice for glibc systems; tests/api/photo-memory.test.ts measures it).
  MALLOC_ARENA_MAX: process.env.MALLOC_ARENA_MAX ?? '2',
};
for (let i = 0; i < instances && !stopping; i++) {
  const port = appPort + i;
  const args = ['--import', 'tsx', 'server/main.ts', ...(i === 0 ? ['--seed-demo'] : [])];
  const server = spawnChild(process.execPath, args, { cwd: repoRoot, env: { ...env, PORT: String(port) } });
  servers.push(server);
  // Any server ending on its own (a crash, a bad setting) stops the whole run.
  void server.done.then((code) => {
    if (!stopping) {
      console.error(`the app on port ${port} stopped (${code})`);
      void shutdown(code || 1);
    }
  });
  // The first instance migrates and seeds; the others start after it, as a release step would order it.
  if (i === 0 && instances > 1) await waitReady(port, server);
}
if (instances > 1 && !stopping) log(`${instances} instances on ports ${appPort}–${appPort + instances - 1}, one database, one photo store, one mail sink`);
