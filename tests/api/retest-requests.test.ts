// Re-test requests through sync push and pull, as the desk and the phone send them: an engineer
// asks (on a session, a pose or a reading's slot), the tester's phone pulls the request, the tester
// answers, the engineer closes it. Who may do which step is checked field by field (a tester may
// set the answer, never rewrite the engineer's comment or close the request; a viewer nothing), a
// refused batch leaves the database exactly as it was, and every step is a row of the session's
// history with its before and after values.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { createTeam, sessionAgent, startTestServer, type Agent, type TestServer, type TestTeam } from '../support/test-app';
import { batchKey, change, poseRecord, pushAccepted, readingRecord, sessionRecord, vehicleWithPoints } from '../support/sync';
import { changedTables, scopedTables, snapshot, type ScopedTable } from '../support/db-snapshot';
import { newRetestRequest } from '../../shared/records';
import type { RetestRequest } from '../../shared/schemas';

let ts: TestServer;
let tables: ScopedTable[];
beforeAll(async () => {
  ts = await startTestServer();
  tables = await scopedTables(ts.sequelize);
});
afterAll(async () => ts?.close());

interface Outing {
  team: TestTeam;
  engineer: Agent;
  tester: Agent;
  viewer: Agent;
  sessionId: string;
  poseId: string;
  pointId: string;
}

/** A session pushed by the tester: a level pose and a lifted pose with one reading. */
async function outing(): Promise<Outing> {
  const team = await createTeam('Re-test workshop');
  const agent = (role: 'engineer' | 'tester' | 'viewer') => sessionAgent(ts, team.members[role].userId, team.teamId);
  const [engineer, tester, viewer] = [await agent('engineer'), await agent('tester'), await agent('viewer')];
  const { vehicleId, pointIds } = await vehicleWithPoints(tester);
  const session = sessionRecord(vehicleId);
  const level = poseRecord(session.id, 0);
  const lifted = poseRecord(session.id, 1);
  await pushAccepted(tester, [
    change('testSession', session),
    change('pose', level),
    change('pose', lifted),
    change('reading', readingRecord(lifted.id, pointIds[0], 'lateral', 41.5)),
  ]);
  return { team, engineer, tester, viewer, sessionId: session.id, poseId: lifted.id, pointId: pointIds[0] };
}

const push = (agent: Agent, record: Record<string, unknown>) =>
  agent.post('/api/sync/push').send({ idempotencyKey: batchKey(), changes: [change('retestRequest', record)] });

/** Everything the team changed since the start, as a phone's first pull receives it. */
async function pulled(agent: Agent): Promise<RetestRequest[]> {
  const res = await agent.get('/api/sync/pull?since=0');
  expect(res.status).toBe(200);
  return res.body.retestRequests;
}

const refusedFields = (res: { body: { error?: { fields?: { field: string }[] } } }) => (res.body.error?.fields ?? []).map((f) => f.field.split('.').pop());

async function historyOf(o: Outing) {
  const review = await o.engineer.get(`/api/sessions/${o.sessionId}/review`);
  expect(review.status).toBe(200);
  return (review.body.history as { action: string; entity: string; entityId: string; userName: string; detail: Record<string, unknown> }[]).filter(
    (e) => e.entity === 'retestRequest',
  );
}

describe('a re-test request from the desk to the field and back', () => {
  it('is asked on a reading, pulled by the phone, answered, closed, and each step is in the history', async () => {
    const o = await outing();
    const ask = newRetestRequest({ sessionId: o.sessionId, poseId: o.poseId, gaugePointId: o.pointId, axis: 'lateral', comment: 'Point A lateral looks low' });
    expect((await push(o.engineer, ask)).status).toBe(200);

    // The tester's phone receives it with the pull, with who asked filled in by the server.
    const [onPhone] = await pulled(o.tester);
    expect(onPhone).toMatchObject({ ...ask, version: 1 });

    const answered = {
      ...onPhone,
      state: 'answered',
      answer: 'Read again twice: 43 mm, the tape had slipped',
      answeredAt: new Date().toISOString(),
      answeredBy: o.team.members.tester.userId,
    };
    const res = await push(o.tester, answered);
    expect(res.status, JSON.stringify(res.body)).toBe(200);

    const [atDesk] = await pulled(o.engineer);
    expect(atDesk).toMatchObject({ state: 'answered', answer: answered.answer, answeredBy: o.team.members.tester.userId, version: 2 });
    const closed = { ...atDesk, state: 'closed', closedAt: new Date().toISOString(), closedBy: o.team.members.engineer.userId };
    expect((await push(o.engineer, closed)).status).toBe(200);

    const history = await historyOf(o);
    expect(history.map((e) => e.action)).toEqual(['retest.close', 'retest.answer', 'retest.ask']);
    const [close, answer, asked] = history;
    expect(asked.userName).toMatch(/^engineer/);
    expect(asked.detail).toMatchObject({
      comment: { before: null, after: 'Point A lateral looks low' },
      poseId: { before: null, after: o.poseId },
      gaugePointId: { before: null, after: o.pointId },
      axis: { before: null, after: 'lateral' },
      state: { before: null, after: 'open' },
    });
    expect(answer.userName).toMatch(/^tester/);
    expect(answer.detail).toMatchObject({ state: { before: 'open', after: 'answered' }, answer: { before: '', after: answered.answer } });
    expect(close.detail).toMatchObject({ state: { before: 'answered', after: 'closed' } });
  });

  it('can be asked on the whole session or on a pose, and reopened after an answer', async () => {
    const o = await outing();
    const whole = newRetestRequest({ sessionId: o.sessionId, comment: 'Repeat the whole session with the camper loaded' });
    const pose = newRetestRequest({ sessionId: o.sessionId, poseId: o.poseId, comment: 'Pose 1 again, the block was tilted' });
    await pushAccepted(o.engineer, [change('retestRequest', whole), change('retestRequest', pose)]);
    const answered = {
      ...pose,
      state: 'answered',
      answer: 'Done on a level block',
      answeredAt: new Date().toISOString(),
      answeredBy: o.team.members.tester.userId,
    };
    await pushAccepted(o.tester, [change('retestRequest', answered)]);
    await pushAccepted(o.engineer, [change('retestRequest', { ...answered, version: 2, state: 'open' })]);
    const byId = new Map((await pulled(o.tester)).map((r) => [r.id, r]));
    expect(byId.get(whole.id)).toMatchObject({ poseId: null, gaugePointId: null, axis: null, state: 'open' });
    expect(byId.get(pose.id)).toMatchObject({ state: 'open', answer: 'Done on a level block', version: 3 });
    expect((await historyOf(o)).map((e) => e.action)).toEqual(['retest.reopen', 'retest.answer', 'retest.ask', 'retest.ask']);
  });
});

