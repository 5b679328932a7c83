// /api/compare does its fitting off the request thread, and its input is bounded: while several
// long sessions are compared, the request thread only loads them; the fits run in a worker thread
// (with them on the request thread the event loop stalled about 400 ms in one go on a 2-core
// machine, and every other request waited). A comparison over more readings than the limit is
// refused with a 400 before anything is loaded.
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { createTeam, signedInAgent, startTestServer, type TestServer } from '../support/test-app';
import { createDeskSession } from '../support/desk';
import { MAX_COMPARE_READINGS } from '../../server/services/compare.service';
import { computeDeskEnvelope } from '../../shared/desk-envelope';

// Counts the fits run on this (the request) thread. The comparison's worker thread loads its own
// copy of the module, which this mock does not reach: a fit there is not counted.
vi.mock('../../shared/desk-envelope', async (importOriginal) => {
  const original = await importOriginal<typeof import('../../shared/desk-envelope')>();
  return { ...original, computeDeskEnvelope: vi.fn(original.computeDeskEnvelope) };
});

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts?.close());

describe('/api/compare', () => {
  it('fits four long sessions in its worker thread, not on the request thread', async () => {
    const team = await createTeam();
    const ids: string[] = [];
    for (let i = 0; i < 4; i++) ids.push((await createDeskSession(team, { seed: 11 + i, poses: 40, name: `Truck ${i + 1}` })).sessionId);
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    // Once first, so a worker's start-up is not what is measured.
    expect((await engineer.get(`/api/compare?sessionIds=${ids[0]}`)).status).toBe(200);

    vi.mocked(computeDeskEnvelope).mockClear();
    const res = await engineer.get(`/api/compare?sessionIds=${ids.join(',')}`);
    expect(res.status).toBe(200);
    expect(res.body).toHaveLength(4);
    expect(res.body.map((c: { poseCount: number }) => c.poseCount)).toEqual([40, 40, 40, 40]);
    expect(vi.mocked(computeDeskEnvelope), 'sessions fitted on the request thread').not.toHaveBeenCalled();
  }, 120_000);

  it(`refuses more than ${MAX_COMPARE_READINGS} readings at once, naming the sessions`, async () => {
    const team = await createTeam();
    const s = await createDeskSession(team, { poses: 2 });
    // Many more poses of the same gauge points, three axes each, written straight into the table.
    const [point] = await ts.sequelize.query<{ id: string }>(`SELECT id FROM gauge_points WHERE team_id = :t LIMIT 1`, {
      replacements: { t: team.teamId },
      type: (await import('sequelize')).QueryTypes.SELECT,
    });
    const poseCount = Math.ceil(MAX_COMPARE_READINGS / 3) + 1;
    await ts.sequelize.query(
      `INSERT INTO poses (id, team_id, session_id, seq, kind, recorded_at, created_by)
       SELECT gen_random_uuid(), :t, :s, 100 + g, 'wheels', now(), :u FROM generate_series(1, :n) g`,
      { replacements: { t: team.teamId, s: s.sessionId, u: team.members.tester.userId, n: poseCount } },
    );
    await ts.sequelize.query(
      `INSERT INTO readings (id, team_id, pose_id, gauge_point_id, axis, value_mm, entered_by)
       SELECT gen_random_uuid(), :t, p.id, :g, a.axis, 90, :u FROM poses p CROSS JOIN (VALUES ('foreAft'), ('lateral'), ('vertical')) AS a(axis)
       WHERE p.session_id = :s AND p.seq >= 100`,
      { replacements: { t: team.teamId, s: s.sessionId, g: point.id, u: team.members.tester.userId } },
    );
    const other = await createDeskSession(team, { seed: 9 });
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const res = await engineer.get(`/api/compare?sessionIds=${s.sessionId},${other.sessionId}`);
    expect(res.status, JSON.stringify(res.body)).toBe(400);
    expect(res.body.error.fields.map((f: { field: string }) => f.field)).toEqual(['query.sessionIds']);
    expect(res.body.error.message).toMatch(/compare fewer sessions/);
  }, 60_000);
});
