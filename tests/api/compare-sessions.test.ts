// Comparison across vehicles through HTTP: twist reached, worst per axis and slope per degree, from
// the readings in use (excluded ones left out).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTeam, signedInAgent, startTestServer, type TestServer } from '../support/test-app';
import { createDeskSession } from '../support/desk';
import { crossAxleTwistDeg } from '../../shared/flex';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

describe('comparison', () => {
  it('gives each session its twist reached and a lateral slope near the motion it was built with', async () => {
    const team = await createTeam();
    const stiff = await createDeskSession(team, { name: 'Stiff truck', seed: 3, shearPerDeg: 4 });
    const soft = await createDeskSession(team, { name: 'Soft truck', seed: 4, shearPerDeg: 10, poses: 4 });
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const res = await engineer.get(`/api/compare?sessionIds=${stiff.sessionId},${soft.sessionId}`);
    expect(res.status).toBe(200);
    const [a, b] = res.body;
    expect(a).toMatchObject({ sessionId: stiff.sessionId, vehicleName: 'Stiff truck', poseCount: 6 });
    expect(b).toMatchObject({ sessionId: soft.sessionId, vehicleName: 'Soft truck', poseCount: 4 });
    // The synthetic sessions step the lifts up to 450 mm front / 360 mm rear on 1900 / 1850 mm tracks.
    expect(a.twistReachedDeg).toBeCloseTo(Math.abs(crossAxleTwistDeg({ fl: 337.5, fr: 0, rl: 0, rr: 270 }, 1900, 1850)), 6);
    // Lateral displacement is (ty − wx·z) × twist: 4 (or 10) mm/° of shear less the roll
    // (0.0012 rad/°) times the height; on the opening (z 600–1500 mm) the largest is at the bottom
    // edge, 4 − 0.72 = 3.28 mm/° (10 − 0.72 = 9.28); 0.5 mm reading noise moves it a little.
    expect(Math.abs(a.slopeMmPerDeg.lateral - 3.28)).toBeLessThan(0.15);
    expect(Math.abs(b.slopeMmPerDeg.lateral - 9.28)).toBeLessThan(0.15);
  });

  it('refuses viewers and names an unknown session', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const viewer = await signedInAgent(ts, team.members.viewer.email);
    expect((await viewer.get(`/api/compare?sessionIds=${s.sessionId}`)).status).toBe(403);
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const bad = await engineer.get('/api/compare?sessionIds=nope');
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/sessionIds/);
  });
});
