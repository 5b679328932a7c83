// The app is no spam relay: fabrication sheets and invitations are counted per workshop and per
// person, per hour and per day, from the mail log in PostgreSQL (shared by every app instance); a
// new workshop has a small quota until it has confirmed its first e-mail and signed off its first
// envelope. Over quota the answer is a 429 that says when to try again (also as Retry-After) and
// nothing is sent or saved; every e-mail that goes out is in the log.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { agentFor, createTeam, signedInAgent, startTestServer, type Agent, type TestServer } from '../support/test-app';
import { createDeskSession } from '../support/desk';
import { tokenIn, waitForMail } from '../support/mail';
import { DEFAULT_DRAFT_PARAMS } from '../../shared/schemas/envelope';
import { mailQuotas } from '../../server/mail/quotas';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts?.close());

const Q = mailQuotas;
const sinkCount = (domain: string) => ts.mail.messages.filter((m) => m.to.some((t) => t.endsWith(`@${domain}`))).length;

/** A workshop made the way a newcomer makes one: sign-up, then the link in the e-mail. */
async function signUpWorkshop(): Promise<{ agent: Agent; teamId: string; email: string }> {
  const email = `founder-${randomUUID().slice(0, 8)}@harrow.test`;
  expect(
    (await agentFor(ts).post('/api/auth/sign-up').send({ teamName: 'Harrow Builds', name: 'Tova Reyne', email, password: 'a long enough passphrase' })).status,
  ).toBe(202);
  const token = tokenIn(await waitForMail(ts, email, /Confirm/), '/sign-up/confirm/');
  const agent = agentFor(ts);
  expect((await agent.post('/api/auth/sign-up/confirm').send({ token })).status).toBe(200);
  const me = await agent.get('/api/me');
  return { agent, teamId: me.body.team.id, email };
}

async function signOffOne(agent: Agent, sessionId: string) {
  const draft = (
    await agent
      .post(`/api/sessions/${sessionId}/envelopes`)
      .send({ params: { ...DEFAULT_DRAFT_PARAMS, designTwistDeg: 20 } })
      .expect(201)
  ).body;
  return (await agent.post(`/api/envelopes/${draft.id}/sign`).send({ version: draft.version }).expect(200)).body as { id: string };
}

function expectQuotaAnswer(res: { status: number; headers: Record<string, string>; body: { error: { message: string } } }, words: RegExp) {
  expect(res.status, JSON.stringify(res.body)).toBe(429);
  expect(Number(res.headers['retry-after'])).toBeGreaterThan(0);
  expect(res.body.error.message).toMatch(words);
  expect(res.body.error.message).toMatch(/try again in \d+ (h|min|s)/);
}

describe('invitations from a new workshop', () => {
  it('stop at the new-workshop quota with a 429 that says when to retry; nothing is sent or saved beyond it', async () => {
    const { agent, teamId } = await signUpWorkshop();
    const domain = `inv-${teamId.slice(0, 8)}.test`;
    const limit = Q.newWorkshop.invitation.workshop.hour;
    for (let i = 0; i < limit; i++) {
      const res = await agent.post('/api/team/invitations').send({ email: `person${i}@${domain}`, role: 'tester' });
      expect(res.status, JSON.stringify(res.body)).toBe(201);
    }
    const over = await agent.post('/api/team/invitations').send({ email: `one-more@${domain}`, role: 'tester' });
    expectQuotaAnswer(over, /new workshop/);
    await new Promise((r) => setTimeout(r, 200));
    expect(sinkCount(domain)).toBe(limit);
    const [{ n }] = await ts.sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM invitations WHERE team_id = :teamId', {
      replacements: { teamId },
      type: QueryTypes.SELECT,
    });
    expect(n).toBe(limit);
  });

  it('grow to the full quota once the workshop has signed off its first envelope', async () => {
    const { agent, teamId } = await signUpWorkshop();
    const domain = `grow-${teamId.slice(0, 8)}.test`;
    for (let i = 0; i < Q.newWorkshop.invitation.workshop.hour; i++) {
      expect((await agent.post('/api/team/invitations').send({ email: `p${i}@${domain}`, role: 'viewer' })).status).toBe(201);
    }
    expect((await agent.post('/api/team/invitations').send({ email: `later@${domain}`, role: 'viewer' })).status).toBe(429);
    // The founder records a session (as the field would) and signs off its envelope.
    const founder = { userId: (await agent.get('/api/me')).body.user.id as string, email: '' };
    const s = await createDeskSession({ teamId, members: { admin: founder, engineer: founder, tester: founder, viewer: founder } });
    await signOffOne(agent, s.sessionId);
    expect((await agent.post('/api/team/invitations').send({ email: `later@${domain}`, role: 'viewer' })).status).toBe(201);
  });
});

