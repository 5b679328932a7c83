// Faults during sync, against the real server process and a PostgreSQL cluster of this file's own:
// the database crashing mid-sync, the server killed mid-batch, and many clients on a small pool.
// Each ends with every record in PostgreSQL exactly once.
import 'fake-indexeddb/auto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { QueryTypes, type Sequelize } from 'sequelize';
import { FieldDb } from '@/lib/db/field-db';
import { saveRecords } from '@/lib/db/records';
import { runSync } from '@/features/sync/engine/sync-run';
import { createSequelize } from '../../server/db';
import { initModels } from '../../server/models';
import { migrate } from '../../server/migrate';
import { startSession } from '../../server/auth/lucia';
import { createTeam, TEST_PASSWORD, type TestTeam } from '../support/test-app';
import { nodeTransport, signInCookie, startPrivateCluster, startServerProcess, waitForHealth, type ServerProcess } from './fault-rig';
import { newGaugePoint, newPose, newReading, newTestSession, newVehicle } from '../../shared/records';

let pg: Awaited<ReturnType<typeof startPrivateCluster>>;
let sequelize: Sequelize;
let server: ServerProcess;
let team: TestTeam;
let cookie: string;

beforeAll(async () => {
  pg = await startPrivateCluster('faults');
  sequelize = createSequelize(pg.url, 4);
  initModels(sequelize);
  await migrate(sequelize);
  team = await createTeam('Fault workshop');
  // A small pool, so that many clients must queue for connections.
  server = await startServerProcess(pg.url, { DB_POOL_MAX: '3' });
  cookie = await signInCookie(server.baseUrl, team.members.tester.email, TEST_PASSWORD);
}, 120_000);

afterAll(async () => {
  await server?.stop();
  await sequelize?.close();
  pg?.cluster.stop();
});

const uuid = () => randomUUID();

/** A whole session as the field client stores it: vehicle, 6 gauge points, poses, readings. */
function sessionRecords(poses: number) {
  const vehicleId = uuid();
  const sessionId = uuid();
  const vehicle = newVehicle({ id: vehicleId, name: `Fault truck ${vehicleId.slice(0, 4)}`, trackRearMm: 1880 });
  const points = [
    [330, 830],
    [0, 830],
    [-330, 830],
    [-330, 370],
    [0, 370],
    [330, 370],
  ].map(([y, z], i) => newGaugePoint({ vehicleId, label: 'ABCDEF'[i], yMm: y, zMm: z }));
  const session = newTestSession({ id: sessionId, vehicleId, title: 'Fault test', testedOn: '2026-11-30', safetyAckAt: '2026-11-30T09:00:00.000Z' });
  const poseRows = Array.from({ length: poses }, (_, seq) =>
    newPose({
      sessionId,
      seq,
      label: `Pose ${seq}`,
      kind: seq === 0 ? 'level' : 'wheels',
      liftFlMm: seq === 0 ? 0 : 100 + seq,
      recordedAt: '2026-11-30T09:10:00.000Z',
    }),
  );
  const readings = poseRows.flatMap((p, pi) =>
    points.flatMap((g) =>
      (['foreAft', 'lateral', 'vertical'] as const).map((axis, ai) => newReading({ poseId: p.id, gaugePointId: g.id, axis, valueMm: 10 + pi + ai })),
    ),
  );
  return { vehicle, points, session, poses: poseRows, readings, sessionId };
}

async function storeLocally(db: FieldDb, r: ReturnType<typeof sessionRecords>) {
  for (const [entity, list] of [
    ['vehicle', [r.vehicle]],
    ['gaugePoint', r.points],
    ['testSession', [r.session]],
    ['pose', r.poses],
    ['reading', r.readings],
  ] as const) {
    const results = await saveRecords(entity, list as { id: string }[], db);
    const bad = results.filter((x) => !x.ok);
    if (bad.length) throw new Error(`could not store ${entity}: ${JSON.stringify(bad[0])}`);
  }
}

async function countsFor(sessionId: string) {
  const [row] = await sequelize.query<{ poses: number; readings: number; distinct_readings: number }>(
    `SELECT (SELECT count(*)::int FROM poses WHERE session_id = $1) AS poses,
            (SELECT count(*)::int FROM readings r JOIN poses p ON p.id = r.pose_id WHERE p.session_id = $1) AS readings,
            (SELECT count(DISTINCT r.id)::int FROM readings r JOIN poses p ON p.id = r.pose_id WHERE p.session_id = $1) AS distinct_readings`,
    { bind: [sessionId], type: QueryTypes.SELECT },
  );
  return row;
}

const newDb = async () => {
  const db = new FieldDb(`fault-${uuid()}`);
  await db.open();
  return db;
};

