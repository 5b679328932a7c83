// The foundation through HTTP on the real PostgreSQL: health, validation errors that name the
// field, the JSON error handler, sign-in, team-scoped rows written and read back.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { agentFor, createTeam, signedInAgent, startTestServer, vehicleBody, type TestServer } from '../support/test-app';
import { VehicleModel } from '../../server/models';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

describe('health', () => {
  it('answers with the database up', async () => {
    const res = await agentFor(ts).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ ok: true, database: 'up' });
  });
});

describe('errors', () => {
  it('gives a JSON 404 for an unknown API route', async () => {
    const res = await agentFor(ts).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not_found');
  });

  it('names the bad field in a 400', async () => {
    const team = await createTeam();
    const agent = await signedInAgent(ts, team.members.engineer.email);
    const res = await agent.post('/api/vehicles').send(vehicleBody({ wheelbaseMm: -5 }));
    expect(res.status).toBe(400);
    expect(res.body.error.fields.map((f: { field: string }) => f.field)).toContain('body.wheelbaseMm');
    expect(res.body.error.message).toMatch(/wheelbaseMm/);
  });

  it('answers malformed JSON with a 400, not a stack trace', async () => {
    const team = await createTeam();
    const agent = await signedInAgent(ts, team.members.engineer.email);
    const res = await agent.post('/api/vehicles').set('Content-Type', 'application/json').send('{"name": ');
    expect(res.status).toBe(400);
    expect(JSON.stringify(res.body)).not.toMatch(/at .*\.ts/);
  });

  it('refuses a body over the limit with 413', async () => {
    const team = await createTeam();
    const agent = await signedInAgent(ts, team.members.engineer.email);
    const res = await agent.post('/api/vehicles').send(vehicleBody({ notes: 'x'.repeat(5 * 1024 * 1024) }));
    expect(res.status).toBe(413);
  });
});

describe('vehicles on the real database', () => {
  it('creates a row in PostgreSQL and reads it back, scoped to the team', async () => {
    const team = await createTeam();
    const other = await createTeam('Other workshop');
    const agent = await signedInAgent(ts, team.members.engineer.email);
    const body = vehicleBody({ name: 'Unit 3' });
    const created = await agent.post('/api/vehicles').send(body);
    expect(created.status).toBe(201);

    const row = await VehicleModel.findByPk(body.id);
    expect(row?.teamId).toBe(team.teamId);
    expect(row?.opening).toEqual(body.opening);
    expect(row?.changeSeq).toBeGreaterThan(0);

    const list = await agent.get('/api/vehicles');
    expect(list.body.map((v: { id: string }) => v.id)).toContain(body.id);

    const outsider = await signedInAgent(ts, other.members.engineer.email);
    expect((await outsider.get(`/api/vehicles/${body.id}`)).status).toBe(404);
    expect((await outsider.get('/api/vehicles')).body).toEqual([]);
  });

  it('refuses a stale edit with 409 and keeps what was saved', async () => {
    const team = await createTeam();
    const agent = await signedInAgent(ts, team.members.engineer.email);
    const body = vehicleBody();
    await agent.post('/api/vehicles').send(body);
    const { id, ...rest } = body;
    const first = await agent.put(`/api/vehicles/${id}`).send({ ...rest, version: 1, name: 'First edit' });
    expect(first.status).toBe(200);
    expect(first.body.version).toBe(2);
    const stale = await agent.put(`/api/vehicles/${id}`).send({ ...rest, version: 1, name: 'Stale edit' });
    expect(stale.status).toBe(409);
    expect((await VehicleModel.findByPk(id))?.name).toBe('First edit');
  });

  it('replaces gauge points and soft-deletes the ones left out', async () => {
    const team = await createTeam();
    const agent = await signedInAgent(ts, team.members.engineer.email);
    const body = vehicleBody();
    await agent.post('/api/vehicles').send(body);
    const a = { id: crypto.randomUUID(), label: 'A', yMm: 300, zMm: 800 };
    const b = { id: crypto.randomUUID(), label: 'B', yMm: -300, zMm: 800 };
    let res = await agent.put(`/api/vehicles/${body.id}/gauge-points`).send({ gaugePoints: [a, b] });
    expect(res.status).toBe(200);
    expect(res.body.gaugePoints).toHaveLength(2);
    res = await agent.put(`/api/vehicles/${body.id}/gauge-points`).send({ gaugePoints: [{ ...a, zMm: 820 }] });
    expect(res.body.gaugePoints.map((p: { label: string; zMm: number }) => [p.label, p.zMm])).toEqual([['A', 820]]);
  });
});

describe('sign-in', () => {
  it('signs in, answers /api/me with the role, and signs out', async () => {
    const team = await createTeam();
    const agent = await signedInAgent(ts, team.members.tester.email);
    const me = await agent.get('/api/me');
    expect(me.body.role).toBe('tester');
    expect(me.body.team.id).toBe(team.teamId);
    expect((await agent.post('/api/auth/sign-out').send({})).status).toBe(200);
    expect((await agent.get('/api/me')).status).toBe(401);
  });

  it('gives one generic message for an unknown e-mail and a wrong password', async () => {
    const team = await createTeam();
    const wrong = await agentFor(ts).post('/api/auth/sign-in').send({ email: team.members.admin.email, password: 'nope' });
    const unknown = await agentFor(ts).post('/api/auth/sign-in').send({ email: 'nobody@workshop.test', password: 'nope' });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body.error.message).toBe(unknown.body.error.message);
  });
});
