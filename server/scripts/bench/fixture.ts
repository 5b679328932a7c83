// The benchmark's servers and data. The app runs as it is deployed — the bundled server
// (dist-server/main.mjs, built by bench.mjs) in production mode, one process per instance — and
// the bare reference B2 in a process of its own; this process only sets up data and generates
// load, so the load generator never shares a process (or an event loop) with what it measures.
import { spawn, type ChildProcess } from 'node:child_process';
import net from 'node:net';
import path from 'node:path';
import { randomUUID } from 'node:crypto';
import { createSequelize } from '../../db';
import { initModels, MembershipModel, TeamModel, UserModel } from '../../models';
import { migrate } from '../../migrate';
import { hashPassword, startSession } from '../../auth/lucia';
import { newGaugePoint, newPose, newReading, newTestSession, newVehicle } from '../../../shared/records';
import { repoRoot } from '../../paths';

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = net.createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const { port } = s.address() as net.AddressInfo;
      s.close(() => resolve(port));
    });
  });
}

export interface Child {
  baseUrl: string;
  pid: number;
  /** Milliseconds from spawning the process to its first successful health answer. */
  startMs: number;
  stop(): Promise<void>;
}

async function stopChild(child: ChildProcess) {
  if (child.exitCode !== null || child.signalCode) return;
  const exited = new Promise((r) => child.once('exit', r));
  child.kill('SIGTERM');
  await exited;
}

/** The environment of an app instance under the bench: production, as a deployment runs it. */
export function appEnv(databaseUrl: string, port: number): NodeJS.ProcessEnv {
  return {
    ...process.env,
    NODE_ENV: 'production',
    DATABASE_URL: databaseUrl,
    PORT: String(port),
    LOG_LEVEL: process.env.BENCH_APP_LOG_LEVEL ?? 'info',
    PHOTO_DIR: process.env.PHOTO_DIR ?? path.join(repoRoot, '.data', 'photos-bench'),
  };
}

/**
 * Node's own flags for the app instances only, from APP_NODE_ARGS (space-separated), say
 * `--cpu-prof --cpu-prof-dir=.data/prof`: on the command line, since Node refuses `--cpu-prof` in
 * NODE_OPTIONS. A profile is written when the instance exits, which stop() makes it do.
 */
const appNodeArgs = () => (process.env.APP_NODE_ARGS ?? '').split(' ').filter(Boolean);

/** One app instance: `node <bundle>` (or the TypeScript sources when `bundle` is null), with `env` added, its output discarded. */
export async function startInstance(
  databaseUrl: string,
  bundle: string | null = process.env.SERVER_BUNDLE ?? null,
  env: Record<string, string> = {},
): Promise<Child> {
  const port = await freePort();
  const started = performance.now();
  const child = spawn(process.execPath, [...appNodeArgs(), ...(bundle ? [bundle] : ['--import', 'tsx', 'server/main.ts'])], {
    cwd: repoRoot,
    env: { ...appEnv(databaseUrl, port), ...env },
    stdio: ['ignore', 'ignore', 'inherit'],
  });
  const baseUrl = `http://127.0.0.1:${port}`;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`the app instance exited during start-up (${child.exitCode})`);
    try {
      if ((await fetch(`${baseUrl}/api/health`)).ok) break;
    } catch {
      // not listening yet
    }
    if (performance.now() - started > 60_000) throw new Error('the app instance did not answer within 60 s');
    await new Promise((r) => setTimeout(r, 5));
  }
  return { baseUrl, pid: child.pid!, startMs: performance.now() - started, stop: () => stopChild(child) };
}

