// Push speed: 10,000 readings through /api/sync/push against one plain multi-row INSERT of the
// same rows straight into PostgreSQL. The push must reach at least half that speed.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { createTeam, signedInAgent, startTestServer, type TestServer } from '../support/test-app';
import { batchKey, change, poseRecord, readingRecord, sessionRecord, vehicleWithPoints } from '../support/sync';
import { ReadingModel } from '../../server/models';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

const N = 10_000;
const axes = ['foreAft', 'lateral', 'vertical'] as const;

async function sessionWithPoses(poseCount: number) {
  const team = await createTeam();
  const tester = await signedInAgent(ts, team.members.tester.email);
  const labels = Array.from({ length: 60 }, (_, i) => `P${i + 1}`);
  const { vehicleId, pointIds } = await vehicleWithPoints(tester, labels);
  const session = sessionRecord(vehicleId);
  const poses = Array.from({ length: poseCount }, (_, i) => poseRecord(session.id, i));
  const res = await tester.post('/api/sync/push').send({ idempotencyKey: batchKey(), changes: [change('testSession', session), ...poses.map((p) => change('pose', p))] });
  expect(res.status).toBe(200);
  const readings = [];
  for (const pose of poses) for (const p of pointIds) for (const a of axes) if (readings.length < N) readings.push(readingRecord(pose.id, p, a, 90 + readings.length / 1000));
  return { team, tester, readings };
}

describe('push throughput', () => {
  it('pushes 10,000 readings at no less than half the speed of a plain multi-row INSERT', async () => {
    const poseCount = Math.ceil(N / (60 * 3));
    // Best of two rounds each, alternating, so a neighbour's burst of load does not decide the result.
    const pushTimes: number[] = [];
    const insertTimes: number[] = [];
    for (let round = 0; round < 2; round++) {
      const pushed = await sessionWithPoses(poseCount);
      const t0 = performance.now();
      const res = await pushed.tester.post('/api/sync/push').send({ idempotencyKey: batchKey(), changes: pushed.readings.map((r) => change('reading', r)) });
      pushTimes.push(performance.now() - t0);
      expect(res.status).toBe(200);
      expect(res.body.accepted).toHaveLength(N);
      expect(await ReadingModel.count({ where: { teamId: pushed.team.teamId } })).toBe(N);

      const plain = await sessionWithPoses(poseCount);
      const q = (s: string) => `'${s.replace(/'/g, "''")}'`;
      const values = plain.readings
        .map((r) => `(${q(randomUUID())}, ${q(plain.team.teamId)}, ${q(r.poseId)}, ${q(r.gaugePointId)}, ${q(r.axis)}, ${r.valueMm}, ${q(plain.team.members.tester.userId)})`)
        .join(',\n');
      const t1 = performance.now();
      await ts.sequelize.query(`INSERT INTO readings (id, team_id, pose_id, gauge_point_id, axis, value_mm, entered_by) VALUES ${values}`);
      insertTimes.push(performance.now() - t1);
    }
    const pushMs = Math.min(...pushTimes);
    const insertMs = Math.min(...insertTimes);
    console.info(`push of ${N} readings: ${pushMs.toFixed(0)} ms; plain multi-row INSERT: ${insertMs.toFixed(0)} ms; speed ratio ${(insertMs / pushMs).toFixed(2)}`);
    expect(insertMs / pushMs).toBeGreaterThanOrEqual(0.5);
  });
});
