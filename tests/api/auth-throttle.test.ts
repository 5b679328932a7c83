// Throttling of sign-in per (account, address) with growing waits, of one address trying many
// accounts, and of password reset per account and per address (auth/throttle.ts); the counts
// live in PostgreSQL, so every app instance sees them.
// The client's address is what Express makes of the request through the explicit 'trust proxy'
// setting: behind a trusted proxy, X-Forwarded-For; otherwise the socket, whatever the headers
// claim. Addresses below are documentation ranges, used only as header text.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import request from 'supertest';
import { agentFor, createTeam, startTestServer, TEST_PASSWORD, type TestServer } from '../support/test-app';
import { mailTo } from '../support/mail';
import { resetThrottles, signInThrottle, throttleLimits } from '../../server/auth/throttle';
import { startServerProcess } from '../faults/fault-rig';

let direct: TestServer; // no proxy trusted (the default)
const ts = () => direct;
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
  const F = signInThrottle.freeFailures;

  it('slows one address guessing one account with growing waits; the owner still gets in from their own phone', async () => {
    const team = await createTeam();
    const owner = team.members.engineer.email;
    const guesses: number[] = [];
    const started = Date.now();
    for (let i = 0; i < F + 25; i++) guesses.push((await from(proxied, '203.0.113.66').post('/api/auth/sign-in', { email: owner, ...wrong })).status);
    const elapsedS = (Date.now() - started) / 1000;
    // The first failures answer as usual, then the address must wait: its guesses are refused
    // unread. A guess is read again only once its wait (1, 2, 4 … s) has passed, so in elapsedS
    // seconds at most 1 + log2(elapsedS + 1) of them are read, however slowly this machine
    // checks passwords.
    expect(guesses.slice(0, F)).toEqual(Array(F).fill(401));
    const later = guesses.slice(F);
    expect(later.every((s) => s === 401 || s === 429)).toBe(true);
    expect(later.filter((s) => s === 401).length).toBeLessThanOrEqual(1 + Math.ceil(Math.log2(elapsedS + 1)));
    // Even the right password waits at that address (as if the waits had grown on: a read guess
    // on a slow machine may have just begun a short one)…
    await proxied.sequelize.query(`UPDATE sign_in_throttle SET next_at = greatest(next_at, now() + interval '60 seconds') WHERE address = '203.0.113.66'`);
    const there = await from(proxied, '203.0.113.66').post('/api/auth/sign-in', { email: owner, password: TEST_PASSWORD });
    expect(there.status).toBe(429);
    expect(Number(there.headers['retry-after'])).toBeGreaterThan(0);
    // …while the owner, on their own phone's address, signs in at once.
    expect((await from(proxied, '198.51.100.23').post('/api/auth/sign-in', { email: owner, password: TEST_PASSWORD })).status).toBe(200);
  });

  it('doubles the wait after each further failure, up to a ceiling, and answers known and unknown accounts alike', async () => {
    const team = await createTeam();
    const known = team.members.tester.email;
    const unknown = `nobody-${team.teamId.slice(0, 8)}@workshop.test`;
    const waits: Record<string, number[]> = { [known]: [], [unknown]: [] };
    for (const email of [known, unknown]) {
      for (let i = 0; i < F; i++) expect((await from(proxied, '203.0.113.70').post('/api/auth/sign-in', { email, ...wrong })).status).toBe(401);
      for (let round = 0; round < 12; round++) {
        // As if the wait had passed: the next guess is read, fails, and sets a longer wait.
        await ts().sequelize.query(`UPDATE sign_in_throttle SET next_at = now() WHERE address = '203.0.113.70'`);
        expect((await from(proxied, '203.0.113.70').post('/api/auth/sign-in', { email, ...wrong })).status).toBe(401);
        const held = await from(proxied, '203.0.113.70').post('/api/auth/sign-in', { email, ...wrong });
        expect(held.status).toBe(429);
        waits[email].push(Number(held.headers['retry-after']));
      }
    }
    expect(waits[known]).toEqual(waits[unknown]);
    const w = waits[known];
    expect(w[0]).toBeLessThanOrEqual(2);
    for (let i = 1; i < w.length; i++) expect(w[i]).toBeGreaterThanOrEqual(Math.min(w[i - 1] * 2 - 1, signInThrottle.maxWaitS - 1));
    expect(Math.max(...w)).toBeLessThanOrEqual(signInThrottle.maxWaitS);
    expect(Math.max(...w)).toBeGreaterThan(signInThrottle.maxWaitS / 2);
  });

  it('forgets the failures of an (account, address) after a successful sign-in', async () => {
    const team = await createTeam();
    const email = team.members.admin.email;
    for (let round = 0; round < 3; round++) {
      for (let i = 0; i < F; i++) expect((await from(proxied, '203.0.113.71').post('/api/auth/sign-in', { email, ...wrong })).status).toBe(401);
      expect((await from(proxied, '203.0.113.71').post('/api/auth/sign-in', { email, password: TEST_PASSWORD })).status).toBe(200);
    }
  });

  it('does not lock out everyone behind a shared address when one person mistypes', async () => {
    const team = await createTeam();
    for (let i = 0; i < F + 10; i++) await from(proxied, '203.0.113.72').post('/api/auth/sign-in', { email: team.members.viewer.email, ...wrong });
    for (const who of ['admin', 'engineer', 'tester'] as const) {
      expect((await from(proxied, '203.0.113.72').post('/api/auth/sign-in', { email: team.members[who].email, password: TEST_PASSWORD })).status).toBe(200);
    }
  });

  it('stops one address trying many accounts (credential stuffing), and only that address', async () => {
    const team = await createTeam();
    const n = signInThrottle.accountsPerAddress;
    for (let i = 0; i < n; i++) {
      expect(
        (await from(proxied, '203.0.113.73').post('/api/auth/sign-in', { email: `stuffed-${i}-${team.teamId.slice(0, 6)}@workshop.test`, ...wrong })).status,
      ).toBe(401);
    }
    const next = await from(proxied, '203.0.113.73').post('/api/auth/sign-in', { email: team.members.admin.email, password: TEST_PASSWORD });
    expect(next.status).toBe(429);
    expect(Number(next.headers['retry-after'])).toBeGreaterThan(0);
    expect((await from(proxied, '203.0.113.74').post('/api/auth/sign-in', { email: team.members.admin.email, password: TEST_PASSWORD })).status).toBe(200);
  });

  it('does not count successful sign-ins', async () => {
    const team = await createTeam();
    for (let i = 0; i < F + 3; i++) {
      expect((await agentFor(direct).post('/api/auth/sign-in').send({ email: team.members.tester.email, password: TEST_PASSWORD })).status).toBe(200);
    }
  });

  it('ignores X-Forwarded-For when no proxy is trusted: a client cannot pick its own address', async () => {
    const team = await createTeam();
    const email = team.members.admin.email;
    for (let i = 0; i < F + 1; i++) await from(direct, `203.0.113.${i + 1}`).post('/api/auth/sign-in', { email, ...wrong });
    expect((await from(direct, '198.51.100.99').post('/api/auth/sign-in', { email, password: TEST_PASSWORD })).status).toBe(429);
  });

  it('counts in PostgreSQL: failures at one app instance hold at another', async () => {
    const team = await createTeam();
    const email = team.members.engineer.email;
    const other = await startServerProcess(process.env.DATABASE_URL!, { TRUST_PROXY: 'loopback' });
    try {
      for (let i = 0; i < F + 1; i++) await from(proxied, '203.0.113.75').post('/api/auth/sign-in', { email, ...wrong });
      const res = await fetch(`${other.baseUrl}/api/auth/sign-in`, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json', Origin: other.baseUrl, 'X-Forwarded-For': '203.0.113.75' },
        body: JSON.stringify({ email, password: TEST_PASSWORD }),
      });
      expect(res.status).toBe(429);
    } finally {
      await other.stop();
    }
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
