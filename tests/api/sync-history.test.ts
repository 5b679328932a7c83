// What arrives from the field shows in the session's history, with who sent it and what it held.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTeam, signedInAgent, startTestServer, type TestServer } from '../support/test-app';
import { batchKey, change, poseRecord, readingRecord, sessionRecord, vehicleWithPoints } from '../support/sync';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

describe('field sync in the session history', () => {
  it('records one event per session and batch, naming the sender and the counts', async () => {
    const team = await createTeam();
    const tester = await signedInAgent(ts, team.members.tester.email);
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const { vehicleId, pointIds } = await vehicleWithPoints(tester);
    const session = sessionRecord(vehicleId);
    const pose = poseRecord(session.id, 0);
    const readings = pointIds.map((g) => readingRecord(pose.id, g, 'lateral', 20));
    let res = await tester
      .post('/api/sync/push')
      .send({ idempotencyKey: batchKey(), changes: [change('testSession', session), change('pose', pose), ...readings.map((r) => change('reading', r))] });
    expect(res.status).toBe(200);
    // A later batch corrects one reading, referring to the pose already on the server.
    res = await tester.post('/api/sync/push').send({ idempotencyKey: batchKey(), changes: [change('reading', { ...readings[0], valueMm: 21 })] });
    expect(res.status).toBe(200);

    const review = await engineer.get(`/api/sessions/${session.id}/review`);
    expect(review.status).toBe(200);
    const events = review.body.history.filter((e: { action: string }) => e.action === 'field.sync');
    expect(events).toHaveLength(2);
    const [latest, first] = events;
    expect(first.detail).toEqual({ added: { testSession: 1, pose: 1, reading: pointIds.length }, changed: {}, conflicts: 0 });
    expect(latest.detail).toEqual({ added: {}, changed: { reading: 1 }, conflicts: 0 });
    expect(first.userName).toMatch(/^tester/);
  });
});
