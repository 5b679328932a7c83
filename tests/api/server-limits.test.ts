// Smaller limits of the server, on the real database: a password-reset request answers at once
// whether or not the address has an account (the work happens after the answer); no request waits
// long on a lock or a slow statement (lock_timeout, statement_timeout: a 503 to retry); push errors
// never echo another workshop's ids or labels; old sync_batches rows are pruned.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { createTeam, sessionAgent, agentFor, startTestServer, type TestServer } from '../support/test-app';
import { waitForMail } from '../support/mail';
import { insertRow } from '../support/db-snapshot';
import { batchKey } from '../support/sync';
import { createSequelize, DB_TIMEOUTS } from '../../server/db';
import { pruneExpired, SYNC_BATCH_RETENTION_DAYS } from '../../server/services/prune';
import { newGaugePoint, newReading } from '../../shared/records';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts?.close());

/** Runs `sql` in a transaction on a connection of its own and holds it open until `release()` (as a slow writer would). */
async function holdOpen(sql: string, replacements: Record<string, unknown> = {}) {
  const other = createSequelize(process.env.DATABASE_URL!, 1);
  let release!: () => void;
  const released = new Promise<void>((r) => (release = r));
  let ready!: () => void;
  const isReady = new Promise<void>((r) => (ready = r));
  const done = other.transaction(async (transaction) => {
    await other.query(sql, { replacements, transaction });
    ready();
    await released;
  });
  await Promise.race([isReady, done]);
  return {
    async release() {
      release();
      await done;
      await other.close();
    },
  };
}

/** The answer, or 'still waiting' after `ms`. */
const within = <T>(p: PromiseLike<T>, ms: number) => Promise.race([p, new Promise<'still waiting'>((r) => setTimeout(() => r('still waiting'), ms))]);

/** A vehicle with one gauge point, a session, a level pose and one lateral reading, written straight to the tables. */
async function insertOneReading(t: string, by: string, names: { truck: string; label: string }) {
  const ids = { v: randomUUID(), g: randomUUID(), s: randomUUID(), p: randomUUID(), r: randomUUID() };
  await insertRow(ts.sequelize, 'vehicles', {
    id: ids.v,
    team_id: t,
    name: names.truck,
    wheelbase_mm: 3800,
    track_front_mm: 1900,
    track_rear_mm: 1880,
    opening: { widthMm: 700, heightMm: 500, cornerRadiusMm: 80, centreYMm: 0, bottomZMm: 350 },
  });
  await insertRow(ts.sequelize, 'gauge_points', { id: ids.g, team_id: t, vehicle_id: ids.v, label: names.label, y_mm: 300, z_mm: 800 });
  await insertRow(ts.sequelize, 'test_sessions', { id: ids.s, team_id: t, vehicle_id: ids.v, tested_on: '2026-05-01', created_by: by });
  await insertRow(ts.sequelize, 'poses', { id: ids.p, team_id: t, session_id: ids.s, seq: 0, kind: 'level', recorded_at: new Date(), created_by: by });
  await insertRow(ts.sequelize, 'readings', { id: ids.r, team_id: t, pose_id: ids.p, gauge_point_id: ids.g, axis: 'lateral', value_mm: 90, entered_by: by });
  return ids;
}

describe('password reset', () => {
  it('answers a known address as fast as an unknown one: nothing is looked up before the answer', async () => {
    const team = await createTeam();
    const known = team.members.tester.email;
    // The reset table is busy: a request that worked before answering would wait here.
    const lock = await holdOpen('LOCK TABLE password_resets IN ACCESS EXCLUSIVE MODE');
    try {
      const [a, b] = await Promise.all([
        within(agentFor(ts).post('/api/auth/password-reset').send({ email: known }), 1_500),
        within(
          agentFor(ts)
            .post('/api/auth/password-reset')
            .send({ email: `nobody-${randomUUID().slice(0, 8)}@workshop.test` }),
          1_500,
        ),
      ]);
      expect(a === 'still waiting' ? a : a.status).toBe(202);
      expect(b === 'still waiting' ? b : b.status).toBe(202);
      expect(a === 'still waiting' || b === 'still waiting' ? null : a.body).toEqual(b === 'still waiting' ? undefined : b.body);
    } finally {
      await lock.release();
    }
    // The link still goes out once the table is free.
    expect((await waitForMail(ts, known, /reset/i)).text).toMatch(/reset/i);
  });
});