/** B2, the bare reference handler (bare-b2.ts), in a process of its own. */
export async function startB2(databaseUrl: string): Promise<Child> {
  const started = performance.now();
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/scripts/bench/bare-b2.ts'], {
    cwd: repoRoot,
    env: { ...process.env, DATABASE_URL: databaseUrl },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  const port = await new Promise<number>((resolve, reject) => {
    let out = '';
    child.stdout!.on('data', (d) => {
      out += d;
      const m = /b2 listening (\d+)/.exec(out);
      if (m) resolve(Number(m[1]));
    });
    child.once('exit', (code) => reject(new Error(`B2 exited during start-up (${code})`)));
  });
  return { baseUrl: `http://127.0.0.1:${port}`, pid: child.pid!, startMs: performance.now() - started, stop: () => stopChild(child) };
}

/** The bench's database (migrated here, so instances start on a current schema) and one app instance. */
export async function startBenchServer(databaseUrl: string) {
  const sequelize = createSequelize(databaseUrl, 4);
  initModels(sequelize);
  await migrate(sequelize);
  const app = await startInstance(databaseUrl);
  const baseUrl = app.baseUrl;
  const { teamId, userId, headers } = await newWorkshop(baseUrl);
  return {
    databaseUrl,
    sequelize,
    app,
    baseUrl,
    teamId,
    userId,
    headers,
    newWorkshop: () => newWorkshop(baseUrl),
    async post(path: string, body: unknown, asHeaders = headers) {
      const res = await fetch(baseUrl + path, { method: 'POST', headers: asHeaders, body: JSON.stringify(body) });
      if (!res.ok) throw new Error(`${path}: ${res.status} ${await res.text()}`);
      return res.json();
    },
    async close() {
      await app.stop();
      await sequelize.close();
    },
  };
}

/** A workshop with one engineer signed in; its request headers carry the session and Origin. */
async function newWorkshop(baseUrl: string) {
  const teamId = randomUUID();
  const userId = randomUUID();
  await TeamModel.create({ id: teamId, name: 'Bench workshop' });
  await UserModel.create({
    id: userId,
    email: `bench-${userId.slice(0, 8)}@bench.test`,
    name: 'Bench engineer',
    passwordHash: await hashPassword(randomUUID()),
  });
  await MembershipModel.create({ id: randomUUID(), teamId, userId, role: 'engineer' });
  const cookie = (await startSession(userId, teamId)).split(';')[0];
  return { teamId, userId, headers: { 'Content-Type': 'application/json', Origin: baseUrl, Cookie: cookie } };
}

export type BenchServer = Awaited<ReturnType<typeof startBenchServer>>;

/** A vehicle with 12 gauge points and a session with enough poses for `readings` readings. */
export function sessionChanges(readings: number) {
  const vehicleId = randomUUID();
  const sessionId = randomUUID();
  const points = Array.from({ length: 12 }, (_, i) =>
    newGaugePoint({ vehicleId, label: `P${i + 1}`, yMm: -330 + (i % 4) * 220, zMm: 370 + Math.floor(i / 4) * 230 }),
  );
  const poseCount = Math.ceil(readings / 36);
  const poses = Array.from({ length: poseCount }, (_, seq) =>
    newPose({ sessionId, seq, label: `Pose ${seq}`, kind: seq === 0 ? 'level' : 'wheels', liftFlMm: seq === 0 ? 0 : 50 + (seq % 400) }),
  );
  const readingRows = poses
    .flatMap((p, pi) =>
      points.flatMap((g) =>
        (['foreAft', 'lateral', 'vertical'] as const).map((axis) =>
          newReading({ poseId: p.id, gaugePointId: g.id, axis, valueMm: Math.round((10 + pi * 0.1) * 10) / 10 }),
        ),
      ),
    )
    .slice(0, readings);
  const parents = [
    { entity: 'vehicle', record: newVehicle({ id: vehicleId, name: 'Bench truck', trackRearMm: 1880 }) },
    ...points.map((record) => ({ entity: 'gaugePoint', record })),
    {
      entity: 'testSession',
      record: newTestSession({ id: sessionId, vehicleId, title: 'Bench', testedOn: '2026-12-01', safetyAckAt: new Date().toISOString() }),
    },
    ...poses.map((record) => ({ entity: 'pose', record })),
  ];
  return { sessionId, parents, readings: readingRows };
}
