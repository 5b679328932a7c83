// The foundation through HTTP on the real PostgreSQL: health, validation errors that name the
// field, the JSON error handler, sign-in, team-scoped rows written and read back.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { agentFor, createTeam, signedInAgent, startTestServer, type Agent, type TestServer } from '../support/test-app';
import { batchKey, change, gaugePointRecords, pushAccepted, vehicleRecord } from '../support/sync';
import { GaugePointModel, VehicleModel } from '../../server/models';

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
    const res = await push(agent, [change('vehicle', vehicleRecord({ wheelbaseMm: -5 }))]);
    expect(res.status).toBe(400);
    expect(res.body.error.fields.map((f: { field: string }) => f.field)).toContain('body.changes.0.record.wheelbaseMm');
    expect(res.body.error.message).toMatch(/wheelbaseMm/);
  });

  it('answers malformed JSON with a 400, not a stack trace', async () => {
    const team = await createTeam();
    const agent = await signedInAgent(ts, team.members.engineer.email);
    const res = await agent.post('/api/sync/push').set('Content-Type', 'application/json').send('{"changes": ');
    expect(res.status).toBe(400);
    expect(JSON.stringify(res.body)).not.toMatch(/at .*\.ts/);
  });

  it('refuses a body over the limit with 413', async () => {
    const team = await createTeam();
    const agent = await signedInAgent(ts, team.members.engineer.email);
    const res = await push(agent, [change('vehicle', vehicleRecord({ notes: 'x'.repeat(5 * 1024 * 1024) }))]);
    expect(res.status).toBe(413);
  });
});

const push = (agent: Agent, changes: ReturnType<typeof change>[]) => agent.post('/api/sync/push').send({ idempotencyKey: batchKey(), changes });

describe('vehicles on the real database', () => {
  it('creates a row in PostgreSQL and reads it back, scoped to the team', async () => {
    const team = await createTeam();
    const other = await createTeam('Other workshop');
    const agent = await signedInAgent(ts, team.members.engineer.email);
    const body = vehicleRecord({ name: 'Unit 3' });
    await pushAccepted(agent, [change('vehicle', body)]);

    const row = await VehicleModel.findByPk(body.id);
    expect(row?.teamId).toBe(team.teamId);
    expect(row?.opening).toEqual(body.opening);
    expect(row?.changeSeq).toBeGreaterThan(0);

    const list = await agent.get('/api/vehicles');
    expect(list.body.map((v: { id: string }) => v.id)).toContain(body.id);

    const outsider = await signedInAgent(ts, other.members.engineer.email);
    expect((await outsider.get('/api/vehicles')).body).toEqual([]);
  });

  it('keeps a stale edit as a conflict beside what was saved, overwriting nothing', async () => {
    const team = await createTeam();
    const agent = await signedInAgent(ts, team.members.engineer.email);
    const body = vehicleRecord();
    await pushAccepted(agent, [change('vehicle', body)]);
    const first = await pushAccepted(agent, [change('vehicle', { ...body, name: 'First edit' })]);
    expect(first.accepted[0].version).toBe(2);
    const stale = await push(agent, [change('vehicle', { ...body, name: 'Stale edit' })]);
    expect(stale.status).toBe(200);
    expect(stale.body.accepted).toEqual([]);
    expect(
      stale.body.conflicts.map((c: { clientRecord: { name: string }; serverRecord: { name: string } }) => [c.clientRecord.name, c.serverRecord.name]),
    ).toEqual([['Stale edit', 'First edit']]);
    expect((await VehicleModel.findByPk(body.id))?.name).toBe('First edit');
  });

  it('adds, moves and removes gauge points through push', async () => {
    const team = await createTeam();
    const agent = await signedInAgent(ts, team.members.engineer.email);
    const body = vehicleRecord();
    const [a, b] = gaugePointRecords(body.id, ['A', 'B']);
    const live = async () => (await GaugePointModel.findAll({ where: { vehicleId: body.id, deletedAt: null } })).map((p) => [p.label, p.zMm]);
    await pushAccepted(agent, [change('vehicle', body), change('gaugePoint', a), change('gaugePoint', b)]);
    expect(await live()).toHaveLength(2);
    await pushAccepted(agent, [change('gaugePoint', { ...a, zMm: 820 }), change('gaugePoint', { ...b, deletedAt: new Date().toISOString() })]);
    expect(await live()).toEqual([['A', 820]]);
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