describe('PostgreSQL stopped in the middle of a sync', () => {
  it('keeps the outbox, resumes after the restart and ends with every record once', async () => {
    const db = await newDb();
    const records = sessionRecords(100); // 1,800 readings: two batches
    await storeLocally(db, records);
    const queued = await db.outbox.count();

    // The database crashes while the second batch is on its way.
    const transport = nodeTransport(server.baseUrl, cookie, {
      beforePush: (_req, n) => {
        if (n === 2) pg.crash();
      },
    });
    const first = await runSync(db, transport);
    expect(first.ok).toBe(false);
    const left = await db.outbox.count();
    expect(left).toBeGreaterThan(0);
    expect(left).toBeLessThan(queued);
    const inFlight = await db.batches.toArray();

    // Still down: another attempt changes nothing locally.
    expect((await runSync(db, nodeTransport(server.baseUrl, cookie))).ok).toBe(false);
    expect(await db.outbox.count()).toBe(left);
    expect((await db.batches.toArray()).map((b) => b.key)).toEqual(inFlight.map((b) => b.key));

    await pg.restart();
    await waitForHealth(server.baseUrl);
    let result = await runSync(db, nodeTransport(server.baseUrl, cookie));
    // The first request after the restart may meet a pooled connection the crash broke.
    for (let i = 0; !result.ok && i < 5; i++) result = await runSync(db, nodeTransport(server.baseUrl, cookie));
    expect(result, JSON.stringify(result)).toEqual({ ok: true });
    expect(await db.outbox.count()).toBe(0);
    expect(await countsFor(records.sessionId)).toEqual({ poses: 100, readings: 1800, distinct_readings: 1800 });
    db.close();
  });
});

describe('the server killed in the middle of a batch', () => {
  it('leaves nothing half-written, and the retried batch lands whole', async () => {
    const records = sessionRecords(556); // 556 poses × 18 = 10,008 readings in one batch
    const setup = {
      idempotencyKey: `setup-${uuid()}`,
      changes: [
        { entity: 'vehicle', record: records.vehicle },
        ...records.points.map((record) => ({ entity: 'gaugePoint', record })),
        { entity: 'testSession', record: records.session },
        ...records.poses.map((record) => ({ entity: 'pose', record })),
      ],
    };
    const post = (body: unknown) =>
      fetch(`${server.baseUrl}/api/sync/push`, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json', Origin: server.baseUrl, Cookie: cookie },
        body: JSON.stringify(body),
      });
    expect((await post(setup)).status).toBe(200);

    const big = { idempotencyKey: `big-${uuid()}`, changes: records.readings.slice(0, 10_000).map((record) => ({ entity: 'reading', record })) };
    // Hold the batch just before its last write: a SHARE lock on sync_batches lets the push read it
    // and write every reading, then makes its final INSERT wait. That is the moment to kill.
    const blocker = await sequelize.transaction();
    await sequelize.query('LOCK TABLE sync_batches IN SHARE MODE', { transaction: blocker });
    const sending = post(big).catch(() => null);
    const deadline = Date.now() + 60_000;
    let waitingPid: number | undefined;
    while (!waitingPid) {
      const rows = await sequelize.query<{ pid: number }>(
        // The push's last statement writes the history in a WITH before it stores the answer.
        "SELECT pid FROM pg_stat_activity WHERE wait_event_type = 'Lock' AND query LIKE '%INSERT INTO sync_batches%'",
        { type: QueryTypes.SELECT },
      );
      waitingPid = rows[0]?.pid;
      if (Date.now() > deadline) throw new Error('the push never reached its last write');
      if (!waitingPid) await new Promise((r) => setTimeout(r, 20));
    }
    server.child.kill('SIGKILL');
    await sending;
    await blocker.rollback();
    // The orphaned backend ends once it notices its client is gone.
    for (let i = 0; i < 100; i++) {
      const rows = await sequelize.query('SELECT 1 FROM pg_stat_activity WHERE pid = $1', { bind: [waitingPid], type: QueryTypes.SELECT });
      if (!rows.length) break;
      await new Promise((r) => setTimeout(r, 100));
    }
    expect((await countsFor(records.sessionId)).readings).toBe(0);
    const kept = await sequelize.query('SELECT 1 FROM sync_batches WHERE idempotency_key = $1', { bind: [big.idempotencyKey], type: QueryTypes.SELECT });
    expect(kept).toHaveLength(0);

    server = await startServerProcess(pg.url, { DB_POOL_MAX: '3' });
    cookie = await signInCookie(server.baseUrl, team.members.tester.email, TEST_PASSWORD);
    const retried = await post(big);
    expect(retried.status).toBe(200);
    expect((await countsFor(records.sessionId)).readings).toBe(10_000);
    const again = await post(big);
    expect(again.status).toBe(200);
    expect(await countsFor(records.sessionId)).toEqual({ poses: 556, readings: 10_000, distinct_readings: 10_000 });
  });
});

describe('many clients at once on a small connection pool', () => {
  it('20 clients of 20 workshops sync concurrently through a pool of 3: none time out, none duplicate', async () => {
    const clients = await Promise.all(
      Array.from({ length: 20 }, async (_, i) => {
        const db = await newDb();
        const records = sessionRecords(30); // 540 readings each
        await storeLocally(db, records);
        const t = await createTeam(`Workshop ${i}`);
        const cookie = (await startSession(t.members.tester.userId, t.teamId)).split(';')[0];
        return { db, records, cookie };
      }),
    );
    const started = Date.now();
    const results = await Promise.all(clients.map((c) => runSync(c.db, nodeTransport(server.baseUrl, c.cookie))));
    expect(results.filter((r) => !r.ok)).toEqual([]);
    // Generous bound: the point is that no request waits out the pool's 30 s acquire timeout.
    expect(Date.now() - started).toBeLessThan(60_000);
    for (const c of clients) {
      expect(await c.db.outbox.count()).toBe(0);
      expect(await countsFor(c.records.sessionId)).toEqual({ poses: 30, readings: 540, distinct_readings: 540 });
      c.db.close();
    }
  }, 180_000);
});