describe('fabrication sheets', () => {
  async function establishedWorkshop() {
    const team = await createTeam('Established workshop');
    await ts.sequelize.query('UPDATE teams SET email_confirmed_at = now() WHERE id = :id', { replacements: { id: team.teamId } });
    const s = await createDeskSession(team);
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const envelope = await signOffOne(engineer, s.sessionId);
    const admin = await signedInAgent(ts, team.members.admin.email);
    return { team, engineer, admin, envelope };
  }

  it('are limited per person per hour; a colleague can still send; every send is logged', async () => {
    const { team, engineer, admin, envelope } = await establishedWorkshop();
    const domain = `sheets-${team.teamId.slice(0, 8)}.test`;
    const limit = Q.established.sheet.person.hour;
    for (let i = 0; i < limit; i++) {
      const res = await engineer.post(`/api/envelopes/${envelope.id}/send`).send({ to: `maker${i}@${domain}` });
      expect(res.status, JSON.stringify(res.body)).toBe(201);
    }
    const over = await engineer.post(`/api/envelopes/${envelope.id}/send`).send({ to: `maker-x@${domain}` });
    expectQuotaAnswer(over, /you have sent \d+ fabrication sheets in the last hour/i);
    expect((await admin.post(`/api/envelopes/${envelope.id}/send`).send({ to: `maker-y@${domain}` })).status).toBe(201);
    await ts.mail.waitFor(() => sinkCount(domain) === limit + 1);
    const log = await ts.sequelize.query<{ kind: string; status: string; to_email: string; user_id: string; message_id: string | null }>(
      `SELECT kind, status, to_email, user_id, message_id FROM mail_log WHERE team_id = :teamId ORDER BY created_at`,
      { replacements: { teamId: team.teamId }, type: QueryTypes.SELECT },
    );
    expect(log).toHaveLength(limit + 1);
    expect(log.every((l) => l.kind === 'sheet' && l.status === 'sent' && l.message_id)).toBe(true);
    expect(log.filter((l) => l.user_id === team.members.engineer.userId)).toHaveLength(limit);
    expect(log.map((l) => l.to_email)).not.toContain(`maker-x@${domain}`);
  }, 120_000);

  it('are limited per workshop per day, and the answer names the time the oldest send leaves the window', async () => {
    const { team, engineer, envelope } = await establishedWorkshop();
    const dayLimit = Q.established.sheet.workshop.day;
    // Earlier today (three hours ago), the workshop's people sent all but two of the day's sheets.
    await ts.sequelize.query(
      `INSERT INTO mail_log (id, team_id, user_id, kind, to_email, subject, status, created_at)
       SELECT gen_random_uuid(), :teamId, :userId, 'sheet', 'earlier' || g || '@maker.test', 'Fabrication sheet', 'sent', now() - interval '3 hours'
       FROM generate_series(1, :n) g`,
      { replacements: { teamId: team.teamId, userId: team.members.admin.userId, n: dayLimit - 2 } },
    );
    for (let i = 0; i < 2; i++) expect((await engineer.post(`/api/envelopes/${envelope.id}/send`).send({ to: `late${i}@maker.test` })).status).toBe(201);
    const over = await engineer.post(`/api/envelopes/${envelope.id}/send`).send({ to: 'one-too-many@maker.test' });
    expectQuotaAnswer(over, /this workshop has sent \d+ fabrication sheets in the last 24 hours/i);
    // The oldest counted send was three hours ago: it leaves the 24-hour window in about 21 hours.
    const wait = Number(over.headers['retry-after']);
    expect(wait).toBeGreaterThan(20.9 * 3600);
    expect(wait).toBeLessThan(21.1 * 3600);
  });
});
