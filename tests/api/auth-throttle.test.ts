// Throttling of sign-in and password reset, per account and per address (auth/throttle.ts).
// The client's address is what Express makes of the request through the explicit 'trust proxy'
// setting: behind a trusted proxy, X-Forwarded-For; otherwise the socket, whatever the headers
// claim. Addresses below are documentation ranges, used only as header text.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import request from 'supertest';
import { agentFor, createTeam, startTestServer, TEST_PASSWORD, type TestServer } from '../support/test-app';
import { mailTo } from '../support/mail';
import { resetThrottles, throttleLimits } from '../../server/auth/throttle';

let direct: TestServer; // no proxy trusted (the default)
let proxied: TestServer; // behind a proxy on loopback
beforeAll(async () => {
  direct = await startTestServer();
  proxied = await startTestServer({ trustProxy: 'loopback' });
});
afterAll(async () => {
  await proxied?.close();
  await direct?.close();
});
beforeEach(() => resetThrottles());

const from = (ts: TestServer, ip: string) => ({
  post: (path: string, body: object) => request(ts.server).post(path).set('Origin', ts.origin).set('X-Forwarded-For', ip).send(body),
});
const wrong = { password: 'not the password' };

describe('sign-in throttling', () => {
  it('locks an account after repeated failures, from any address, with the same answer for unknown accounts', async () => {
    const team = await createTeam();
    const victim = team.members.engineer.email;
    const stranger = `nobody-${team.teamId.slice(0, 8)}@workshop.test`;
    const n = throttleLimits.signInPerAccount.limit;
    for (let i = 0; i < n; i++) {
      expect((await from(proxied, `203.0.113.${i + 1}`).post('/api/auth/sign-in', { email: victim, ...wrong })).status).toBe(401);
      expect((await from(proxied, `198.51.100.${i + 1}`).post('/api/auth/sign-in', { email: stranger, ...wrong })).status).toBe(401);
    }
    const locked = await from(proxied, '203.0.113.200').post('/api/auth/sign-in', { email: victim, password: TEST_PASSWORD });
    const lockedStranger = await from(proxied, '198.51.100.200').post('/api/auth/sign-in', { email: stranger, password: TEST_PASSWORD });
    expect(locked.status).toBe(429);
    expect(lockedStranger.status).toBe(429);
    expect(locked.body).toEqual(lockedStranger.body);
    expect(Number(locked.headers['retry-after'])).toBeGreaterThan(0);
    expect(locked.headers['set-cookie']).toBeUndefined();
    // The e-mail's case makes no difference, and other accounts are not affected.
    expect((await from(proxied, '203.0.113.201').post('/api/auth/sign-in', { email: victim.toUpperCase(), password: TEST_PASSWORD })).status).toBe(429);
    expect((await from(proxied, '203.0.113.202').post('/api/auth/sign-in', { email: team.members.admin.email, password: TEST_PASSWORD })).status).toBe(200);
  });

  it('limits failures per address, across accounts; other addresses go on', async () => {
    const team = await createTeam();
    const n = throttleLimits.signInPerAddress.limit;
    for (let i = 0; i < n; i++) {
      const res = await from(proxied, '203.0.113.7').post('/api/auth/sign-in', { email: `guess-${i}-${team.teamId.slice(0, 6)}@workshop.test`, ...wrong });
      expect(res.status).toBe(401);
    }
    expect((await from(proxied, '203.0.113.7').post('/api/auth/sign-in', { email: team.members.admin.email, password: TEST_PASSWORD })).status).toBe(429);
    expect((await from(proxied, '203.0.113.8').post('/api/auth/sign-in', { email: team.members.admin.email, password: TEST_PASSWORD })).status).toBe(200);
  });

  it('does not count successful sign-ins', async () => {
    const team = await createTeam();
    for (let i = 0; i < throttleLimits.signInPerAccount.limit + 2; i++) {
      expect((await agentFor(direct).post('/api/auth/sign-in').send({ email: team.members.tester.email, password: TEST_PASSWORD })).status).toBe(200);
    }
  });

  it('ignores X-Forwarded-For when no proxy is trusted: a client cannot pick its own address', async () => {
    const team = await createTeam();
    const n = throttleLimits.signInPerAddress.limit;
    for (let i = 0; i < n; i++) {
      await from(direct, `203.0.113.${i + 1}`).post('/api/auth/sign-in', { email: `spoof-${i}-${team.teamId.slice(0, 6)}@workshop.test`, ...wrong });
    }
    expect((await from(direct, '198.51.100.99').post('/api/auth/sign-in', { email: team.members.admin.email, password: TEST_PASSWORD })).status).toBe(429);
  });
});

describe('password reset throttling', () => {
  it('limits reset e-mails per account, with the same answers for unknown accounts', async () => {
    const team = await createTeam();
    const known = team.members.viewer.email;
    const unknown = `nobody-${team.teamId.slice(0, 8)}@workshop.test`;
    const n = throttleLimits.resetPerAccount.limit;
    for (let i = 0; i < n; i++) {
      expect((await from(proxied, `203.0.113.${i + 1}`).post('/api/auth/password-reset', { email: known })).status).toBe(202);
      expect((await from(proxied, `198.51.100.${i + 1}`).post('/api/auth/password-reset', { email: unknown })).status).toBe(202);
    }
    const a = await from(proxied, '203.0.113.50').post('/api/auth/password-reset', { email: known });
    const b = await from(proxied, '198.51.100.50').post('/api/auth/password-reset', { email: unknown });
    expect(a.status).toBe(429);
    expect(b.status).toBe(429);
    expect(a.body).toEqual(b.body);
    await proxied.mail.waitFor(() => mailTo(proxied, known).length === n);
    await new Promise((r) => setTimeout(r, 200));
    expect(mailTo(proxied, known)).toHaveLength(n);
  });

  it('limits reset requests per address', async () => {
    const n = throttleLimits.resetPerAddress.limit;
    for (let i = 0; i < n; i++) {
      expect((await from(proxied, '203.0.113.9').post('/api/auth/password-reset', { email: `someone-${i}@workshop.test` })).status).toBe(202);
    }
    expect((await from(proxied, '203.0.113.9').post('/api/auth/password-reset', { email: 'one-more@workshop.test' })).status).toBe(429);
    expect((await from(proxied, '203.0.113.10').post('/api/auth/password-reset', { email: 'one-more@workshop.test' })).status).toBe(202);
  });
});
