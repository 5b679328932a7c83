// A vehicle's desk page reads one answer: the vehicle, its gauge points, and its sessions (newest
// first) with how many poses and readings each holds and every envelope revision with its state.
// Another vehicle's sessions, deleted rows and other workshops stay out.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { createTeam, signedInAgent, startTestServer, type TestServer } from '../support/test-app';
import { createDeskSession } from '../support/desk';
import type { VehicleDesk } from '../../shared/desk-responses';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

describe('GET /api/vehicles/:id', () => {
  it('answers the vehicle, its gauge points and its sessions with their envelope revisions', async () => {
    const team = await createTeam('Vehicle desk workshop');
    const desk = await createDeskSession(team, { name: 'Desk truck', poses: 4 });
    const other = await createDeskSession(team, { name: 'Other truck', seed: 8 });
    const engineer = await signedInAgent(ts, team.members.engineer.email);

    const d1 = (await engineer.post(`/api/sessions/${desk.sessionId}/envelopes`).send({}).expect(201)).body;
    await engineer.post(`/api/envelopes/${d1.id}/sign`).send({ version: d1.version }).expect(200);
    const r2 = (await engineer.post(`/api/envelopes/${d1.id}/reopen`).expect(201)).body;
    await engineer.post(`/api/envelopes/${r2.id}/sign`).send({ version: r2.version }).expect(200);
    const r3 = (await engineer.post(`/api/envelopes/${r2.id}/reopen`).expect(201)).body;

    const answer = (await engineer.get(`/api/vehicles/${desk.vehicleId}`).expect(200)).body as VehicleDesk;
    expect(answer.vehicle).toMatchObject({ id: desk.vehicleId, name: 'Desk truck' });
    expect(answer.gaugePoints.map((g) => g.label)).toEqual(['P01', 'P02', 'P03', 'P04', 'P05', 'P06']);
    expect(answer.sessions.map((s) => s.id)).toEqual([desk.sessionId]);
    const [session] = answer.sessions;
    // The level baseline and four twisted poses.
    expect(session.poseCount).toBe(desk.poseIds.length);
    expect(session.poseCount).toBe(5);
    expect(session.readingCount).toBe(desk.readingIdList.length);
    expect(session.envelopes.map((e) => [e.id, e.revision, e.status])).toEqual([
      [r3.id, 3, 'draft'],
      [r2.id, 2, 'signed'],
      [d1.id, 1, 'superseded'],
    ]);
    expect(session.envelopes[0].signedAt).toBeNull();
    expect(Date.parse(session.envelopes[1].signedAt!)).toBeGreaterThan(Date.now() - 60_000);

    // A session with no envelope yet lists none.
    const bare = (await engineer.get(`/api/vehicles/${other.vehicleId}`).expect(200)).body as VehicleDesk;
    expect(bare.sessions.map((s) => [s.id, s.envelopes])).toEqual([[other.sessionId, []]]);

    // Another workshop, an unknown id: not found.
    const stranger = await signedInAgent(ts, (await createTeam('Other workshop')).members.admin.email);
    await stranger.get(`/api/vehicles/${desk.vehicleId}`).expect(404);
    await engineer.get(`/api/vehicles/${randomUUID()}`).expect(404);
  });
});
