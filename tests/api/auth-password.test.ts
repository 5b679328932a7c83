// Password reset by e-mail and password change, on the real database: the same answer for
// known and unknown addresses, the link in the caught e-mail, single use, expiry, only the
// newest link working, and every session ending when the password changes.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { agentFor, createTeam, signedInAgent, startTestServer, TEST_PASSWORD, type TestServer } from '../support/test-app';
import { linkIn, mailTo, tokenIn, waitForMail } from '../support/mail';
import { PasswordResetModel, UserSessionModel } from '../../server/models';
import { resetThrottles } from '../../server/auth/throttle';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

const NEW_PASSWORD = 'a brand new passphrase';

async function resetLink(email: string) {
  const res = await agentFor(ts).post('/api/auth/password-reset').send({ email });
  expect(res.status).toBe(202);
  const mail = await waitForMail(ts, email, /Reset your Twistlog password/);
  return { mail, token: tokenIn(mail, '/reset-password/') };
}

describe('password reset', () => {
  it('answers a known and an unknown address alike, and mails only the known one', async () => {
    await resetThrottles();
    const team = await createTeam();
    const unknown = `nobody-${team.teamId.slice(0, 8)}@workshop.test`;
    const a = await agentFor(ts).post('/api/auth/password-reset').send({ email: team.members.tester.email });
    const b = await agentFor(ts).post('/api/auth/password-reset').send({ email: unknown });
    expect(a.status).toBe(b.status);
    expect(a.body).toEqual(b.body);
    const mail = await waitForMail(ts, team.members.tester.email, /Reset/);
    expect(linkIn(mail, '/reset-password/').origin).toBe(ts.baseUrl);
    await new Promise((r) => setTimeout(r, 200));
    expect(mailTo(ts, unknown)).toHaveLength(0);
  });

  it('sets the new password once, signs out every device and signs this browser in afresh', async () => {
    await resetThrottles();
    const team = await createTeam();
    const email = team.members.engineer.email;
    const elsewhere = await signedInAgent(ts, email);
    const { token } = await resetLink(email);

    const browser = agentFor(ts);
    const res = await browser.post('/api/auth/password-reset/confirm').send({ token, password: NEW_PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ ok: true, signedIn: true });
    expect((await browser.get('/api/me')).body.user.email).toBe(email);
    expect((await elsewhere.get('/api/me')).status).toBe(401);
    expect(await UserSessionModel.count({ where: { userId: team.members.engineer.userId } })).toBe(1);

    const reuse = await agentFor(ts).post('/api/auth/password-reset/confirm').send({ token, password: 'yet another passphrase' });
    expect(reuse.status).toBe(400);
    expect(reuse.body.error.code).toBe('link_invalid');

    expect((await agentFor(ts).post('/api/auth/sign-in').send({ email, password: TEST_PASSWORD })).status).toBe(401);
    expect((await agentFor(ts).post('/api/auth/sign-in').send({ email, password: NEW_PASSWORD })).status).toBe(200);
    await waitForMail(ts, email, /password was changed/);
  });

  it('refuses an expired link and keeps the old password', async () => {
    await resetThrottles();
    const team = await createTeam();
    const email = team.members.viewer.email;
    const { token } = await resetLink(email);
    await PasswordResetModel.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { userId: team.members.viewer.userId } });
    const res = await agentFor(ts).post('/api/auth/password-reset/confirm').send({ token, password: NEW_PASSWORD });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('link_invalid');
    expect((await agentFor(ts).post('/api/auth/sign-in').send({ email, password: TEST_PASSWORD })).status).toBe(200);
  });

  it('lets only the newest link work', async () => {
    await resetThrottles();
    const team = await createTeam();
    const email = team.members.admin.email;
    const first = await resetLink(email);
    ts.mail.clear();
    const second = await resetLink(email);
    expect(second.token).not.toBe(first.token);
    expect((await agentFor(ts).post('/api/auth/password-reset/confirm').send({ token: first.token, password: NEW_PASSWORD })).status).toBe(400);
    expect((await agentFor(ts).post('/api/auth/password-reset/confirm').send({ token: second.token, password: NEW_PASSWORD })).status).toBe(200);
  });

  it('refuses a made-up token and a short password', async () => {
    const team = await createTeam();
    const made = await agentFor(ts)
      .post('/api/auth/password-reset/confirm')
      .send({ token: 'A'.repeat(43), password: NEW_PASSWORD });
    expect(made.status).toBe(400);
    expect(made.body.error.code).toBe('link_invalid');
    await resetThrottles();
    const { token } = await resetLink(team.members.tester.email);
    const short = await agentFor(ts).post('/api/auth/password-reset/confirm').send({ token, password: 'short' });
    expect(short.status).toBe(400);
    expect(short.body.error.fields.map((f: { field: string }) => f.field)).toContain('body.password');
    // A refused attempt does not use the link up.
    expect((await agentFor(ts).post('/api/auth/password-reset/confirm').send({ token, password: NEW_PASSWORD })).status).toBe(200);
  });
});

describe('change password', () => {
  it('needs the current password, then ends every session and keeps this browser signed in with a new one', async () => {
    const team = await createTeam();
    const email = team.members.tester.email;
    const here = await signedInAgent(ts, email);
    const there = await signedInAgent(ts, email);
    const idBefore = (await UserSessionModel.findAll({ where: { userId: team.members.tester.userId } })).map((s) => s.id);

    const wrong = await here.post('/api/auth/change-password').send({ currentPassword: 'not it at all', newPassword: NEW_PASSWORD });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fields[0].field).toBe('body.currentPassword');
    expect((await here.get('/api/me')).status).toBe(200);

    const ok = await here.post('/api/auth/change-password').send({ currentPassword: TEST_PASSWORD, newPassword: NEW_PASSWORD });
    expect(ok.status).toBe(200);
    expect((await here.get('/api/me')).status).toBe(200);
    expect((await there.get('/api/me')).status).toBe(401);
    const idAfter = (await UserSessionModel.findAll({ where: { userId: team.members.tester.userId } })).map((s) => s.id);
    expect(idAfter).toHaveLength(1);
    expect(idBefore).not.toContain(idAfter[0]);
    expect((await agentFor(ts).post('/api/auth/sign-in').send({ email, password: NEW_PASSWORD })).status).toBe(200);
    await waitForMail(ts, email, /password was changed/);
  });

  it('sets the unit of the person (mm, in, or the workshop default)', async () => {
    const team = await createTeam();
    const agent = await signedInAgent(ts, team.members.viewer.email);
    let res = await agent.patch('/api/me').send({ unitSystem: 'in' });
    expect(res.status).toBe(200);
    expect(res.body.user.unitSystem).toBe('in');
    res = await agent.patch('/api/me').send({ unitSystem: null });
    expect(res.body.user.unitSystem).toBeNull();
    expect((await agent.patch('/api/me').send({ unitSystem: 'furlong' })).status).toBe(400);
    expect((await agent.patch('/api/me').send({ role: 'admin' })).status).toBe(400);
    expect((await agent.get('/api/me')).body.role).toBe('viewer');
  });
});
