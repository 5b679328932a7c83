// The workshop's people on the real database: invitations by e-mail (single use, expiring,
// replaced by a newer one, revocable), joining with a new or an existing account, role changes
// and removals (never the last admin), and team scope taken from the session.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { agentFor, createTeam, signedInAgent, startTestServer, TEST_PASSWORD, type TestServer } from '../support/test-app';
import { linkIn, tokenIn, waitForMail } from '../support/mail';
import { InvitationModel, MembershipModel, UserModel, UserSessionModel } from '../../server/models';
import { resetThrottles } from '../../server/auth/throttle';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

const invitee = () => `new-${randomUUID().slice(0, 8)}@workshop.test`;

async function inviteAndGetToken(admin: Awaited<ReturnType<typeof signedInAgent>>, email: string, role: string) {
  const res = await admin.post('/api/team/invitations').send({ email, role });
  expect(res.status).toBe(201);
  const mail = await waitForMail(ts, email, /invited you/);
  return { invitation: res.body, mail, token: tokenIn(mail, '/invite/') };
}

describe('invitations', () => {
  it('e-mails a single-use link with which a new person joins with their name, password and role', async () => {
    const team = await createTeam('Fennick Overland');
    const admin = await signedInAgent(ts, team.members.admin.email);
    const email = invitee();
    const { invitation, mail, token } = await inviteAndGetToken(admin, email, 'tester');
    expect(invitation).toMatchObject({ email, role: 'tester' });
    expect(mail.subject).toContain('Fennick Overland');
    expect(linkIn(mail, '/invite/').origin).toBe(ts.baseUrl);
    expect((await admin.get('/api/team/invitations')).body.map((i: { email: string }) => i.email)).toContain(email);

    const preview = await agentFor(ts).post('/api/invitations/preview').send({ token });
    expect(preview.status).toBe(200);
    expect(preview.body).toMatchObject({ email, role: 'tester', teamName: 'Fennick Overland', hasAccount: false });

    const browser = agentFor(ts);
    const accept = await browser.post('/api/invitations/accept').send({ token, name: 'Pell Arkwright', password: 'my own passphrase' });
    expect(accept.status).toBe(200);
    const me = (await browser.get('/api/me')).body;
    expect(me).toMatchObject({ role: 'tester', user: { email, name: 'Pell Arkwright' }, team: { id: team.teamId } });

    // Single use: neither preview nor accept works again.
    expect((await agentFor(ts).post('/api/invitations/preview').send({ token })).body.error.code).toBe('link_invalid');
    const again = await agentFor(ts).post('/api/invitations/accept').send({ token, name: 'Someone Else', password: 'another passphrase' });
    expect(again.status).toBe(400);
    expect(again.body.error.code).toBe('link_invalid');
    expect(await UserModel.count({ where: { email } })).toBe(1);
    expect((await admin.get('/api/team/invitations')).body.map((i: { email: string }) => i.email)).not.toContain(email);

    // The new member signs in with the chosen password and has the invited role.
    const signIn = agentFor(ts);
    expect((await signIn.post('/api/auth/sign-in').send({ email, password: 'my own passphrase' })).status).toBe(200);
    expect((await signIn.get('/api/me')).body.role).toBe('tester');
    expect((await admin.get('/api/team')).body.members.find((m: { email: string }) => m.email === email)).toMatchObject({
      role: 'tester',
      name: 'Pell Arkwright',
    });
  });

  it('refuses an expired invitation', async () => {
    const team = await createTeam();
    const admin = await signedInAgent(ts, team.members.admin.email);
    const email = invitee();
    const { token } = await inviteAndGetToken(admin, email, 'viewer');
    await InvitationModel.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { teamId: team.teamId, email } });
    const res = await agentFor(ts).post('/api/invitations/accept').send({ token, name: 'Late Comer', password: 'my own passphrase' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('link_invalid');
    expect(await UserModel.count({ where: { email } })).toBe(0);
    expect((await admin.get('/api/team/invitations')).body).toEqual([]);
  });

  it('lets only the newest invitation to an address work, and a revoked one not at all', async () => {
    const team = await createTeam();
    const admin = await signedInAgent(ts, team.members.admin.email);
    const email = invitee();
    const first = await inviteAndGetToken(admin, email, 'viewer');
    ts.mail.clear();
    const second = await inviteAndGetToken(admin, email, 'engineer');
    expect((await agentFor(ts).post('/api/invitations/preview').send({ token: first.token })).status).toBe(400);
    expect((await agentFor(ts).post('/api/invitations/preview').send({ token: second.token })).body.role).toBe('engineer');
    const pending = (await admin.get('/api/team/invitations')).body;
    expect(pending).toHaveLength(1);
    expect((await admin.delete(`/api/team/invitations/${pending[0].id}`)).status).toBe(200);
    expect((await agentFor(ts).post('/api/invitations/accept').send({ token: second.token, name: 'N', password: 'my own passphrase' })).status).toBe(400);
    expect((await admin.delete(`/api/team/invitations/${pending[0].id}`)).status).toBe(404);
  });

  it('lets someone with an account join a second workshop with their own password', async () => {
    const home = await createTeam('Home workshop');
    const team = await createTeam('Second workshop');
    const admin = await signedInAgent(ts, team.members.admin.email);
    const email = home.members.engineer.email;
    const { token } = await inviteAndGetToken(admin, email, 'viewer');
    expect((await agentFor(ts).post('/api/invitations/preview').send({ token })).body.hasAccount).toBe(true);
    const wrong = await agentFor(ts).post('/api/invitations/accept').send({ token, password: 'not my password' });
    expect(wrong.status).toBe(400);
    const browser = agentFor(ts);
    expect((await browser.post('/api/invitations/accept').send({ token, name: 'Ignored', password: TEST_PASSWORD })).status).toBe(200);
    const me = (await browser.get('/api/me')).body;
    expect(me.team.id).toBe(team.teamId);
    expect(me.role).toBe('viewer');
    expect(me.user.name).not.toBe('Ignored');
    expect(await MembershipModel.count({ where: { userId: home.members.engineer.userId } })).toBe(2);
  });

  it('refuses to invite someone who is a member already, and checks the address and role', async () => {
    const team = await createTeam();
    const admin = await signedInAgent(ts, team.members.admin.email);
    expect((await admin.post('/api/team/invitations').send({ email: team.members.tester.email, role: 'viewer' })).status).toBe(409);
    const bad = await admin.post('/api/team/invitations').send({ email: 'nope', role: 'owner' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.map((f: { field: string }) => f.field)).toEqual(expect.arrayContaining(['body.email', 'body.role']));
  });

  it('is for admins only', async () => {
    const team = await createTeam();
    for (const role of ['engineer', 'tester', 'viewer'] as const) {
      const agent = await signedInAgent(ts, team.members[role].email);
      expect((await agent.post('/api/team/invitations').send({ email: invitee(), role: 'admin' })).status).toBe(403);
      expect((await agent.get('/api/team/invitations')).status).toBe(403);
      expect((await agent.get('/api/team')).status).toBe(200);
    }
    await resetThrottles();
  });
});

describe('roles and removal', () => {
  it('changes a role, effective on the member’s next request', async () => {
    const team = await createTeam();
    const admin = await signedInAgent(ts, team.members.admin.email);
    const tester = await signedInAgent(ts, team.members.tester.email);
    expect((await tester.get('/api/vehicles')).status).toBe(200);
    const res = await admin.patch(`/api/team/members/${team.members.tester.userId}`).send({ role: 'viewer' });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ userId: team.members.tester.userId, role: 'viewer' });
    expect((await tester.get('/api/me')).body.role).toBe('viewer');
    expect((await tester.get('/api/vehicles')).status).toBe(403);
  });

  it('never leaves a workshop without an admin', async () => {
    const team = await createTeam();
    const admin = await signedInAgent(ts, team.members.admin.email);
    const self = team.members.admin.userId;
    const demote = await admin.patch(`/api/team/members/${self}`).send({ role: 'engineer' });
    expect(demote.status).toBe(409);
    expect(demote.body.error.message).toMatch(/at least one admin/);
    expect((await admin.delete(`/api/team/members/${self}`)).status).toBe(409);
    expect((await MembershipModel.findOne({ where: { teamId: team.teamId, userId: self } }))?.role).toBe('admin');

    // With a second admin, the first may step down, and then the second is the last one.
    expect((await admin.patch(`/api/team/members/${team.members.engineer.userId}`).send({ role: 'admin' })).status).toBe(200);
    expect((await admin.patch(`/api/team/members/${self}`).send({ role: 'engineer' })).status).toBe(200);
    const second = await signedInAgent(ts, team.members.engineer.email);
    expect((await second.delete(`/api/team/members/${team.members.engineer.userId}`)).status).toBe(409);
  });

  it('removes a member: their sessions in the workshop end at once', async () => {
    const team = await createTeam();
    const admin = await signedInAgent(ts, team.members.admin.email);
    const viewer = await signedInAgent(ts, team.members.viewer.email);
    const res = await admin.delete(`/api/team/members/${team.members.viewer.userId}`);
    expect(res.status).toBe(200);
    expect((await viewer.get('/api/me')).status).toBe(401);
    expect(await UserSessionModel.count({ where: { userId: team.members.viewer.userId } })).toBe(0);
    expect((await admin.get('/api/team')).body.members).toHaveLength(3);
    // Belonging to no workshop, they cannot sign in: the generic answer.
    const signIn = await agentFor(ts).post('/api/auth/sign-in').send({ email: team.members.viewer.email, password: TEST_PASSWORD });
    expect(signIn.status).toBe(401);
    expect(signIn.body.error.message).toBe('e-mail or password is wrong');
  });

  it('takes the workshop from the session: another workshop’s admin reaches none of these members', async () => {
    const team = await createTeam();
    const other = await createTeam();
    const outsider = await signedInAgent(ts, other.members.admin.email);
    expect((await outsider.patch(`/api/team/members/${team.members.engineer.userId}`).send({ role: 'viewer' })).status).toBe(404);
    expect((await outsider.delete(`/api/team/members/${team.members.engineer.userId}`)).status).toBe(404);
    const list = (await outsider.get('/api/team')).body;
    expect(list.team.id).toBe(other.teamId);
    expect(list.members.map((m: { userId: string }) => m.userId)).not.toContain(team.members.engineer.userId);
    expect((await MembershipModel.findOne({ where: { teamId: team.teamId, userId: team.members.engineer.userId } }))?.role).toBe('engineer');
  });
});

describe('workshop settings', () => {
  it('sets the workshop default units, seen by members who chose none; admins only', async () => {
    const team = await createTeam();
    const admin = await signedInAgent(ts, team.members.admin.email);
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const before = (await engineer.get('/api/me')).body.team;
    expect(before.unitSystem).toBe('mm');
    expect((await engineer.patch('/api/team').send({ unitSystem: 'in' })).status).toBe(403);
    const res = await admin.patch('/api/team').send({ unitSystem: 'in' });
    expect(res.status).toBe(200);
    // Only the named setting changes.
    expect(res.body.team).toMatchObject({ unitSystem: 'in', photoGps: before.photoGps });
    expect((await engineer.get('/api/me')).body.team.unitSystem).toBe('in');
    expect((await admin.patch('/api/team').send({ unitSystem: 'furlongs' })).status).toBe(400);
    expect((await admin.patch('/api/team').send({})).status).toBe(400);
  });
});
