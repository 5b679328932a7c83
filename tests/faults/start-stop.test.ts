// `npm start` stops cleanly: SIGTERM or SIGINT sent to the npm process (as a process manager or a
// closed terminal would) stops the client build or the server, and PostgreSQL, leaving no process
// behind, at any moment; so does npm being killed outright. Runs the real `npm start` on ports and
// a database folder of its own.
import { afterAll, describe, expect, it } from 'vitest';
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { freePort } from './fault-rig';
import { repoRoot } from '../support/test-app';

const started: ChildProcess[] = [];
const folders: string[] = [];
afterAll(() => {
  for (const c of started) if (c.exitCode === null) c.kill('SIGKILL');
  for (const f of folders) fs.rmSync(f, { recursive: true, force: true });
});

/** Every process whose command line mentions `needle` (from /proc). */
function processesWith(needle: string): { pid: number; cmd: string }[] {
  const out: { pid: number; cmd: string }[] = [];
  for (const entry of fs.readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const cmd = fs.readFileSync(`/proc/${entry}/cmdline`, 'utf8').replace(/\0/g, ' ');
      const env = fs.readFileSync(`/proc/${entry}/environ`, 'utf8');
      if (cmd.includes(needle) || env.includes(needle)) out.push({ pid: Number(entry), cmd });
    } catch {
      // gone, or not ours to read
    }
  }
  return out;
}

const portOpen = (port: number) =>
  new Promise<boolean>((resolve) => {
    const s = net.connect(port, '127.0.0.1');
    s.once('connect', () => (s.destroy(), resolve(true)));
    s.once('error', () => resolve(false));
  });

async function npmStart(waitFor: RegExp) {
  const [pgPort, appPort, smtpPort] = [await freePort(), await freePort(), await freePort()];
  // A marker every process of this run carries in its environment, and the cluster in its command line.
  const pgDir = path.join('.data', `pg-start-stop-${pgPort}`);
  const s3Dir = path.join('.data', `s3-start-stop-${pgPort}`);
  folders.push(path.resolve(repoRoot, s3Dir));
  // The test run's own database and folders are not this run's.
  const { DATABASE_URL: _db, PHOTO_DIR: _photos, CLIENT_DIR: _client, ...inherited } = process.env;
  const env = Object.fromEntries(Object.entries(inherited).filter(([k]) => !k.startsWith('S3_')));
  const child = spawn('npm', ['start'], {
    cwd: repoRoot,
    env: {
      ...env,
      NODE_ENV: 'development',
      TWISTLOG_PG_PORT: String(pgPort),
      PORT: String(appPort),
      SMTP_PORT: String(smtpPort),
      TWISTLOG_PG_DIR: pgDir,
      TWISTLOG_S3_DIR: s3Dir,
      LOG_LEVEL: 'warn',
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  started.push(child);
  let output = '';
  child.stdout!.on('data', (d) => (output += d));
  child.stderr!.on('data', (d) => (output += d));
  const deadline = Date.now() + 300_000;
  while (!waitFor.test(output)) {
    if (child.exitCode !== null) throw new Error(`npm start exited early:\n${output}`);
    if (Date.now() > deadline) throw new Error(`npm start never printed ${waitFor}:\n${output}`);
    await new Promise((r) => setTimeout(r, 250));
  }
  const marker = path.resolve(repoRoot, pgDir);
  folders.push(marker);
  // The local services (S3 fake, mail sink) carry their folder in their command line.
  return { child, pgPort, appPort, marker, s3Marker: path.resolve(repoRoot, s3Dir), output: () => output };
}

async function expectAllGone(run: Awaited<ReturnType<typeof npmStart>>) {
  const exited = await Promise.race([
    new Promise<boolean>((r) => (run.child.exitCode !== null ? r(true) : run.child.once('exit', () => r(true)))),
    new Promise<boolean>((r) => setTimeout(() => r(false), 30_000)),
  ]);
  expect(exited, run.output()).toBe(true);
  // Whatever was started must stop within a few seconds of npm.
  const deadline = Date.now() + 20_000;
  const running = () => [...processesWith(run.marker), ...processesWith(run.s3Marker)];
  let left = running();
  while (left.length && Date.now() < deadline) {
    await new Promise((r) => setTimeout(r, 500));
    left = running();
  }
  expect(
    left.map((p) => `${p.pid} ${p.cmd}`),
    run.output(),
  ).toEqual([]);
  expect(await portOpen(run.appPort)).toBe(false);
  expect(await portOpen(run.pgPort)).toBe(false);
  expect(fs.existsSync(path.join(run.marker, 'postmaster.pid'))).toBe(false);
}

describe('npm start stops with nothing left running', () => {
  it('on SIGINT while the client is being built', async () => {
    const run = await npmStart(/building the client/);
    expect(processesWith(run.marker).some((p) => p.cmd.includes('postgres'))).toBe(true);
    run.child.kill('SIGINT');
    await expectAllGone(run);
  }, 360_000);

  it('on SIGTERM while serving', async () => {
    const run = await npmStart(/Twistlog is running at/);
    expect(await portOpen(run.appPort)).toBe(true);
    run.child.kill('SIGTERM');
    await expectAllGone(run);
  }, 360_000);

  it('when npm is killed outright while serving', async () => {
    const run = await npmStart(/Twistlog is running at/);
    run.child.kill('SIGKILL');
    await expectAllGone(run);
  }, 360_000);
});
