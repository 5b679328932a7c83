// What the HTTP layer does before any route's work: bodies are parsed only once access is known
// and within small limits (a large limit only for sync push), nesting depth is bounded, security
// headers are set on every answer (HSTS only in production), personal API JSON is never cached,
// and the development mailbox answers only to this host's own names.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import request from 'supertest';
import { pino } from 'pino';
import { createApp } from '../../server/app';
import { agentFor, createTeam, sessionAgent, startTestServer, type TestServer } from '../support/test-app';
import { batchKey, change, sessionRecord, vehicleWithPoints } from '../support/sync';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts?.close());

const nested = (depth: number) => `${'['.repeat(depth)}${']'.repeat(depth)}`;

describe('body parsing waits for access', () => {
  it('answers a signed-out push with 401 without reading its body (broken JSON is never parsed)', async () => {
    const res = await request(ts.server)
      .post('/api/sync/push')
      .set('Origin', ts.origin)
      .set('Content-Type', 'application/json')
      .send('{"changes": [[[[ not json');
    expect(res.status).toBe(401);
  });

  it('answers a foreign Origin with 403 without reading its body', async () => {
    const res = await request(ts.server)
      .post('/api/auth/sign-in')
      .set('Origin', 'http://elsewhere.test')
      .set('Content-Type', 'application/json')
      .send('{"email": ');
    expect(res.status).toBe(403);
  });

  it('refuses a role without the right before parsing (a viewer pushing broken JSON gets 403)', async () => {
    const team = await createTeam();
    const viewer = await sessionAgent(ts, team.members.viewer.userId, team.teamId);
    const res = await viewer.post('/api/sync/push').set('Content-Type', 'application/json').send('{"changes": [[[[');
    expect(res.status).toBe(403);
  });

  it('gives an unknown API route 404 without parsing its body', async () => {
    const res = await agentFor(ts).post('/api/no-such-route').set('Content-Type', 'application/json').send('{{{{');
    expect(res.status).toBe(404);
  });
});

describe('body limits', () => {
  it('refuses more than 64 kB on an ordinary route with 413', async () => {
    const team = await createTeam();
    const admin = await sessionAgent(ts, team.members.admin.userId, team.teamId);
    const res = await admin.patch('/api/me').send({ name: 'x'.repeat(70 * 1024) });
    expect(res.status).toBe(413);
    expect(res.body.error.message).toMatch(/64 kB/);
  });

  it('refuses 64 kB+ on a public route too (sign-in)', async () => {
    const res = await agentFor(ts)
      .post('/api/auth/sign-in')
      .send({ email: 'a@b.test', password: 'p'.repeat(70 * 1024) });
    expect(res.status).toBe(413);
  });

  it('still takes a large batch on sync push', async () => {
    const team = await createTeam();
    const tester = await sessionAgent(ts, team.members.tester.userId, team.teamId);
    const { vehicleId } = await vehicleWithPoints(tester);
    const s = { ...sessionRecord(vehicleId), notes: 'n'.repeat(3_900) };
    const changes = Array.from({ length: 60 }, () => change('testSession', { ...s, id: crypto.randomUUID() }));
    const body = { idempotencyKey: batchKey(), changes };
    expect(JSON.stringify(body).length).toBeGreaterThan(200 * 1024);
    const res = await tester.post('/api/sync/push').send(body);
    expect(res.status, JSON.stringify(res.body).slice(0, 300)).toBe(200);
  });

  it('refuses JSON nested deeper than the limit, naming it, on public and sync routes', async () => {
    const pub = await agentFor(ts)
      .post('/api/auth/sign-in')
      .set('Content-Type', 'application/json')
      .send(`{"email": ${nested(200)}}`);
    expect(pub.status).toBe(400);
    expect(pub.body.error.message).toMatch(/nested deeper than 32/);
    const team = await createTeam();
    const tester = await sessionAgent(ts, team.members.tester.userId, team.teamId);
    const push = await tester
      .post('/api/sync/push')
      .set('Content-Type', 'application/json')
      .send(`{"idempotencyKey": "k-12345678", "changes": ${nested(5_000)}}`);
    expect(push.status).toBe(400);
    expect(push.body.error.message).toMatch(/nested deeper than 32/);
  });

  it('is not fooled by brackets inside strings', async () => {
    const team = await createTeam();
    const admin = await sessionAgent(ts, team.members.admin.userId, team.teamId);
    const res = await admin.patch('/api/me').send({ name: `Ren ${'['.repeat(40)} "quoted" \\ ${'{'.repeat(10)}` });
    expect(res.status).toBe(200);
  });
});

