// `npm run bench`: the same set-up as `npm test` on a throwaway cluster of its own, then every
// benchmark; prints one table and writes it to bench-results/latest.md.
import path from 'node:path';
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
  const env = {
    ...process.env,
    NODE_ENV: 'production',
    DATABASE_URL: cluster.url('twistlog_bench'),
    CLIENT_DIR: clientDir,
    PHOTO_DIR: path.join(repoRoot, '.data', `photos-bench-${pgPort}`),
    SMTP_PORT: String(pgPort + 1),
    LOG_LEVEL: 'silent',
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
