// The session review as the desk receives it: built by PostgreSQL yet the same records, field for
// field, as the session route's (Sequelize and to-record.ts) and the photos as the pull's; compressed on the wire; and with a
// cheap validator, so an unchanged review answers 304 with no body, and any change to the session,
// its readings or its history, or another person asking, gets the whole answer again.
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import http from 'node:http';
import pg from 'pg';
import zlib from 'node:zlib';
import { randomUUID } from 'node:crypto';
import sharp from 'sharp';
import { createTeam, sessionAgent, signedInAgent, startTestServer, type Agent, type TestServer } from '../support/test-app';
import { createDeskSession } from '../support/desk';
import { batchKey, change } from '../support/sync';
import { MembershipModel, ReadingModel, PoseModel } from '../../server/models';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

const reviewOf = (agent: Agent, sessionId: string, etag?: string) => {
  const req = agent.get(`/api/sessions/${sessionId}/review`);
  return etag ? req.set('If-None-Match', etag) : req;
};

/**
 * The statements a `pg.Client#query` spy saw, less the sign-in's own bookkeeping: a successful
 * sign-in clears its throttle record once its answer is sent, so under load that DELETE can land
 * in the window of the request a test counts.
 */
const statementsOf = (spy: { mock: { calls: unknown[][] } }) =>
  spy.mock.calls.map(([q]) => (typeof q === 'string' ? q : (q as { text: string }).text)).filter((text) => !/\bsign_in_throttle\b/.test(text));

/** The session cookie a supertest agent carries. */
const cookieOf = (agent: Agent) =>
  (agent as unknown as { jar: { getCookies(o: object): { toValueString(): string }[] } }).jar
    .getCookies({ domain: '127.0.0.1', path: '/', secure: false, script: false })
    .map((c) => c.toValueString())
    .join('; ');

/** The raw bytes on the wire for an Accept-Encoding, and the decoded text and JSON. */
function onTheWire(cookie: string, path: string, encoding: string): Promise<{ bytes: number; encoding?: string; text: string; json: unknown }> {
  return new Promise((resolve, reject) => {
    http
      .get(`${ts.baseUrl}${path}`, { headers: { Cookie: cookie, 'Accept-Encoding': encoding } }, (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (c) => chunks.push(c));
        res.on('end', () => {
          const raw = Buffer.concat(chunks);
          const enc = res.headers['content-encoding'];
          const text = enc === 'br' ? zlib.brotliDecompressSync(raw) : enc === 'gzip' ? zlib.gunzipSync(raw) : raw;
          resolve({ bytes: raw.length, encoding: enc, text: text.toString('utf8'), json: JSON.parse(text.toString('utf8')) });
        });
      })
      .on('error', reject);
  });
}