describe('who may do which step', () => {
  async function asked(o: Outing) {
    const r = newRetestRequest({ sessionId: o.sessionId, poseId: o.poseId, comment: 'Pose 1 again' });
    await pushAccepted(o.engineer, [change('retestRequest', r)]);
    return r;
  }

  /** Pushes and expects a 400 naming `fields`, with nothing of either workshop changed. */
  async function refused(o: Outing, agent: Agent, record: Record<string, unknown>, fields: string[]) {
    const people = Object.values(o.team.members).map((m) => m.userId);
    const before = await snapshot(ts.sequelize, tables, [o.team.teamId], people);
    const res = await push(agent, record);
    expect(res.status, JSON.stringify(res.body)).toBe(400);
    expect(refusedFields(res)).toEqual(expect.arrayContaining(fields));
    expect(changedTables(before, await snapshot(ts.sequelize, tables, [o.team.teamId], people))).toEqual([]);
    return res;
  }

  it('a tester may not ask for a re-test', async () => {
    const o = await outing();
    const res = await refused(o, o.tester, newRetestRequest({ sessionId: o.sessionId, comment: 'I would like to redo it' }), ['id']);
    expect(res.body.error.message).toMatch(/Asking for a re-test|engineers and admins/);
  });

  it("a tester may not rewrite the engineer's comment, move the request or close it", async () => {
    const o = await outing();
    const r = await asked(o);
    await refused(o, o.tester, { ...r, comment: 'Nothing to do' }, ['comment']);
    await refused(o, o.tester, { ...r, poseId: null }, ['poseId']);
    await refused(o, o.tester, { ...r, state: 'closed', closedAt: new Date().toISOString(), closedBy: o.team.members.tester.userId }, [
      'state',
      'closedAt',
      'closedBy',
    ]);
    await refused(o, o.tester, { ...r, deletedAt: new Date().toISOString() }, ['deletedAt']);
  });

  it('an answer names the person who sends it, and a closed request is not answered by a tester', async () => {
    const o = await outing();
    const r = await asked(o);
    const answer = { ...r, state: 'answered', answer: 'Done', answeredAt: new Date().toISOString() };
    const res = await refused(o, o.tester, { ...answer, answeredBy: o.team.members.engineer.userId }, ['answeredBy']);
    expect(res.body.error.fields[0].message).toMatch(/the person who sends the change/);
    await refused(o, o.engineer, { ...r, state: 'closed', closedAt: new Date().toISOString(), closedBy: randomUUID() }, ['closedBy']);

    await pushAccepted(o.engineer, [
      change('retestRequest', { ...r, state: 'closed', closedAt: new Date().toISOString(), closedBy: o.team.members.engineer.userId }),
    ]);
    const [closed] = await pulled(o.tester);
    await refused(o, o.tester, { ...closed, ...answer, version: closed.version, closedAt: null, closedBy: null, answeredBy: o.team.members.tester.userId }, [
      'state',
    ]);
  });

  it('a viewer may not answer (no push at all)', async () => {
    const o = await outing();
    const r = await asked(o);
    const res = await push(o.viewer, { ...r, state: 'answered', answer: 'x', answeredAt: new Date().toISOString(), answeredBy: o.team.members.viewer.userId });
    expect(res.status).toBe(403);
  });

  it('a request refers only to a pose and gauge point of the workshop', async () => {
    const o = await outing();
    const res = await push(o.engineer, newRetestRequest({ sessionId: o.sessionId, poseId: randomUUID(), comment: 'Which pose?' }));
    expect(res.status).toBe(400);
    expect(refusedFields(res)).toEqual(['poseId']);
  });
});