describe('security headers', () => {
  it('sets a Content-Security-Policy without inline scripts, frame-ancestors none, nosniff and a Referrer-Policy', async () => {
    const res = await request(ts.server).get('/api/health');
    const csp = String(res.headers['content-security-policy'] ?? '');
    expect(csp).toMatch(/frame-ancestors 'none'/);
    const scriptSrc = /script-src ([^;]*)/.exec(csp)?.[1] ?? '';
    expect(scriptSrc).toContain("'self'");
    expect(scriptSrc).not.toContain('unsafe-inline');
    expect(scriptSrc).not.toContain('unsafe-eval');
    expect(csp).toMatch(/object-src 'none'/);
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['referrer-policy']).toBeDefined();
    expect(res.headers['x-frame-options']).toBe('DENY');
    // Not in production: no HSTS on a plain-http development server.
    expect(res.headers['strict-transport-security']).toBeUndefined();
  });

  it('adds HSTS in production', async () => {
    const server = http.createServer(createApp({ logger: pino({ level: 'silent' }), production: true }));
    await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
    try {
      const res = await request(server).get('/api/health');
      expect(res.headers['strict-transport-security']).toMatch(/max-age=\d{7,}/);
    } finally {
      await new Promise((r) => server.close(r));
    }
  });

  it('marks personal API JSON as not to be stored', async () => {
    const team = await createTeam();
    const engineer = await sessionAgent(ts, team.members.engineer.userId, team.teamId);
    for (const path of ['/api/me', '/api/team', '/api/sessions', '/api/sync/pull']) {
      const res = await engineer.get(path);
      expect(res.status, path).toBe(200);
      expect(res.headers['cache-control'], path).toMatch(/no-store/);
    }
    const failed = await agentFor(ts).get('/api/me');
    expect(failed.status).toBe(401);
    expect(failed.headers['cache-control']).toMatch(/no-store/);
  });
});

describe('the development mailbox', () => {
  it('answers only to this host (DNS rebinding: a foreign Host header gets nothing)', async () => {
    const own = await request(ts.server).get('/dev/mailbox');
    expect(own.status).toBe(200);
    const { port } = ts.server.address() as AddressInfo;
    for (const host of [`rebound.attacker.test:${port}`, 'rebound.attacker.test', `127.0.0.1.nip.test:${port}`]) {
      const res = await request(ts.server).get('/dev/mailbox').set('Host', host);
      expect(res.status, host).toBe(403);
      expect(res.text).not.toContain('Mailbox');
      const json = await request(ts.server).get('/dev/mailbox.json').set('Host', host);
      expect(json.status, host).toBe(403);
    }
    expect((await request(ts.server).get('/dev/mailbox').set('Host', `localhost:${port}`)).status).toBe(200);
  });

  it('is refused outside development and tests', async () => {
    const { createMailboxRouter } = await import('../../server/mail/mailbox');
    const before = process.env.NODE_ENV;
    for (const env of ['production', undefined]) {
      if (env === undefined) delete process.env.NODE_ENV;
      else process.env.NODE_ENV = env;
      try {
        expect(() => createMailboxRouter(ts.mail), String(env)).toThrow(/development/);
      } finally {
        process.env.NODE_ENV = before;
      }
    }
  });
});
