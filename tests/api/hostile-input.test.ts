// Hostile input against the sync and upload routes, on the real database: generated junk never
// gets a 500 and never writes part of anything; oversized bodies get 413; pixel bombs are refused;
// client file names never reach the file system; SQL-looking strings are stored as plain text.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import fs from 'node:fs';
import zlib from 'node:zlib';
import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { createTeam, signedInAgent, startTestServer, type Agent, type TestServer, type TestTeam } from '../support/test-app';
import { batchKey, change, poseRecord, readingRecord, sessionRecord, vehicleWithPoints } from '../support/sync';
import { storedPhotoNames } from '../support/photos';

let ts: TestServer;
let team: TestTeam;
let agent: Agent;
let base: { vehicleId: string; pointIds: string[] };

beforeAll(async () => {
  ts = await startTestServer();
  team = await createTeam('Hostile input workshop');
  agent = await signedInAgent(ts, team.members.tester.email);
  base = await vehicleWithPoints(agent);
});
afterAll(async () => ts.close());

/** Everything this team has written, table by table, plus the stored photo files. */
async function footprint() {
  const [row] = await ts.sequelize.query<Record<string, number>>(
    `SELECT ${['vehicles', 'gauge_points', 'test_sessions', 'poses', 'readings', 'photos', 'sync_batches', 'sync_conflicts']
      .map((t) => `(SELECT count(*)::int FROM ${t} WHERE team_id = $1) AS ${t}`)
      .join(', ')}`,
    { bind: [team.teamId], type: QueryTypes.SELECT },
  );
  const files = (await storedPhotoNames()).length;
  return { ...row, files };
}

/** A valid batch: one session, one pose, a few readings on the team's vehicle. */
function validBatch() {
  const s = sessionRecord(base.vehicleId);
  const p = poseRecord(s.id, 0);
  return {
    idempotencyKey: batchKey(),
    changes: [change('testSession', s), change('pose', p), ...base.pointIds.slice(0, 2).map((g) => change('reading', readingRecord(p.id, g, 'lateral', 12.5)))],
  };
}

/** Junk: arbitrary JSON, or a valid batch with one value anywhere in it replaced by junk. */
const junkValue = fc.oneof(
  fc.constant(null),
  fc.boolean(),
  fc.double(),
  fc.constantFrom(Number.MAX_VALUE, -1e308, 0, -1, 1e6),
  fc.string({ maxLength: 40 }),
  fc.constantFrom("'; DROP TABLE readings; --", '\u0000', '../../etc/passwd', '<script>alert(1)</script>', '{"$gt": ""}'),
  fc.array(fc.anything({ maxDepth: 1 }), { maxLength: 3 }),
  fc.object({ maxDepth: 1 }),
);

function mutate(batch: ReturnType<typeof validBatch>, pathPick: number, value: unknown) {
  const b = structuredClone(batch) as unknown as Record<string, unknown>;
  const paths: (string | number)[][] = [];
  const walk = (node: unknown, p: (string | number)[]) => {
    if (node && typeof node === 'object') {
      paths.push(p);
      for (const [k, v] of Object.entries(node)) walk(v, [...p, Array.isArray(node) ? Number(k) : k]);
    } else paths.push(p);
  };
  walk(b, []);
  const target = paths[pathPick % paths.length];
  if (target.length === 0) return value;
  let node = b as Record<string | number, unknown>;
  for (const k of target.slice(0, -1)) node = node[k] as Record<string | number, unknown>;
  node[target[target.length - 1]] = value;
  return b;
}

describe('sync push under generated junk', () => {
  it('never answers 500 and never writes part of a refused batch', async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.oneof(
          fc.anything({ maxDepth: 3 }),
          fc.json().map((j) => ({ raw: j })),
          fc.tuple(fc.nat(), junkValue).map(([pick, v]) => mutate(validBatch(), pick, v)),
        ),
        async (body) => {
          const before = await footprint();
          const raw = body && typeof body === 'object' && 'raw' in (body as object) ? String((body as { raw: string }).raw) : (JSON.stringify(body) ?? '');
          const res = await agent.post('/api/sync/push').set('Content-Type', 'application/json').send(raw);
          expect(res.status).toBeLessThan(500);
          if (res.status !== 200) {
            expect(res.body.error?.message).toEqual(expect.any(String));
            expect(await footprint()).toEqual(before);
          }
        },
      ),
      { numRuns: 150, seed: 20261202 },
    );
  });

  it('refuses a whole batch when one record in the middle is bad, naming it', async () => {
    const batch = validBatch();
    (batch.changes[2].record as Record<string, unknown>).valueMm = 'twelve';
    const before = await footprint();
    const res = await agent.post('/api/sync/push').send(batch);
    expect(res.status).toBe(400);
    expect(res.body.error.fields[0].field).toBe('body.changes.2.record.valueMm');
    expect(await footprint()).toEqual(before);
  });

  it('answers an oversized body with 413 and writes nothing', async () => {
    const before = await footprint();
    const res = await agent
      .post('/api/sync/push')
      .set('Content-Type', 'application/json')
      .send(`{"idempotencyKey":"${'x'.repeat(5 * 1024 * 1024)}"}`);
    expect(res.status).toBe(413);
    expect(await footprint()).toEqual(before);
  });

  it('stores SQL-looking strings as plain text', async () => {
    const s = sessionRecord(base.vehicleId, { title: "Robert'); DROP TABLE readings; --", notes: "1' OR '1'='1" });
    const res = await agent.post('/api/sync/push').send({ idempotencyKey: batchKey(), changes: [change('testSession', s)] });
    expect(res.status).toBe(200);
    const [row] = await ts.sequelize.query<{ title: string; notes: string }>('SELECT title, notes FROM test_sessions WHERE id = $1', {
      bind: [s.id],
      type: QueryTypes.SELECT,
    });
    expect(row).toEqual({ title: "Robert'); DROP TABLE readings; --", notes: "1' OR '1'='1" });
    const [table] = await ts.sequelize.query<{ t: string | null }>("SELECT to_regclass('readings')::text AS t", { type: QueryTypes.SELECT });
    expect(table.t).toBe('readings');
  });
});

