// `npm run bench`: the same set-up as `npm test` on a throwaway cluster of its own, the client and
// the server built as deployed, then every benchmark (BENCH_ONLY=client,envelope,ingest,load,tap,cold
// runs a part); prints one table and writes it to bench-results/latest.md. Takes about five minutes.
import path from 'node:path';
import { buildServer } from './build-server.mjs';
import { ensureNpmPackages, ensureDebPackages, startCluster, ensureDatabase, repoRoot, run, spawnChild, log } from './system.mjs';

const pgPort = Number(process.env.TWISTLOG_BENCH_PG_PORT ?? 54349);

ensureNpmPackages();
ensureDebPackages(['chromium', 'fonts-dejavu-core']);
const cluster = await startCluster({ dataDir: path.join(repoRoot, '.data', `pg-bench-${pgPort}`), port: pgPort, fresh: true });
let code = 1;
try {
  ensureDatabase(cluster, 'twistlog_bench');
  const clientDir = path.join(repoRoot, '.data', `dist-bench-${pgPort}`);
  log('building the client…');
  run('npx', ['vite', 'build', '--logLevel', 'warn', '--outDir', clientDir, '--emptyOutDir'], { cwd: repoRoot });
  log('bundling the server…');
  const serverBundle = await buildServer(path.join(repoRoot, '.data', `server-build-bench-${pgPort}`));
  const env = {
    ...process.env,
    NODE_ENV: 'production',
    DATABASE_URL: cluster.url('twistlog_bench'),
    CLIENT_DIR: clientDir,
    SERVER_BUNDLE: serverBundle,
    PHOTO_DIR: path.join(repoRoot, '.data', `photos-bench-${pgPort}`),
    SMTP_PORT: String(pgPort + 1),
    CHROMIUM_PATH: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
  };
  const { done } = spawnChild(process.execPath, ['--import', 'tsx', 'server/scripts/bench/run.ts'], { cwd: repoRoot, env });
  code = await done;
} catch (err) {
  console.error(err.message);
} finally {
  cluster.stop();
}
process.exit(code);
