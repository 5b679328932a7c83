// Push and pull through HTTP on the real PostgreSQL: idempotent batches, kept conflicts, whole-batch
// rejection, team scope, and the pull cursor.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import http from 'node:http';
import zlib from 'node:zlib';
import { createHash, randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import pg from 'pg';
import { createTeam, signedInAgent, startTestServer, type TestServer } from '../support/test-app';
import { batchKey, change, gaugePointRecords, poseRecord, pushAccepted, readingRecord, sessionRecord, vehicleWithPoints } from '../support/sync';
import { PoseModel, ReadingModel, SyncConflictModel, TestSessionModel } from '../../server/models';
import { pushRequest } from '../../shared/schemas/sync';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

async function fieldSetup() {
  const team = await createTeam();
  const tester = await signedInAgent(ts, team.members.tester.email);
  const { vehicleId, pointIds } = await vehicleWithPoints(tester);
  const session = sessionRecord(vehicleId);
  const level = poseRecord(session.id, 0);
  const readings = pointIds.map((p, i) => readingRecord(level.id, p, 'lateral', 90 + i));
  return { team, tester, vehicleId, pointIds, session, level, readings };
}

describe('push', () => {
  it('writes a session, pose and readings, with enteredBy and createdBy from the signed-in user', async () => {
    const f = await fieldSetup();
    const res = await f.tester.post('/api/sync/push').send({
      idempotencyKey: batchKey(),
      changes: [change('testSession', f.session), change('pose', f.level), ...f.readings.map((r) => change('reading', r))],
    });
    expect(res.status).toBe(200);
    expect(res.body.conflicts).toEqual([]);
    expect(res.body.accepted).toHaveLength(2 + f.readings.length);
    const s = await TestSessionModel.findByPk(f.session.id);
    expect(s?.teamId).toBe(f.team.teamId);
    expect(s?.createdBy).toBe(f.team.members.tester.userId);
    expect(s?.safetyAckBy).toBe(f.team.members.tester.userId);
    const rows = await ReadingModel.findAll({ where: { poseId: f.level.id } });
    expect(rows.map((r) => r.valueMm).sort()).toEqual([90, 91, 92, 93]);
    expect(new Set(rows.map((r) => r.enteredBy))).toEqual(new Set([f.team.members.tester.userId]));
  });

  it('writes a batch sent twice only once and answers the same', async () => {
    const f = await fieldSetup();
    const body = { idempotencyKey: batchKey(), changes: [change('testSession', f.session), change('pose', f.level), change('reading', f.readings[0])] };
    const first = await f.tester.post('/api/sync/push').send(body);
    const second = await f.tester.post('/api/sync/push').send(body);
    expect(first.status).toBe(200);
    expect(second.status).toBe(200);
    expect(second.body).toEqual(first.body);
    expect(await ReadingModel.count({ where: { poseId: f.level.id } })).toBe(1);
    expect((await ReadingModel.findByPk(f.readings[0].id))?.version).toBe(1);
  });

  it('answers a retried mixed batch (new, edited, stale) the same, from a stored answer that does not repeat the records', async () => {
    const f = await fieldSetup();
    const [r0, r1, r2, r3] = f.readings;
    await f.tester.post('/api/sync/push').send({
      idempotencyKey: batchKey(),
      changes: [change('testSession', f.session), change('pose', f.level), change('reading', r0), change('reading', r1), change('reading', r2)],
    });
    const engineer = await signedInAgent(ts, f.team.members.engineer.email);
    await engineer.post('/api/sync/push').send({ idempotencyKey: batchKey(), changes: [change('reading', { ...r1, valueMm: 50 })] });
    // Edited (to version 2), stale (kept as a conflict), new, edited: the answer's order is not the batch's.
    const body = {
      idempotencyKey: batchKey(),
      changes: [
        change('reading', { ...r0, valueMm: 60 }),
        change('reading', { ...r1, valueMm: 61 }),
        change('reading', r3),
        change('reading', { ...r2, valueMm: 62 }),
      ],
    };
    const first = await f.tester.post('/api/sync/push').send(body);
    expect(first.status).toBe(200);
    expect(first.body.accepted).toEqual(
      expect.arrayContaining([
        { entity: 'reading', id: r3.id, version: 1 },
        { entity: 'reading', id: r0.id, version: 2 },
        { entity: 'reading', id: r2.id, version: 2 },
      ]),
    );
    expect(first.body.accepted).toHaveLength(3);
    expect(first.body.conflicts).toHaveLength(1);
    expect(first.body.conflicts[0]).toMatchObject({ entityId: r1.id, baseVersion: 1, serverVersion: 2 });
    const second = await f.tester.post('/api/sync/push').send(body);
    expect(second.status).toBe(200);
    expect(second.body).toEqual(first.body);
    expect((await ReadingModel.findByPk(r0.id))?.version).toBe(2);

    // A batch of new readings stores one run of change indexes, not a line per reading.
    const poses = Array.from({ length: 50 }, (_, k) => poseRecord(f.session.id, k + 1));
    const many = poses.flatMap((p) => f.pointIds.map((g, i) => readingRecord(p.id, g, 'vertical', i)));
    const big = { idempotencyKey: batchKey(), changes: [...poses.map((p) => change('pose', p)), ...many.map((r) => change('reading', r))] };
    const answered = await f.tester.post('/api/sync/push').send(big);
    expect(answered.body.accepted).toHaveLength(250);
    const [stored] = await ts.sequelize.query<{ response: unknown }>('SELECT response FROM sync_batches WHERE idempotency_key = :key', {
      replacements: { key: big.idempotencyKey },
      type: QueryTypes.SELECT,
    });
    expect(stored.response).toEqual({ acceptedRuns: [[0, 250, 1]], conflicts: [] });
    expect((await f.tester.post('/api/sync/push').send(big)).body).toEqual(answered.body);
  });

  it('after a lost answer, the retried batch leaves one row and the answer the client missed', async () => {
    const f = await fieldSetup();
    const body = { idempotencyKey: batchKey(), changes: [change('testSession', f.session), change('pose', f.level)] };
    // The answer to this request is "lost": the client never reads it and retries later.
    const lost = f.tester
      .post('/api/sync/push')
      .send(body)
      .then((r) => r.body);
    await lost;
    const edited = { ...f.level, label: 'Level (after retry)' };
    const retry = await f.tester.post('/api/sync/push').send(body);
    expect(retry.status).toBe(200);
    expect(retry.body.accepted).toEqual(expect.arrayContaining([{ entity: 'pose', id: f.level.id, version: 1 }]));
    expect(await PoseModel.count({ where: { sessionId: f.session.id } })).toBe(1);
    // The same key with different contents is refused, not applied.
    const reused = await f.tester.post('/api/sync/push').send({ ...body, changes: [change('testSession', f.session), change('pose', edited)] });
    expect(reused.status).toBe(409);
    expect((await PoseModel.findByPk(f.level.id))?.label).toBe('Level');
  });

  it("hashes a batch's changes as validated, whatever the order of each record's fields, as every earlier answer was stored", async () => {
    const f = await fieldSetup();
    const body = {
      idempotencyKey: batchKey(),
      changes: [change('testSession', f.session), change('pose', f.level), ...f.readings.map((r) => change('reading', r))],
    };
    const first = await f.tester.post('/api/sync/push').send(body);
    expect(first.status).toBe(200);
    const [stored] = await ts.sequelize.query<{ request_hash: string }>('SELECT request_hash FROM sync_batches WHERE idempotency_key = $1', {
      bind: [body.idempotencyKey],
      type: QueryTypes.SELECT,
    });
    expect(stored.request_hash).toBe(
      createHash('sha256')
        .update(JSON.stringify(pushRequest.parse(body).changes))
        .digest('hex'),
    );
    // The same records with their fields in reverse order: the same batch, answered the same, written once.
    const reordered = { ...body, changes: body.changes.map((c) => ({ entity: c.entity, record: Object.fromEntries(Object.entries(c.record).reverse()) })) };
    expect(JSON.stringify(reordered)).not.toBe(JSON.stringify(body));
    const retry = await f.tester.post('/api/sync/push').send(reordered);
    expect(retry.status).toBe(200);
    expect(retry.body).toEqual(first.body);
    expect(await ReadingModel.count({ where: { poseId: f.level.id } })).toBe(f.readings.length);
  });

  it('keeps both versions of a stale edit as a conflict and leaves the server row unchanged', async () => {
    const f = await fieldSetup();
    await f.tester
      .post('/api/sync/push')
      .send({ idempotencyKey: batchKey(), changes: [change('testSession', f.session), change('pose', f.level), change('reading', f.readings[0])] });
    // Someone else edits the reading first (base version 1 → server version 2).
    const engineer = await signedInAgent(ts, f.team.members.engineer.email);
    const theirs = await engineer.post('/api/sync/push').send({ idempotencyKey: batchKey(), changes: [change('reading', { ...f.readings[0], valueMm: 95 })] });
    expect(theirs.body).toMatchObject({ conflicts: [] });
    expect(theirs.body.accepted).toEqual([{ entity: 'reading', id: f.readings[0].id, version: 2 }]);
    // The tester's edit still says base version 1.
    const mine = await f.tester.post('/api/sync/push').send({ idempotencyKey: batchKey(), changes: [change('reading', { ...f.readings[0], valueMm: 97 })] });
    expect(mine.status).toBe(200);
    expect(mine.body.accepted).toEqual([]);
    expect(mine.body.conflicts).toHaveLength(1);
    const c = mine.body.conflicts[0];
    expect(c).toMatchObject({ entity: 'reading', entityId: f.readings[0].id, baseVersion: 1, serverVersion: 2 });
    expect(c.clientRecord.valueMm).toBe(97);
    expect(c.serverRecord.valueMm).toBe(95);
    const row = await ReadingModel.findByPk(f.readings[0].id);
    expect(row?.valueMm).toBe(95);
    expect(row?.version).toBe(2);
    expect(await SyncConflictModel.count({ where: { entityId: f.readings[0].id, resolvedAt: null } })).toBe(1);

    // A person keeps the tester's value: written over the server row with a new version.
    const resolved = await f.tester.post(`/api/sync/conflicts/${c.id}/resolve`).send({ keep: 'client' });
    expect(resolved.status).toBe(200);
    expect(resolved.body.resolution).toBe('client');
    const after = await ReadingModel.findByPk(f.readings[0].id);
    expect([after?.valueMm, after?.version]).toEqual([97, 3]);
  });

  it('rejects a partly bad batch whole, naming the record and field, and writes nothing', async () => {
    const f = await fieldSetup();
    const strayPose = randomUUID();
    const res = await f.tester.post('/api/sync/push').send({
      idempotencyKey: batchKey(),
      changes: [
        change('testSession', f.session),
        change('pose', f.level),
        change('reading', f.readings[0]),
        change('reading', readingRecord(strayPose, f.pointIds[1], 'lateral', 12)),
      ],
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual([{ field: 'body.changes.3.record.poseId', message: expect.stringMatching(new RegExp(strayPose)) }]);
    expect(await TestSessionModel.count({ where: { id: f.session.id } })).toBe(0);
    expect(await PoseModel.count({ where: { id: f.level.id } })).toBe(0);
    expect(await ReadingModel.count({ where: { id: f.readings[0].id } })).toBe(0);
  });

  it('rejects a batch with a bad value whole, naming the field', async () => {
    const f = await fieldSetup();
    const res = await f.tester.post('/api/sync/push').send({
      idempotencyKey: batchKey(),
      changes: [change('testSession', f.session), change('pose', f.level), change('reading', { ...f.readings[0], valueMm: 'twelve' })],
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.map((e: { field: string }) => e.field)).toEqual(['body.changes.2.record.valueMm']);
    expect(await TestSessionModel.count({ where: { id: f.session.id } })).toBe(0);
  });

  it('rejects a second reading for the same pose, point and axis', async () => {
    const f = await fieldSetup();
    const twin = readingRecord(f.level.id, f.pointIds[0], 'lateral', 50);
    const res = await f.tester.post('/api/sync/push').send({
      idempotencyKey: batchKey(),
      changes: [change('testSession', f.session), change('pose', f.level), change('reading', f.readings[0]), change('reading', twin)],
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.map((e: { field: string }) => e.field)).toEqual(['body.changes.3.record.axis']);
    expect(await PoseModel.count({ where: { id: f.level.id } })).toBe(0);
  });

  it("takes the team from the session: another team's records cannot be referenced or overwritten", async () => {
    const f = await fieldSetup();
    await f.tester.post('/api/sync/push').send({ idempotencyKey: batchKey(), changes: [change('testSession', f.session), change('pose', f.level)] });
    const other = await createTeam('Other workshop');
    const outsider = await signedInAgent(ts, other.members.tester.email);
    const res = await outsider.post('/api/sync/push').send({
      idempotencyKey: batchKey(),
      changes: [change('pose', { ...f.level, label: 'hijacked' }), change('reading', readingRecord(f.level.id, f.pointIds[0], 'vertical', 1))],
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.map((e: { field: string }) => e.field)).toEqual([
      'body.changes.0.record.id',
      'body.changes.0.record.sessionId',
      'body.changes.1.record.gaugePointId',
    ]);
    expect((await PoseModel.findByPk(f.level.id))?.label).toBe('Level');
  });

  it('is refused to a viewer', async () => {
    const f = await fieldSetup();
    const viewer = await signedInAgent(ts, f.team.members.viewer.email);
    const res = await viewer.post('/api/sync/push').send({ idempotencyKey: batchKey(), changes: [change('testSession', f.session)] });
    expect(res.status).toBe(403);
  });
});

/** A push as a phone sends it, with the raw answer on the wire for an Accept-Encoding. */
function pushOnTheWire(cookie: string, body: unknown, encoding: string): Promise<{ status?: number; encoding?: string; raw: Buffer }> {
  const payload = JSON.stringify(body);
  return new Promise((resolve, reject) => {
    const req = http.request(
      `${ts.baseUrl}/api/sync/push`,
      { method: 'POST', headers: { Cookie: cookie, Origin: ts.origin, 'Content-Type': 'application/json', 'Accept-Encoding': encoding } },
      (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (c) => chunks.push(c));
        res.on('end', () => resolve({ status: res.statusCode, encoding: res.headers['content-encoding'], raw: Buffer.concat(chunks) }));
      },
    );
    req.on('error', reject);
    req.end(payload);
  });
}

describe("the push's look-ups", () => {
  /** Every index a plan (EXPLAIN's JSON) reads through. */
  const indexesOf = (node: Record<string, unknown>): string[] => [
    ...(typeof node['Index Name'] === 'string' ? [node['Index Name']] : []),
    ...((node.Plans as Record<string, unknown>[] | undefined) ?? []).flatMap(indexesOf),
  ];

  it('read rows by their keys, never the whole team through its change index, even when the statistics do not know the workshop yet', async () => {
    const f = await fieldSetup();
    const [r0, r1, r2] = f.readings;
    await pushAccepted(f.tester, [change('testSession', f.session), change('pose', f.level), change('reading', r0)]);
    const next = poseRecord(f.session.id, 1);
    const [extra] = gaugePointRecords(f.vehicleId, ['E']);
    // Every look-up of a push: the named rows, the poses of its readings, the references it does
    // not carry, the slots its readings take, the labels its gauge points take, signed envelopes.
    const changes = [
      change('gaugePoint', extra),
      change('pose', next),
      change('reading', r1),
      change('reading', r2),
      change('reading', readingRecord(next.id, f.pointIds[0], 'lateral', 7)),
    ];
    // Every statement sent to PostgreSQL meanwhile, as pg sends it (some go past Sequelize).
    const sent: { sql: string; bind: unknown[] }[] = [];
    const query = pg.Client.prototype.query;
    pg.Client.prototype.query = function (this: pg.Client, config: unknown, values?: unknown, ...rest: unknown[]) {
      const c = config as string | { text: string; values?: unknown[] };
      const text = typeof c === 'string' ? c : c.text;
      const bind = typeof c === 'string' ? values : (c.values ?? values);
      if (Array.isArray(bind)) sent.push({ sql: text, bind });
      return (query as (...args: unknown[]) => unknown).call(this, config, values, ...rest);
    } as typeof query;
    try {
      await pushAccepted(f.tester, changes);
    } finally {
      pg.Client.prototype.query = query;
    }
    // A workshop new since the last ANALYZE: its team id is in no statistics, so the planner takes
    // it for one row and would read the team's change index whole, a cost that grows with the team.
    await ts.sequelize.query('ANALYZE readings, poses, gauge_points, envelopes, vehicles, test_sessions');
    const unknownTeam = randomUUID();
    const reads = sent.filter((s) => /^(SELECT|WITH)\b/.test(s.sql));
    const used = new Set<string>();
    await ts.sequelize.transaction(async (transaction) => {
      // The test database is small enough to be read whole; without that choice, the plans show
      // which index each statement leads PostgreSQL to, as on a workshop's full tables.
      await ts.sequelize.query('SET LOCAL enable_seqscan = off', { transaction });
      for (const { sql, bind } of reads) {
        const [row] = await ts.sequelize.query<{ 'QUERY PLAN': [{ Plan: Record<string, unknown> }] }>(`EXPLAIN (FORMAT JSON) ${sql}`, {
          bind: bind.map((v) => (v === f.team.teamId ? unknownTeam : v)),
          type: QueryTypes.SELECT,
          transaction,
        });
        for (const name of indexesOf(row['QUERY PLAN'][0].Plan)) used.add(name);
      }
    });
    expect([...used].filter((name) => name.endsWith('_team_change'))).toEqual([]);
    // The slots are read by pose, the labels by vehicle.
    expect([...used].some((name) => name === 'readings_pose' || name === 'readings_slot')).toBe(true);
    expect(used.has('gauge_points_label')).toBe(true);
  });
});

describe('the push answer on the wire', () => {
  it('is compressed at the fastest settings (gzip level 1, brotli quality 1), and decodes to the same answer', async () => {
    const f = await fieldSetup();
    const second = poseRecord(f.session.id, 1);
    const readings = [f.level, second].flatMap((pose) =>
      f.pointIds.flatMap((p, i) => (['foreAft', 'lateral', 'vertical'] as const).map((axis) => readingRecord(pose.id, p, axis, 10 + i))),
    );
    const body = {
      idempotencyKey: batchKey(),
      changes: [change('testSession', f.session), change('pose', f.level), change('pose', second), ...readings.map((r) => change('reading', r))],
    };
    const cookie = (f.tester as unknown as { jar: { getCookies(o: object): { toValueString(): string }[] } }).jar
      .getCookies({ domain: '127.0.0.1', path: '/', secure: false, script: false })
      .map((c) => c.toValueString())
      .join('; ');
    // The same batch again is answered from the stored answer, byte for byte the same JSON.
    const plain = await pushOnTheWire(cookie, body, 'identity');
    const br = await pushOnTheWire(cookie, body, 'br, gzip');
    const gzip = await pushOnTheWire(cookie, body, 'gzip');
    expect([plain.status, br.status, gzip.status]).toEqual([200, 200, 200]);
    expect(plain.encoding).toBeUndefined();
    expect(JSON.parse(plain.raw.toString('utf8')).accepted).toHaveLength(3 + readings.length);
    expect(plain.raw.length).toBeGreaterThan(1024);
    expect(br.encoding).toBe('br');
    expect(gzip.encoding).toBe('gzip');
    expect(zlib.brotliDecompressSync(br.raw)).toEqual(plain.raw);
    expect(zlib.gunzipSync(gzip.raw)).toEqual(plain.raw);
    expect(br.raw).toEqual(zlib.brotliCompressSync(plain.raw, { params: { [zlib.constants.BROTLI_PARAM_QUALITY]: 1 } }));
    expect(gzip.raw).toEqual(zlib.gzipSync(plain.raw, { level: 1 }));
  });
});

describe('pull', () => {
  it("returns the team's changes after a cursor, page by page, and nothing of other teams", async () => {
    const f = await fieldSetup();
    await createTeam('Noise workshop').then(async (t) => vehicleWithPoints(await signedInAgent(ts, t.members.tester.email)));
    const all = await f.tester.get('/api/sync/pull?since=0');
    expect(all.status).toBe(200);
    expect(all.body.vehicles.map((v: { id: string }) => v.id)).toEqual([f.vehicleId]);
    expect(all.body.gaugePoints).toHaveLength(4);
    const cursor = all.body.cursor;

    await f.tester.post('/api/sync/push').send({
      idempotencyKey: batchKey(),
      changes: [change('testSession', f.session), change('pose', f.level), ...f.readings.map((r) => change('reading', r))],
    });
    // Pages of 2 rows per table until the end; every new row arrives exactly once.
    const seen: string[] = [];
    let since = cursor;
    for (let guard = 0; guard < 10; guard++) {
      const page = await f.tester.get(`/api/sync/pull?since=${since}&limit=2`);
      seen.push(
        ...page.body.testSessions.map((r: { id: string }) => r.id),
        ...page.body.poses.map((r: { id: string }) => r.id),
        ...page.body.readings.map((r: { id: string }) => r.id),
      );
      expect(page.body.cursor).toBeGreaterThanOrEqual(since);
      since = page.body.cursor;
      if (!page.body.hasMore) break;
    }
    expect(seen.sort()).toEqual([f.session.id, f.level.id, ...f.readings.map((r) => r.id)].sort());
  });
});