describe('the review answer', () => {
  it('carries the same session, vehicle, gauge points, poses and readings as the session route, plus names and history', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team, { poses: 5 });
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const excluded = s.readingIdList[3];
    expect((await engineer.patch(`/api/readings/${excluded}/review`).send({ version: 1, excluded: true, excludeReason: 'gauge slipped' })).status).toBe(200);
    // A deleted pose and its readings stay out of both answers.
    await PoseModel.update({ deletedAt: new Date() }, { where: { id: s.poseIds[4] } });

    // A photo of the session, as the tester uploads it: the review carries it as the pull does.
    const tester = await signedInAgent(ts, team.members.tester.email);
    const jpeg = await sharp({ create: { width: 64, height: 48, channels: 3, background: '#778877' } })
      .jpeg()
      .toBuffer();
    const photoId = randomUUID();
    const uploaded = await tester
      .post('/api/photos')
      .field('id', photoId)
      .field('sessionId', s.sessionId)
      .field('poseId', s.poseIds[1])
      .attach('photo', jpeg, { filename: 'gauge.jpg', contentType: 'image/jpeg' });
    expect(uploaded.status).toBe(201);

    const review = await reviewOf(engineer, s.sessionId);
    const detail = await engineer.get(`/api/sessions/${s.sessionId}`);
    const pulled = await engineer.get('/api/sync/pull').query({ since: 0, limit: 5000 });
    expect(review.body.photos).toEqual(pulled.body.photos.filter((p: { sessionId: string }) => p.sessionId === s.sessionId));
    expect(review.body.photos.map((p: { id: string }) => p.id)).toEqual([photoId]);
    expect(review.status).toBe(200);
    expect(review.headers['content-type']).toMatch(/^application\/json/);
    for (const key of ['session', 'vehicle', 'gaugePoints', 'poses', 'readings'] as const) {
      expect(review.body[key], key).toEqual(detail.body[key]);
    }
    expect(review.body.readings.length).toBeGreaterThan(0);
    expect(review.body.poses).toHaveLength(s.poseIds.length - 1);
    expect(Object.keys(review.body).sort()).toEqual(['gaugePoints', 'history', 'people', 'photos', 'poses', 'readings', 'session', 'vehicle']);
    expect(review.body.people).toEqual({ [team.members.tester.userId]: `tester ${team.members.tester.userId.slice(0, 4)}` });
    expect(review.body.history).toEqual([
      expect.objectContaining({
        entity: 'reading',
        entityId: excluded,
        action: 'reading.exclude',
        userName: `engineer ${team.members.engineer.userId.slice(0, 4)}`,
        detail: expect.objectContaining({ excluded: { before: false, after: true } }),
      }),
    ]);
    expect(review.body.history[0].createdAt).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z$/);
    expect(typeof review.body.history[0].id).toBe('number');
  });

  it('answers 404 for a session of another workshop, or none', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const outsider = await signedInAgent(ts, (await createTeam('Other')).members.engineer.email);
    expect((await reviewOf(outsider, s.sessionId)).status).toBe(404);
    expect((await reviewOf(outsider, '00000000-0000-4000-8000-000000000000')).status).toBe(404);
  });

  it("answers 404 for another workshop's session from the look-up's one statement, without building a review", async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const outsider = await signedInAgent(ts, (await createTeam('Other')).members.engineer.email);
    const statements = vi.spyOn(pg.Client.prototype, 'query');
    try {
      expect((await reviewOf(outsider, s.sessionId)).status).toBe(404);
      expect(statementsOf(statements)).toHaveLength(1);
    } finally {
      statements.mockRestore();
    }
  });

  it('runs the validator query only for a role that may see the review: a tester costs the look-up alone', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    /** The plan nodes of the look-up statement a request sent, as PostgreSQL ran them. */
    const lookUpPlan = async (agent: Agent, status: number) => {
      const statements = vi.spyOn(pg.Client.prototype, 'query');
      let sent: { text: string; values: unknown[] } | undefined;
      try {
        expect((await reviewOf(agent, s.sessionId)).status).toBe(status);
        sent = statements.mock.calls.map((c) => c[0] as unknown as { name?: string; text: string; values: unknown[] }).find((q) => q.name?.includes('review'));
      } finally {
        statements.mockRestore();
      }
      expect(sent).toBeDefined();
      const client = new pg.Client(process.env.DATABASE_URL);
      await client.connect();
      try {
        const { rows } = await client.query(`EXPLAIN (ANALYZE, FORMAT JSON) ${sent!.text}`, sent!.values);
        const nodes: { 'Relation Name'?: string; 'Actual Loops': number }[] = [];
        const walk = (n: { Plans?: unknown[] }) => (nodes.push(n as (typeof nodes)[number]), (n.Plans ?? []).forEach((c) => walk(c as { Plans?: unknown[] })));
        walk(rows[0]['QUERY PLAN'][0].Plan);
        return nodes;
      } finally {
        await client.end();
      }
    };
    const historyLoops = (nodes: { 'Relation Name'?: string; 'Actual Loops': number }[]) =>
      nodes.filter((n) => n['Relation Name'] === 'history_events').map((n) => n['Actual Loops']);

    const engineer = await lookUpPlan(await signedInAgent(ts, team.members.engineer.email), 200);
    expect(historyLoops(engineer).some((loops) => loops > 0)).toBe(true);
    const tester = await lookUpPlan(await signedInAgent(ts, team.members.tester.email), 403);
    expect(historyLoops(tester).length).toBeGreaterThan(0);
    expect(historyLoops(tester).every((loops) => loops === 0)).toBe(true);
  });

  it('answers 304 with no body while nothing changed, and the whole answer after any change', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const first = await reviewOf(engineer, s.sessionId);
    const etag = first.headers.etag;
    expect(etag).toMatch(/^W\/"review\./);

    const again = await reviewOf(engineer, s.sessionId, etag);
    expect(again.status).toBe(304);
    expect(again.text ?? '').toBe('');
    expect(again.headers.etag).toBe(etag);

    // A reading reviewed at the desk.
    expect((await engineer.patch(`/api/readings/${s.readingIdList[0]}/review`).send({ version: 1, flagNote: 'check this' })).status).toBe(200);
    const afterEdit = await reviewOf(engineer, s.sessionId, etag);
    expect(afterEdit.status).toBe(200);
    expect(afterEdit.body.readings.find((r: { id: string }) => r.id === s.readingIdList[0]).flagNote).toBe('check this');
    const etag2 = afterEdit.headers.etag;
    expect(etag2).not.toBe(etag);
    expect((await reviewOf(engineer, s.sessionId, etag2)).status).toBe(304);

    // A phone's push changing a pose of the session.
    const tester = await signedInAgent(ts, team.members.tester.email);
    const pulled = (await tester.get('/api/sync/pull?since=0')).body;
    const pose = pulled.poses.find((p: { id: string }) => p.id === s.poseIds[1]);
    const pushed = await tester
      .post('/api/sync/push')
      .send({ idempotencyKey: batchKey(), changes: [change('pose', { ...pose, notes: 'spotter moved the block' })] });
    expect(pushed.status).toBe(200);
    const afterPush = await reviewOf(engineer, s.sessionId, etag2);
    expect(afterPush.status).toBe(200);
    expect(afterPush.body.poses.find((p: { id: string }) => p.id === s.poseIds[1]).notes).toBe('spotter moved the block');

    // Another person never gets a 304 for a copy someone else received.
    const admin = await signedInAgent(ts, team.members.admin.email);
    const theirs = await reviewOf(admin, s.sessionId, afterPush.headers.etag);
    expect(theirs.status).toBe(200);
    expect(theirs.body.readings).toHaveLength(s.readingIdList.length);
  });

  it('sends the review and the pull with no whitespace between tokens, in every encoding', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    for (const path of [`/api/sessions/${s.sessionId}/review`, '/api/sync/pull?since=0']) {
      const asked = (await engineer.get(path)).body;
      for (const encoding of ['identity', 'br', 'gzip']) {
        const sent = await onTheWire(cookieOf(engineer), path, encoding);
        // Outside its strings, JSON needs no whitespace at all.
        expect(sent.text.replace(/"(?:[^"\\]|\\.)*"/g, '""'), `${path} ${encoding}`).not.toMatch(/\s/);
        expect(sent.json).toEqual(asked);
      }
    }
  });

  it('reads the session and the validator in one statement: a 304 costs one round trip, the review and the pull alike', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const statements = vi.spyOn(pg.Client.prototype, 'query');
    try {
      for (const path of [`/api/sessions/${s.sessionId}/review`, '/api/sync/pull?since=0']) {
        const etag = (await engineer.get(path)).headers.etag;
        statements.mockClear();
        const again = await engineer.get(path).set('If-None-Match', etag);
        expect(again.status).toBe(304);
        expect(statementsOf(statements)).toHaveLength(1);
      }
    } finally {
      statements.mockRestore();
    }
  });

  it("shows a person renamed since the desk's copy under the new name", async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const etag = (await reviewOf(engineer, s.sessionId)).headers.etag;
    const tester = await signedInAgent(ts, team.members.tester.email);
    expect((await tester.patch('/api/me').send({ name: 'Joss Harlow-Venn' })).status).toBe(200);
    const res = await reviewOf(engineer, s.sessionId, etag);
    expect(res.status).toBe(200);
    expect(res.body.people[team.members.tester.userId]).toBe('Joss Harlow-Venn');
  });

  it('shows the new name of a person who left the workshop and was renamed since', async () => {
    // The review names whoever entered readings or changed something, members or not: a tester
    // who synced this session, then was removed from this workshop but is still in another,
    // renames themself there.
    const team = await createTeam();
    const other = await createTeam('Other workshop');
    const s = await createDeskSession(team);
    const testerId = team.members.tester.userId;
    await MembershipModel.create({ id: randomUUID(), teamId: other.teamId, userId: testerId, role: 'tester' });
    const tester = await signedInAgent(ts, team.members.tester.email);
    const pose = (await tester.get('/api/sync/pull?since=0')).body.poses.find((p: { id: string }) => p.id === s.poseIds[0]);
    const synced = await tester.post('/api/sync/push').send({ idempotencyKey: batchKey(), changes: [change('pose', { ...pose, notes: 'chocks in' })] });
    expect(synced.status).toBe(200);
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const admin = await signedInAgent(ts, team.members.admin.email);
    expect((await admin.delete(`/api/team/members/${testerId}`)).status).toBe(200);
    const etag = (await reviewOf(engineer, s.sessionId)).headers.etag;
    const elsewhere = await sessionAgent(ts, testerId, other.teamId);
    expect((await elsewhere.patch('/api/me').send({ name: 'Joss Harlow-Venn' })).status).toBe(200);
    const res = await reviewOf(engineer, s.sessionId, etag);
    expect(res.status).toBe(200);
    expect(res.body.people[testerId]).toBe('Joss Harlow-Venn');
    // Asked afresh (no validator), it is not an older copy either.
    expect((await reviewOf(engineer, s.sessionId)).body.people[testerId]).toBe('Joss Harlow-Venn');
  });

  it('a change elsewhere in the workshop costs a full answer but never a stale one', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const etag = (await reviewOf(engineer, s.sessionId)).headers.etag;
    await ReadingModel.update({ valueMm: 42.5 }, { where: { id: s.readingIdList[5] } });
    const res = await reviewOf(engineer, s.sessionId, etag);
    expect(res.status).toBe(200);
    expect(res.body.readings.find((r: { id: string }) => r.id === s.readingIdList[5]).valueMm).toBe(42.5);
  });

  it('is sent compressed (brotli or gzip) at a small fraction of its raw size', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team, { poses: 12 });
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const cookie = cookieOf(engineer);
    const path = `/api/sessions/${s.sessionId}/review`;
    const raw = await onTheWire(cookie, path, 'identity');
    const br = await onTheWire(cookie, path, 'br, gzip');
    const gzip = await onTheWire(cookie, path, 'gzip');
    expect(raw.encoding).toBeUndefined();
    expect(br.encoding).toBe('br');
    expect(gzip.encoding).toBe('gzip');
    expect(br.json).toEqual(raw.json);
    expect(gzip.json).toEqual(raw.json);
    expect(br.bytes / raw.bytes, `${br.bytes} of ${raw.bytes} bytes`).toBeLessThan(0.2);
  });
});
