// `npm test`: the same set-up as `npm start` on a throwaway cluster, then every test (unit, API on
// the real PostgreSQL, browser in Debian's Chromium), ending with one pass/fail summary line.
import path from 'node:path';
import fs from 'node:fs';
import { ensureNpmPackages, ensureDebPackages, startCluster, ensureDatabase, repoRoot, run, spawnChild, log } from './system.mjs';

const pgPort = Number(process.env.TWISTLOG_TEST_PG_PORT ?? 54339);
const extraArgs = process.argv.slice(2);

ensureNpmPackages();
ensureDebPackages(['chromium', 'fonts-dejavu-core']);
// Port-specific folders let two runs (e.g. two developers on one machine) proceed side by side.
const cluster = await startCluster({ dataDir: path.join(repoRoot, '.data', `pg-test-${pgPort}`), port: pgPort, fresh: true });
const clientDir = path.join(repoRoot, '.data', `dist-test-${pgPort}`);
let code = 1;
const report = path.join(repoRoot, '.data', `test-report-${pgPort}.json`);
try {
  ensureDatabase(cluster, 'twistlog_test');
  log('building the client for the browser tests…');
  run('npx', ['vite', 'build', '--logLevel', 'warn', '--outDir', clientDir, '--emptyOutDir'], { cwd: repoRoot });
  fs.rmSync(report, { force: true });
  const env = {
    ...process.env,
    NODE_ENV: 'test',
    DATABASE_URL: cluster.url('twistlog_test'),
    PHOTO_DIR: path.join(repoRoot, '.data', `photos-test-${pgPort}`),
    CLIENT_DIR: clientDir,
    SMTP_PORT: String(pgPort + 1),
    LOG_LEVEL: process.env.LOG_LEVEL ?? "silent",
    CHROMIUM_PATH: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
  };
  const { done } = spawnChild('npx', ['vitest', 'run', '--reporter=default', '--reporter=json', `--outputFile.json=${report}`, ...extraArgs], { cwd: repoRoot, env });
  code = await done;
} catch (err) {
  console.error(err.message);
} finally {
  cluster.stop();
}

let passed = 0, failed = 0, skipped = 0;
if (fs.existsSync(report)) {
  const r = JSON.parse(fs.readFileSync(report, 'utf8'));
  passed = r.numPassedTests; failed = r.numFailedTests; skipped = r.numPendingTests + (r.numTodoTests ?? 0);
  if (r.numFailedTestSuites > 0 && failed === 0) failed = r.numFailedTestSuites;
}
if (code !== 0 && failed === 0) failed = 1;
console.log(`\n${code === 0 ? 'PASS' : 'FAIL'}: Twistlog test run`);
console.log(`summary: ${passed} passed, ${failed} failed, ${skipped} skipped`);
process.exit(code === 0 && failed === 0 ? 0 : 1);
