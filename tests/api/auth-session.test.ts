// Sessions and their cookie, on the real database: cookie flags, a new session id at every
// sign-in, sign-out of all devices, the stored Argon2id parameters, one generic message for bad
// credentials, and the Origin check on state-changing requests (auth/origin.ts).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { pino } from 'pino';
import { Writable } from 'node:stream';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { createApp } from '../../server/app';
import { agentFor, createTeam, signedInAgent, startTestServer, TEST_PASSWORD, type TestServer } from '../support/test-app';
import { UserModel, UserSessionModel } from '../../server/models';
import { ARGON2_PARAMS, storedSessionId } from '../../server/auth/lucia';
import { createHash } from 'node:crypto';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

const sessionCookie = (res: { headers: Record<string, unknown> }) => {
  const all = ([] as string[]).concat((res.headers['set-cookie'] as string[] | string | undefined) ?? []);
  return all.find((c) => c.startsWith('twistlog_session='));
};
const idOf = (cookie: string | undefined) => cookie?.split(';')[0].split('=')[1] ?? '';

describe('the session cookie', () => {
  it('is HttpOnly, SameSite=Lax, path /, and not Secure outside production', async () => {
    const team = await createTeam();
    const res = await agentFor(ts).post('/api/auth/sign-in').send({ email: team.members.viewer.email, password: TEST_PASSWORD });
    expect(res.status).toBe(200);
    const cookie = sessionCookie(res)!;
    expect(cookie).toBeDefined();
    expect(cookie).toMatch(/; HttpOnly/i);
    expect(cookie).toMatch(/; SameSite=Lax/i);
    expect(cookie).toMatch(/; Path=\//i);
    expect(cookie).not.toMatch(/; Secure/i);
  });

  it('is Secure in production', async () => {
    // The flag is read when lucia.ts is loaded: load a fresh copy with NODE_ENV=production.
    const { vi } = await import('vitest');
    vi.resetModules();
    const before = process.env.NODE_ENV;
    process.env.NODE_ENV = 'production';
    try {
      const fresh = await import('../../server/auth/lucia');
      expect(fresh.blankSessionCookie()).toMatch(/; Secure/i);
      expect(fresh.lucia.createSessionCookie('x').serialize()).toMatch(/; Secure/i);
    } finally {
      process.env.NODE_ENV = before;
      vi.resetModules();
    }
  });
});

describe('session rotation', () => {
  it('gives a new session id at every sign-in and ends the one the browser had', async () => {
    const team = await createTeam();
    const agent = agentFor(ts);
    const first = await agent.post('/api/auth/sign-in').send({ email: team.members.engineer.email, password: TEST_PASSWORD });
    const second = await agent.post('/api/auth/sign-in').send({ email: team.members.engineer.email, password: TEST_PASSWORD });
    const a = idOf(sessionCookie(first));
    const b = idOf(sessionCookie(second));
    expect(a).not.toBe('');
    expect(b).not.toBe('');
    expect(b).not.toBe(a);
    expect(await UserSessionModel.findByPk(storedSessionId(a))).toBeNull();
    expect(await UserSessionModel.findByPk(storedSessionId(b))).not.toBeNull();
    // The old id no longer works anywhere.
    const replay = await request(ts.server).get('/api/me').set('Cookie', `twistlog_session=${a}`);
    expect(replay.status).toBe(401);
    expect(sessionCookie(replay)).toMatch(/^twistlog_session=;/);
  });

  it('ignores a session id planted before sign-in (fixation)', async () => {
    const team = await createTeam();
    const planted = 'attacker-chosen-session-id-0000000000';
    const res = await request(ts.server)
      .post('/api/auth/sign-in')
      .set('Origin', ts.origin)
      .set('Cookie', `twistlog_session=${planted}`)
      .send({ email: team.members.tester.email, password: TEST_PASSWORD });
    expect(res.status).toBe(200);
    expect(idOf(sessionCookie(res))).not.toBe(planted);
    expect(await UserSessionModel.findByPk(storedSessionId(planted))).toBeNull();
  });
});

describe('stored session ids', () => {
  it("are the SHA-256 of the cookie's id: a copy of the table opens no session", async () => {
    const team = await createTeam();
    const res = await agentFor(ts).post('/api/auth/sign-in').send({ email: team.members.engineer.email, password: TEST_PASSWORD });
    const id = idOf(sessionCookie(res));
    expect(id).not.toBe('');
    const rows = await UserSessionModel.findAll({ where: { userId: team.members.engineer.userId } });
    expect(rows.map((r) => r.id)).toEqual([createHash('sha256').update(id).digest('hex')]);
    // The stored value, sent as a cookie, is no session.
    const stolen = await request(ts.server).get('/api/me').set('Cookie', `twistlog_session=${rows[0].id}`);
    expect(stolen.status).toBe(401);
    // The real cookie still works, and signing out removes the stored row.
    const agent = request.agent(ts.server);
    const me = await agent.get('/api/me').set('Cookie', `twistlog_session=${id}`);
    expect(me.status).toBe(200);
    expect((await agent.post('/api/auth/sign-out').set('Origin', ts.origin).set('Cookie', `twistlog_session=${id}`).send({})).status).toBe(200);
    expect(await UserSessionModel.count({ where: { userId: team.members.engineer.userId } })).toBe(0);
  });
});

describe('sign out', () => {
  it('of all devices ends every session of the person, and only theirs', async () => {
    const team = await createTeam();
    const phone = await signedInAgent(ts, team.members.tester.email);
    const laptop = await signedInAgent(ts, team.members.tester.email);
    const colleague = await signedInAgent(ts, team.members.engineer.email);
    expect(await UserSessionModel.count({ where: { userId: team.members.tester.userId } })).toBe(2);
    const res = await phone.post('/api/auth/sign-out-everywhere').send({});
    expect(res.status).toBe(200);
    expect(sessionCookie(res)).toMatch(/^twistlog_session=;/);
    expect((await phone.get('/api/me')).status).toBe(401);
    expect((await laptop.get('/api/me')).status).toBe(401);
    expect((await colleague.get('/api/me')).status).toBe(200);
    expect(await UserSessionModel.count({ where: { userId: team.members.tester.userId } })).toBe(0);
  });
});

describe('password hashes', () => {
  it('are Argon2id with at least OWASP minimum parameters (m=19456 KiB, t=2, p=1)', async () => {
    const team = await createTeam();
    // Hashed by the app: sign-up through its confirmation link, then read the stored hash.
    const email = `hash-${team.teamId.slice(0, 8)}@workshop.test`;
    await agentFor(ts).post('/api/auth/sign-up').send({ teamName: 'Hash check', name: 'H', email, password: 'a long enough passphrase' });
    const { waitForMail, tokenIn } = await import('../support/mail');
    const token = tokenIn(await waitForMail(ts, email, /Confirm/), '/sign-up/confirm/');
    expect((await agentFor(ts).post('/api/auth/sign-up/confirm').send({ token })).status).toBe(200);
    for (const who of [email, team.members.admin.email]) {
      const user = await UserModel.findOne({ where: { email: who } });
      const m = /^\$argon2id\$v=19\$m=(\d+),t=(\d+),p=(\d+)\$[A-Za-z0-9+/]+\$[A-Za-z0-9+/]+$/.exec(user!.passwordHash);
      expect(m, user!.passwordHash.slice(0, 40)).not.toBeNull();
      const [mem, t, p] = [Number(m![1]), Number(m![2]), Number(m![3])];
      expect(mem).toBeGreaterThanOrEqual(19456);
      expect(t).toBeGreaterThanOrEqual(2);
      expect(p).toBeGreaterThanOrEqual(1);
      expect({ mem, t, p }).toEqual({ mem: ARGON2_PARAMS.memorySize, t: ARGON2_PARAMS.iterations, p: ARGON2_PARAMS.parallelism });
      expect(user!.passwordHash).not.toContain('a long enough passphrase');
    }
  });
});

describe('the request log', () => {
  it('never holds a session id, in or out', async () => {
    const lines: string[] = [];
    const logger = pino({ level: 'info' }, new Writable({ write: (c, _e, cb) => (lines.push(String(c)), cb()) }));
    // The same app on the same database, with a logger that keeps what it writes.
    const server = http.createServer(createApp({ logger }));
    await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
    try {
      const origin = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
      const team = await createTeam();
      const agent = request.agent(server);
      const res = await agent.post('/api/auth/sign-in').set('Origin', origin).send({ email: team.members.admin.email, password: TEST_PASSWORD });
      const id = idOf(sessionCookie(res));
      expect(id).not.toBe('');
      expect((await agent.get('/api/me')).status).toBe(200);
      const log = lines.join('');
      expect(log).toContain('/api/me');
      // The request log names method, path and status only: no header, no cookie.
      expect(log).not.toMatch(/cookie/i);
      expect(log).not.toContain(id);
      expect(log).not.toContain(TEST_PASSWORD);
    } finally {
      await new Promise((r) => server.close(r));
    }
  });
});

describe('bad credentials', () => {
  it('get one generic message, whatever was wrong', async () => {
    const team = await createTeam();
    const answers = await Promise.all([
      agentFor(ts).post('/api/auth/sign-in').send({ email: team.members.admin.email, password: 'wrong password' }),
      agentFor(ts)
        .post('/api/auth/sign-in')
        .send({ email: `nobody-${team.teamId.slice(0, 6)}@workshop.test`, password: 'wrong password' }),
    ]);
    for (const a of answers) expect(a.status).toBe(401);
    expect(answers[0].body).toEqual(answers[1].body);
    expect(answers[0].body.error.message).toBe('e-mail or password is wrong');
  });
});

describe('the Origin check (CSRF)', () => {
  it('refuses a state-changing request from a foreign origin, with nothing done', async () => {
    const team = await createTeam();
    const agent = await signedInAgent(ts, team.members.admin.email);
    const res = await agent.post('/api/auth/sign-out-everywhere').set('Origin', 'https://evil.example').send({});
    expect(res.status).toBe(403);
    expect((await agent.get('/api/me')).status).toBe(200);
    const invite = await agent.post('/api/team/invitations').set('Origin', 'http://127.0.0.1:1').send({ email: 'x@y.test', role: 'admin' });
    expect(invite.status).toBe(403);
  });

  it('refuses a state-changing request with no Origin, even sign-in', async () => {
    const team = await createTeam();
    const res = await request(ts.server).post('/api/auth/sign-in').send({ email: team.members.admin.email, password: TEST_PASSWORD });
    expect(res.status).toBe(403);
    expect(sessionCookie(res)).toBeUndefined();
    const signIn = await agentFor(ts).post('/api/auth/sign-in').send({ email: team.members.admin.email, password: TEST_PASSWORD });
    const cookie = sessionCookie(signIn)!.split(';')[0];
    expect((await request(ts.server).get('/api/me').set('Cookie', cookie)).status).toBe(200);
    const noOrigin = await request(ts.server).delete(`/api/team/members/${team.members.viewer.userId}`).set('Cookie', cookie);
    expect(noOrigin.status).toBe(403);
    expect((await request(ts.server).get('/api/team').set('Cookie', cookie)).body.members).toHaveLength(4);
  });

  it('refuses a malformed Origin, and lets reads through without one', async () => {
    const team = await createTeam();
    const bad = await request(ts.server)
      .post('/api/auth/sign-in')
      .set('Origin', 'not a url')
      .send({ email: team.members.admin.email, password: TEST_PASSWORD });
    expect(bad.status).toBe(403);
    expect((await request(ts.server).get('/api/health')).status).toBe(200);
  });
});
