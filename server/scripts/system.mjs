// System set-up shared by `npm start` and `npm test`: npm packages, Debian packages
// (PostgreSQL, Chromium), and a private PostgreSQL cluster on loopback. Node built-ins only,
// because this runs before node_modules exists on a fresh clone.
import { spawnSync, spawn } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import os from 'node:os';
import net from 'node:net';

export const repoRoot = path.resolve(path.dirname(new URL(import.meta.url).pathname), '../..');
const isRoot = process.getuid?.() === 0;

export function log(msg) {
  process.stdout.write(`[twistlog] ${msg}\n`);
}

export function run(cmd, args, opts = {}) {
  const r = spawnSync(cmd, args, { stdio: opts.quiet ? 'pipe' : 'inherit', encoding: 'utf8', ...opts });
  if (r.status !== 0 && !opts.allowFail) {
    const out = opts.quiet ? `\n${r.stdout ?? ''}${r.stderr ?? ''}` : '';
    throw new Error(`command failed (${r.status}): ${cmd} ${args.join(' ')}${out}`);
  }
  return r;
}

function asRootArgs(cmd, args) {
  if (isRoot) return [cmd, args];
  return ['sudo', ['-n', cmd, ...args]];
}

/** Install npm packages when node_modules is missing or older than the lock file. */
export function ensureNpmPackages() {
  const lock = path.join(repoRoot, 'package-lock.json');
  const marker = path.join(repoRoot, 'node_modules', '.package-lock.json');
  if (fs.existsSync(marker) && fs.statSync(marker).mtimeMs >= fs.statSync(lock).mtimeMs) return;
  log('installing npm packages (npm ci)…');
  run('npm', ['ci', '--no-audit', '--no-fund'], { cwd: repoRoot });
}

let aptUpdated = false;
/** Install Debian packages that are missing; `apt-get update` once per run. */
export function ensureDebPackages(pkgs) {
  const missing = pkgs.filter((p) => {
    const r = spawnSync('dpkg-query', ['-W', '-f=${Status}', p], { encoding: 'utf8' });
    return !(r.status === 0 && r.stdout.includes('install ok installed'));
  });
  if (missing.length === 0) return;
  log(`installing Debian packages: ${missing.join(', ')}…`);
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  if (!aptUpdated) {
    run(...asRootArgs('apt-get', ['update', '-qq']), { env });
    aptUpdated = true;
  }
  run(...asRootArgs('apt-get', ['install', '-y', '-qq', '--no-install-recommends', ...missing]), { env });
}

export function postgresBinDir() {
  const base = '/usr/lib/postgresql';
  const versions = fs.existsSync(base) ? fs.readdirSync(base).filter((v) => fs.existsSync(path.join(base, v, 'bin', 'initdb'))) : [];
  versions.sort((a, b) => Number(b) - Number(a));
  if (!versions.length) throw new Error('PostgreSQL server binaries not found under /usr/lib/postgresql');
  return path.join(base, versions[0], 'bin');
}

/** Run a PostgreSQL binary as the postgres system user when we are root (it refuses root). */
function pgRun(bin, args, opts = {}) {
  if (isRoot) return run('runuser', ['-u', 'postgres', '--', bin, ...args], opts);
  return run(bin, args, opts);
}

function portFree(port) {
  return new Promise((resolve) => {
    const s = net.createServer();
    s.once('error', () => resolve(false));
    s.listen(port, '127.0.0.1', () => s.close(() => resolve(true)));
  });
}

/**
 * A private cluster in `dataDir` on 127.0.0.1:`port`, owned by the postgres user when we are
 * root. The data folder must be reachable by that user, so when the repo sits in a folder it
 * cannot enter, the cluster lives under the system temp folder instead.
 */
