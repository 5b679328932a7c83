// The answer cache on two instances: each keeps the review's and the pull's finished bytes, yet a
// write through one instance is seen at once through the other's cache, a rename that alters the
// answer gives it a new key, and a role change or another workshop never reaches kept bytes (the
// access check and the validator run on every request, in PostgreSQL).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import http from 'node:http';
import zlib from 'node:zlib';
import { createTeam, startTestServer, type TestServer, type TestTeam } from '../support/test-app';
import { createDeskSession, type DeskSession } from '../support/desk';
import { startServerProcess, type ServerProcess } from '../faults/fault-rig';
import { startSession } from '../../server/auth/lucia';
import { MembershipModel } from '../../server/models';
import { batchKey, change } from '../support/sync';

let ts: TestServer;
let a: ServerProcess;
let b: ServerProcess;

beforeAll(async () => {
  ts = await startTestServer(); // this file's models and database connection
  [a, b] = await Promise.all([startServerProcess(process.env.DATABASE_URL!), startServerProcess(process.env.DATABASE_URL!)]);
}, 120_000);

afterAll(async () => {
  await Promise.all([a?.stop(), b?.stop()]);
  await ts?.close();
});

const cookieOf = async (userId: string, teamId: string) => (await startSession(userId, teamId)).split(';')[0];

/** One request to an instance as a browser sends it, read as the bytes on the wire; a compressed body is decoded. */
function ask(server: ServerProcess, cookie: string, method: string, path: string, opts: { body?: unknown; encoding?: string } = {}) {
  const body = opts.body === undefined ? undefined : JSON.stringify(opts.body);
  const headers: Record<string, string> = { Cookie: cookie, Origin: server.baseUrl, 'Accept-Encoding': opts.encoding ?? 'identity' };
  if (body) headers['Content-Type'] = 'application/json';
  return new Promise<{ status: number; encoding?: string; etag?: string; data: unknown }>((resolve, reject) => {
    const req = http.request(server.baseUrl + path, { method, headers }, (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => {
        const raw = Buffer.concat(chunks);
        const encoding = res.headers['content-encoding'];
        const text = encoding === 'br' ? zlib.brotliDecompressSync(raw) : encoding === 'gzip' ? zlib.gunzipSync(raw) : raw;
        resolve({ status: res.statusCode!, encoding, etag: res.headers.etag, data: text.length ? JSON.parse(text.toString('utf8')) : undefined });
      });
    });
    req.on('error', reject);
    req.end(body);
  });
}

interface Review {
  readings: { id: string; excluded: boolean; version: number }[];
  people: Record<string, string>;
}

describe('finished answers kept per instance', () => {
  let team: TestTeam;
  let s: DeskSession;
  let engineer: string;
  const reviewPath = () => `/api/sessions/${s.sessionId}/review`;

  beforeAll(async () => {
    team = await createTeam('Cache workshop');
    s = await createDeskSession(team);
    engineer = await cookieOf(team.members.engineer.userId, team.teamId);
  });

  /** The review through both instances, in every encoding, so both caches hold it. */
  async function warmBoth(cookie: string): Promise<Review> {
    let last: Review | undefined;
    for (const server of [a, b]) {
      for (const encoding of ['identity', 'br', 'gzip']) {
        const r = await ask(server, cookie, 'GET', reviewPath(), { encoding });
        expect(r.status).toBe(200);
        expect(r.encoding ?? 'identity').toBe(encoding);
        if (last) expect(r.data).toEqual(last);
        last = r.data as Review;
      }
    }
    return last!;
  }

  it('shows a desk edit made through one instance at once through the other, in every encoding', async () => {
    const before = await warmBoth(engineer);
    const reading = before.readings[2];
    expect(reading.excluded).toBe(false);
    const edit = await ask(a, engineer, 'PATCH', `/api/readings/${reading.id}/review`, {
      body: { version: reading.version, excluded: true, excludeReason: 'tape slipped' },
    });
    expect(edit.status).toBe(200);
    for (const encoding of ['br', 'gzip', 'identity']) {
      const after = await ask(b, engineer, 'GET', reviewPath(), { encoding });
      expect(after.status).toBe(200);
      expect((after.data as Review).readings.find((r) => r.id === reading.id)!.excluded).toBe(true);
    }
  });

  it("shows a phone's push through one instance at once in the other's pull", async () => {
    const tester = await cookieOf(team.members.tester.userId, team.teamId);
    const first = await ask(b, tester, 'GET', '/api/sync/pull?since=0&limit=5000', { encoding: 'br' });
    expect(first.status).toBe(200);
    expect((await ask(b, tester, 'GET', '/api/sync/pull?since=0&limit=5000', { encoding: 'br' })).data).toEqual(first.data);
    const pose = (first.data as { poses: { id: string; notes: string }[] }).poses.find((p) => p.id === s.poseIds[1])!;
    const pushed = await ask(a, tester, 'POST', '/api/sync/push', {
      body: { idempotencyKey: batchKey(), changes: [change('pose', { ...pose, notes: 'block moved under the left rear' })] },
    });
    expect(pushed.status).toBe(200);
    const after = await ask(b, tester, 'GET', '/api/sync/pull?since=0&limit=5000', { encoding: 'br' });
    expect((after.data as { poses: { id: string; notes: string }[] }).poses.find((p) => p.id === s.poseIds[1])!.notes).toBe('block moved under the left rear');
    expect(after.etag).not.toBe(first.etag);
  });

  it('gives a renamed person their new name through the instance that kept the old answer', async () => {
    await warmBoth(engineer);
    const tester = await cookieOf(team.members.tester.userId, team.teamId);
    expect((await ask(a, tester, 'PATCH', '/api/me', { body: { name: 'Wren Okafor-Lindqvist' } })).status).toBe(200);
    const after = await ask(b, engineer, 'GET', reviewPath(), { encoding: 'br' });
    expect((after.data as Review).people[team.members.tester.userId]).toBe('Wren Okafor-Lindqvist');
  });

  it('refuses a person whose role changed through the other instance, though their answer is kept', async () => {
    const user = team.members.admin.userId;
    const admin = await cookieOf(user, team.teamId);
    await warmBoth(admin);
    // The admin makes the engineer an admin, then is made a viewer by them, through instance a.
    expect((await ask(a, admin, 'PATCH', `/api/team/members/${team.members.engineer.userId}`, { body: { role: 'admin' } })).status).toBe(200);
    expect((await ask(a, engineer, 'PATCH', `/api/team/members/${user}`, { body: { role: 'viewer' } })).status).toBe(200);
    expect((await ask(b, admin, 'GET', reviewPath(), { encoding: 'br' })).status).toBe(403);
    expect((await ask(b, admin, 'GET', '/api/sync/pull?since=0', { encoding: 'br' })).status).toBe(403);
    // Removed from the workshop: signed out everywhere.
    await MembershipModel.destroy({ where: { teamId: team.teamId, userId: user } });
    expect((await ask(b, admin, 'GET', reviewPath())).status).toBe(401);
  });

  it('never gives another workshop the bytes it keeps for this one', async () => {
    await warmBoth(engineer);
    const other = await createTeam('Other workshop');
    const outsider = await cookieOf(other.members.engineer.userId, other.teamId);
    for (const server of [a, b]) expect((await ask(server, outsider, 'GET', reviewPath(), { encoding: 'br' })).status).toBe(404);
    const theirs = await ask(b, outsider, 'GET', '/api/sync/pull?since=0&limit=5000');
    expect((theirs.data as { testSessions: unknown[] }).testSessions).toEqual([]);
  });
});
