// `npm test`: the same set-up as `npm start` on a throwaway cluster, then every test (unit, API on
// the real PostgreSQL, browser in Debian's Chromium), ending with one pass/fail summary line.
import path from 'node:path';
import fs from 'node:fs';
import { ensureNpmPackages, ensureDebPackages, startCluster, ensureDatabase, startLocalServices, repoRoot, run, spawnChild, log } from './system.mjs';

const pgPort = Number(process.env.TWISTLOG_TEST_PG_PORT ?? 54339);
const extraArgs = process.argv.slice(2);

/** Whether a filtered run (`npm test -- shared`) can reach a browser test, which needs the built client. */
function runsBrowserTests(args) {
  const filters = args.filter((a) => !a.startsWith('-'));
  if (filters.length === 0) return true;
  const browserTests = fs.readdirSync(path.join(repoRoot, 'tests', 'browser')).map((f) => `tests/browser/${f}`);
  return browserTests.some((file) => filters.some((filter) => file.includes(filter)));
}

ensureNpmPackages();
ensureDebPackages(['chromium', 'fonts-dejavu-core']);
const clientDir = path.join(repoRoot, '.data', `dist-test-${pgPort}`);
let code = 1;
let cluster;
let services;
const report = path.join(repoRoot, '.data', `test-summary-${pgPort}.json`);
fs.rmSync(report, { force: true });
try {
  // The gate checks types first: a type error anywhere in the tree fails the run.
  log('type-checking the whole tree (tsc --noEmit)…');
  run('npx', ['tsc', '--noEmit', '-p', 'tsconfig.json'], { cwd: repoRoot });
  // Then the linter: the import boundaries of DEVELOPERS.md ("Boundaries") and the code rules.
  log('linting the whole tree (eslint)…');
  run('npx', ['eslint', '--max-warnings', '0', '.'], { cwd: repoRoot });
  // And the layout: one Prettier style for the tree (`npm run format` rewrites it).
  log('checking the layout (prettier --check)…');
  run('npx', ['prettier', '--check', '--log-level', 'warn', '.'], { cwd: repoRoot });
  // Port-specific folders let two runs (e.g. two developers on one machine) proceed side by side.
  cluster = await startCluster({ dataDir: path.join(repoRoot, '.data', `pg-test-${pgPort}`), port: pgPort, fresh: true });
  ensureDatabase(cluster, 'twistlog_test');
  // Photos go to the local S3 fake, as under `npm start` (a fresh bucket folder per run and port).
  const s3Dir = path.join(repoRoot, '.data', `s3-test-${pgPort}`);
  fs.rmSync(s3Dir, { recursive: true, force: true });
  services = await startLocalServices(['--s3', s3Dir]);
  if (runsBrowserTests(extraArgs)) {
    log('building the client for the browser tests…');
    run('npx', ['vite', 'build', '--logLevel', 'warn', '--outDir', clientDir, '--emptyOutDir'], { cwd: repoRoot });
  }
  const env = {
    ...process.env,
    NODE_ENV: 'test',
    DATABASE_URL: cluster.url('twistlog_test'),
    ...services.settings,
    PHOTO_DIR: path.join(repoRoot, '.data', `photos-test-${pgPort}`),
    CLIENT_DIR: clientDir,
    SMTP_PORT: String(pgPort + 1),
    LOG_LEVEL: process.env.LOG_LEVEL ?? 'silent',
    CHROMIUM_PATH: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    TWISTLOG_TEST_SUMMARY: report,
  };
  const { done } = spawnChild('npx', ['vitest', 'run', '--reporter=default', '--reporter=./server/scripts/test-summary-reporter.ts', ...extraArgs], {
    cwd: repoRoot,
    env,
  });
  code = await done;
} catch (err) {
  console.error(err.message);
} finally {
  await services?.stop();
  cluster?.stop();
}

let passed = 0,
  failed = 0,
  skipped = 0,
  onRetry = [];
if (fs.existsSync(report)) {
  const r = JSON.parse(fs.readFileSync(report, 'utf8'));
  ({ passed, failed, skipped } = r);
  onRetry = r.passedOnRetry;
  if (r.failedModules > 0 && failed === 0) failed = r.failedModules;
}
if (code !== 0 && failed === 0) failed = 1;
for (const name of onRetry) console.log(`passed only on a retry: ${name}`);
console.log(`\n${code === 0 && failed === 0 ? 'PASS' : 'FAIL'}: Twistlog test run`);
console.log(`summary: ${passed} passed, ${failed} failed, ${skipped} skipped, ${onRetry.length} passed only on a retry`);
process.exit(code === 0 && failed === 0 ? 0 : 1);