export async function startCluster({ dataDir, port, fresh = false }) {
  ensureDebPackages(['postgresql']);
  const bin = postgresBinDir();
  let dir = dataDir;
  fs.mkdirSync(path.dirname(dir), { recursive: true, mode: 0o755 });
  if (isRoot) {
    const probe = spawnSync('runuser', ['-u', 'postgres', '--', 'test', '-x', path.dirname(dir)]);
    if (probe.status !== 0) {
      dir = path.join(os.tmpdir(), `twistlog-${path.basename(dir)}-${Buffer.from(repoRoot).toString('hex').slice(-12)}`);
    }
  }
  const pidFile = path.join(dir, 'postmaster.pid');
  if (fresh && fs.existsSync(dir)) {
    if (fs.existsSync(pidFile)) pgRun(path.join(bin, 'pg_ctl'), ['-D', dir, '-m', 'immediate', 'stop'], { quiet: true, allowFail: true });
    fs.rmSync(dir, { recursive: true, force: true });
  }
  if (!fs.existsSync(path.join(dir, 'PG_VERSION'))) {
    fs.mkdirSync(dir, { recursive: true, mode: 0o700 });
    if (isRoot) run('chown', ['-R', 'postgres:postgres', dir]);
    log(`creating PostgreSQL cluster in ${dir}`);
    pgRun(path.join(bin, 'initdb'), ['-D', dir, '-U', 'postgres', '--auth=trust', '-E', 'UTF8', '--locale=C.UTF-8'], { quiet: true });
  }
  // A cluster left running by an earlier run that was killed: stop it before starting ours.
  if (fs.existsSync(pidFile)) pgRun(path.join(bin, 'pg_ctl'), ['-D', dir, '-m', 'fast', 'stop'], { quiet: true, allowFail: true });
  if (!(await portFree(port))) throw new Error(`port ${port} on 127.0.0.1 is taken; set TWISTLOG_PG_PORT to another port`);
  const logFile = path.join(dir, 'server.log');
  pgRun(
    path.join(bin, 'pg_ctl'),
    [
      '-D',
      dir,
      '-l',
      logFile,
      '-w',
      '-t',
      '60',
      '-o',
      `-c listen_addresses=127.0.0.1 -c port=${port} -c unix_socket_directories=${dir} -c max_connections=200 -c fsync=${fresh ? 'off' : 'on'}`,
      'start',
    ],
    { quiet: true },
  );
  const stop = () => pgRun(path.join(bin, 'pg_ctl'), ['-D', dir, '-m', 'fast', '-w', 'stop'], { quiet: true, allowFail: true });
  return { dir, port, bin, stop, url: (db) => `postgres://postgres@127.0.0.1:${port}/${db}` };
}

/** Stop a cluster the hard way (as a crash would), for fault tests. */
export function stopClusterNow(cluster) {
  pgRun(path.join(cluster.bin, 'pg_ctl'), ['-D', cluster.dir, '-m', 'immediate', '-w', 'stop'], { quiet: true, allowFail: true });
}

/** Create the database if it does not exist yet. */
export function ensureDatabase(cluster, name) {
  const psql = path.join(cluster.bin, 'psql');
  const q = spawnSync(psql, ['-h', '127.0.0.1', '-p', String(cluster.port), '-U', 'postgres', '-tAc', `SELECT 1 FROM pg_database WHERE datname='${name}'`], {
    encoding: 'utf8',
  });
  if (q.status !== 0) throw new Error(`psql failed: ${q.stderr}`);
  if (q.stdout.trim() === '1') return;
  run(psql, ['-h', '127.0.0.1', '-p', String(cluster.port), '-U', 'postgres', '-qc', `CREATE DATABASE "${name}"`], { quiet: true });
}

/** Spawn a child that dies with us; resolves with its exit code. */
export function spawnChild(cmd, args, opts = {}) {
  const child = spawn(cmd, args, { stdio: 'inherit', ...opts });
  const done = new Promise((resolve) => child.on('exit', (code, signal) => resolve(code ?? (signal ? 1 : 0))));
  return { child, done };
}

/**
 * The local stand-ins for hosted services (server/scripts/local-services.ts) in a child process:
 * `args` choose them (`--s3 DIR`, `--mail PORT`). Resolves once they listen, with the settings
 * the app needs (S3_*, SMTP_*, MAIL_SINK_URL); `stop()` ends the process.
 */
export async function startLocalServices(args, opts = {}) {
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/scripts/local-services.ts', ...args], {
    cwd: repoRoot,
    stdio: ['ignore', 'pipe', 'inherit'],
    ...opts,
  });
  const done = new Promise((resolve) => child.on('exit', (code, signal) => resolve(code ?? (signal ? 1 : 0))));
  const settings = await new Promise((resolve, reject) => {
    let out = '';
    child.stdout.on('data', (d) => {
      out += d;
      const m = /local services ready (\{.*\})\n/.exec(out);
      if (m) resolve(JSON.parse(m[1]));
    });
    void done.then((code) => reject(new Error(`local services exited (${code}) before they were ready:\n${out}`)));
  });
  const stop = async () => {
    if (child.exitCode === null && child.signalCode === null) child.kill('SIGTERM');
    await done;
  };
  return { child, done, settings, stop };
}
