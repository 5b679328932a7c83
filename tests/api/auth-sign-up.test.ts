// Sign-up on the real database: the confirmation e-mail, the link that creates the workshop and
// signs its first admin in (once, before it expires), and no user enumeration: an address that
// has an account gets the same answer and a "you already have an account" e-mail.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { agentFor, createTeam, startTestServer, TEST_PASSWORD, type TestServer } from '../support/test-app';
import { linkIn, mailTo, tokenIn, waitForMail } from '../support/mail';
import { MembershipModel, TeamModel, UserModel } from '../../server/models';
import { resetThrottles } from '../../server/auth/throttle';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

const newEmail = () => `founder-${randomUUID().slice(0, 8)}@Example.TEST`;
const signUpBody = (email: string) => ({ teamName: 'Harrow Expedition Builds', name: 'Tova Reyne', email, password: 'a long enough passphrase' });

describe('sign-up', () => {
  it('answers "check your e-mail", and the link creates the workshop with its first admin, once', async () => {
    const email = newEmail();
    const res = await agentFor(ts).post('/api/auth/sign-up').send(signUpBody(email));
    expect(res.status).toBe(202);
    expect(res.body).toEqual({ ok: true, devMailbox: '/dev/mailbox' });
    expect(res.headers['set-cookie']).toBeUndefined();
    // Nothing exists until the e-mail is confirmed.
    expect(await UserModel.findOne({ where: { email: email.toLowerCase() } })).toBeNull();

    const mail = await waitForMail(ts, email, /Confirm your e-mail/);
    const link = linkIn(mail, '/sign-up/confirm/');
    expect(link.origin).toBe(ts.baseUrl);
    const token = tokenIn(mail, '/sign-up/confirm/');

    const browser = agentFor(ts);
    const confirm = await browser.post('/api/auth/sign-up/confirm').send({ token });
    expect(confirm.status).toBe(200);
    const me = await browser.get('/api/me');
    expect(me.status).toBe(200);
    expect(me.body.role).toBe('admin');
    expect(me.body.user.email).toBe(email.toLowerCase());
    expect(me.body.user.name).toBe('Tova Reyne');
    expect(me.body.team.name).toBe('Harrow Expedition Builds');

    const again = await agentFor(ts).post('/api/auth/sign-up/confirm').send({ token });
    expect(again.status).toBe(400);
    expect(again.body.error.code).toBe('link_invalid');
    expect(await TeamModel.count({ where: { name: 'Harrow Expedition Builds', id: me.body.team.id } })).toBe(1);

    // The password chosen at sign-up works.
    const signIn = await agentFor(ts).post('/api/auth/sign-in').send({ email, password: 'a long enough passphrase' });
    expect(signIn.status).toBe(200);
  });

  it('gives an address that has an account the same answer, creates nothing, and tells its owner by e-mail', async () => {
    const team = await createTeam();
    const known = team.members.engineer.email;
    const usersBefore = await UserModel.count();
    const teamsBefore = await TeamModel.count();
    const fresh = await agentFor(ts).post('/api/auth/sign-up').send(signUpBody(newEmail()));
    const res = await agentFor(ts).post('/api/auth/sign-up').send(signUpBody(known));
    expect(res.status).toBe(fresh.status);
    expect(res.body).toEqual(fresh.body);
    expect(res.headers['set-cookie']).toBeUndefined();
    const mail = await waitForMail(ts, known, /already have a Twistlog account/);
    expect(mail.text).toContain(`${ts.baseUrl}/forgot-password`);
    expect(mail.text).not.toMatch(/\/sign-up\/confirm\//);
    // Other tests may run at the same time: only this person's rows are compared.
    expect(await MembershipModel.count({ where: { userId: team.members.engineer.userId } })).toBe(1);
    expect(await UserModel.count()).toBeGreaterThanOrEqual(usersBefore);
    expect(await TeamModel.count()).toBeGreaterThanOrEqual(teamsBefore);
    // The password the stranger chose opens nothing.
    const attempt = await agentFor(ts).post('/api/auth/sign-in').send({ email: known, password: 'a long enough passphrase' });
    expect(attempt.status).toBe(401);
    expect((await agentFor(ts).post('/api/auth/sign-in').send({ email: known, password: TEST_PASSWORD })).status).toBe(200);
  });

  it('refuses an expired link', async () => {
    const email = newEmail();
    await agentFor(ts).post('/api/auth/sign-up').send(signUpBody(email));
    const token = tokenIn(await waitForMail(ts, email, /Confirm/), '/sign-up/confirm/');
    await ts.sequelize.query(`UPDATE sign_up_requests SET expires_at = now() - interval '1 second' WHERE email = :email`, {
      replacements: { email: email.toLowerCase() },
    });
    const res = await agentFor(ts).post('/api/auth/sign-up/confirm').send({ token });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('link_invalid');
    expect(await UserModel.findOne({ where: { email: email.toLowerCase() } })).toBeNull();
  });

  it('names the bad fields of a sign-up', async () => {
    const res = await agentFor(ts).post('/api/auth/sign-up').send({ teamName: '', name: 'X', email: 'not-an-address', password: 'short' });
    expect(res.status).toBe(400);
    const fields = res.body.error.fields.map((f: { field: string }) => f.field);
    expect(fields).toEqual(expect.arrayContaining(['body.teamName', 'body.email', 'body.password']));
  });

  it('sends one e-mail per sign-up and no more than the per-account limit', async () => {
    await resetThrottles();
    const email = newEmail();
    for (let i = 0; i < 3; i++) expect((await agentFor(ts).post('/api/auth/sign-up').send(signUpBody(email))).status).toBe(202);
    const fourth = await agentFor(ts).post('/api/auth/sign-up').send(signUpBody(email));
    expect(fourth.status).toBe(429);
    await waitForMail(ts, email);
    await new Promise((r) => setTimeout(r, 200));
    expect(mailTo(ts, email)).toHaveLength(3);
    await resetThrottles();
  });
});