// CRC-32 of PNG chunks (ISO 3309 / ITU-T V.42 polynomial, as the PNG specification requires).
function crc32(buf: Buffer) {
  let c = ~0;
  for (const byte of buf) {
    c ^= byte;
    for (let k = 0; k < 8; k++) c = (c >>> 1) ^ (0xedb88320 & -(c & 1));
  }
  return ~c >>> 0;
}
function pngChunk(type: string, data: Buffer) {
  const len = Buffer.alloc(4);
  len.writeUInt32BE(data.length);
  const body = Buffer.concat([Buffer.from(type, 'ascii'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(body));
  return Buffer.concat([len, body, crc]);
}
/** A PNG of a few hundred bytes whose header claims width × height pixels. */
function claimedPng(width: number, height: number) {
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr.set([8, 0, 0, 0, 0], 8); // 8-bit greyscale
  const idat = zlib.deflateSync(Buffer.alloc(1 + width)); // one row of zeros; the rest is "missing"
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    pngChunk('IHDR', ihdr),
    pngChunk('IDAT', idat),
    pngChunk('IEND', Buffer.alloc(0)),
  ]);
}

describe('photo upload under hostile input', () => {
  async function sessionId() {
    const s = sessionRecord(base.vehicleId);
    const res = await agent.post('/api/sync/push').send({ idempotencyKey: batchKey(), changes: [change('testSession', s)] });
    expect(res.status).toBe(200);
    return s.id;
  }

  it('never answers 500 and never stores anything for generated junk files', async () => {
    const sid = await sessionId();
    await fc.assert(
      fc.asyncProperty(
        fc.uint8Array({ minLength: 0, maxLength: 2048 }),
        fc.constantFrom('photo.jpg', '../../../../tmp/evil.jpg', 'a\u0000b.png', 'C:\\boot.ini', '.htaccess', ''),
        fc.constantFrom('image/jpeg', 'image/png', 'text/html', 'application/octet-stream'),
        async (bytes, filename, contentType) => {
          const before = await footprint();
          const res = await agent
            .post('/api/photos')
            .field('id', randomUUID())
            .field('sessionId', sid)
            .attach('photo', Buffer.from(bytes), { filename: filename || 'x', contentType });
          expect(res.status).toBeLessThan(500);
          if (res.status >= 400) expect(await footprint()).toEqual(before);
        },
      ),
      { numRuns: 40, seed: 7 },
    );
    expect(fs.existsSync('/tmp/evil.jpg')).toBe(false);
  });

  it('refuses a tiny PNG that claims 3.6 gigapixels, before decoding it', async () => {
    const sid = await sessionId();
    const bomb = claimedPng(60_000, 60_000);
    expect(bomb.length).toBeLessThan(1_000);
    const before = await footprint();
    const res = await agent
      .post('/api/photos')
      .field('id', randomUUID())
      .field('sessionId', sid)
      .attach('photo', bomb, { filename: 'bomb.png', contentType: 'image/png' });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/megapixels/);
    expect(await footprint()).toEqual(before);
  });

  it('keeps the client file name out of the file system', async () => {
    const sid = await sessionId();
    const sharp = (await import('sharp')).default;
    const jpeg = await sharp({ create: { width: 64, height: 48, channels: 3, background: '#806040' } })
      .jpeg()
      .toBuffer();
    const id = randomUUID();
    const res = await agent
      .post('/api/photos')
      .field('id', id)
      .field('sessionId', sid)
      .attach('photo', jpeg, { filename: '../../../owned.jpg', contentType: 'image/jpeg' });
    expect(res.status).toBe(201);
    const [row] = await ts.sequelize.query<{ stored_name: string; thumb_name: string }>('SELECT stored_name, thumb_name FROM photos WHERE id = $1', {
      bind: [id],
      type: QueryTypes.SELECT,
    });
    for (const name of [row.stored_name, row.thumb_name]) {
      expect(name).not.toMatch(/owned|\.\./);
    }
    const all = await storedPhotoNames();
    expect(all.some((f) => f.includes('owned'))).toBe(false);
  });
});