describe('database time limits', () => {
  it('sets statement_timeout and lock_timeout on every connection', async () => {
    const [row] = await ts.sequelize.query<{ statement_timeout: string; lock_timeout: string }>(
      `SELECT current_setting('statement_timeout') AS statement_timeout, current_setting('lock_timeout') AS lock_timeout`,
      { type: QueryTypes.SELECT },
    );
    expect(row).toEqual({ statement_timeout: `${DB_TIMEOUTS.statementMs / 1000}s`, lock_timeout: `${DB_TIMEOUTS.lockMs / 1000}s` });
  });

  it('answers 503 with Retry-After when a row stays locked, instead of waiting for it', async () => {
    const team = await createTeam();
    const engineer = await sessionAgent(ts, team.members.engineer.userId, team.teamId);
    const ids = await insertOneReading(team.teamId, team.members.engineer.userId, { truck: 'Locked truck', label: 'A' });
    const lock = await holdOpen('SELECT id FROM readings WHERE id = :id FOR UPDATE', { id: ids.r });
    try {
      const started = Date.now();
      const res = await within(engineer.patch(`/api/readings/${ids.r}/review`).send({ version: 1, flagNote: 'check' }), DB_TIMEOUTS.lockMs + 4_000);
      expect(res === 'still waiting' ? res : res.status).toBe(503);
      if (res !== 'still waiting') {
        expect(Number(res.headers['retry-after'])).toBeGreaterThan(0);
        expect(res.body.error.message).toMatch(/try again/);
      }
      expect(Date.now() - started).toBeGreaterThanOrEqual(DB_TIMEOUTS.lockMs - 200);
    } finally {
      await lock.release();
    }
    // Nothing half-done: the reading is as it was, and the edit goes through now.
    expect((await engineer.patch(`/api/readings/${ids.r}/review`).send({ version: 1, flagNote: 'check' })).status).toBe(200);
  }, 30_000);
});

describe('push errors', () => {
  it("never echo another workshop's ids or labels", async () => {
    const mine = await createTeam('Own workshop');
    const theirs = await createTeam('Neighbour workshop');
    const ids = await insertOneReading(theirs.teamId, theirs.members.engineer.userId, { truck: 'Their truck', label: 'SECRET7' });
    const tester = await sessionAgent(ts, mine.members.tester.userId, mine.teamId);
    const res = await tester.post('/api/sync/push').send({
      idempotencyKey: batchKey(),
      changes: [
        // Their vehicle, with their label; a reading into the slot their reading holds.
        { entity: 'gaugePoint', record: newGaugePoint({ vehicleId: ids.v, label: 'SECRET7', yMm: 1, zMm: 2 }) },
        { entity: 'reading', record: newReading({ poseId: ids.p, gaugePointId: ids.g, axis: 'lateral', valueMm: 5 }) },
      ],
    });
    expect(res.status).toBe(400);
    const text = JSON.stringify(res.body);
    // What the phone sent comes back (it is the phone's own input); nothing of theirs does.
    expect(text).not.toContain(ids.r);
    expect(text).not.toContain(ids.r.slice(0, 8));
    expect(text).not.toContain(ids.s);
    expect(text).not.toMatch(/already (used|has)/);
    expect(text).toMatch(/neither in this batch nor on the server/);
  });
});

describe('pruning', () => {
  it(`drops sync_batches rows older than ${SYNC_BATCH_RETENTION_DAYS} days and keeps newer ones`, async () => {
    const team = await createTeam();
    const old = `old-${randomUUID()}`;
    const fresh = `fresh-${randomUUID()}`;
    for (const [key, age] of [
      [old, SYNC_BATCH_RETENTION_DAYS + 1],
      [fresh, SYNC_BATCH_RETENTION_DAYS - 1],
    ] as const) {
      await ts.sequelize.query(
        `INSERT INTO sync_batches (team_id, idempotency_key, user_id, request_hash, response, created_at) VALUES (:t, :key, :u, 'h', '{}', now() - make_interval(days => :age))`,
        { replacements: { t: team.teamId, key, u: team.members.tester.userId, age } },
      );
    }
    await pruneExpired();
    const left = await ts.sequelize.query<{ idempotency_key: string }>('SELECT idempotency_key FROM sync_batches WHERE team_id = :t', {
      replacements: { t: team.teamId },
      type: QueryTypes.SELECT,
    });
    expect(left.map((r) => r.idempotency_key)).toEqual([fresh]);
  });
});
