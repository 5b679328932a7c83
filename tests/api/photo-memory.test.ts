// Photo uploads cannot exhaust the server's memory: the real server runs as a child process (its
// peak resident memory, VmHWM, read from /proc), and four people upload a 48-megapixel progressive
// JPEG each at the same moment. Decodes are queued (one at a time per process, sharp's own thread
// pool capped), one person has at most two uploads in flight (counted in PostgreSQL), and a
// workshop's photo storage has a ceiling.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import { randomUUID } from 'node:crypto';
import sharp from 'sharp';
import { startServerProcess, type ServerProcess } from '../faults/fault-rig';
import { createTeam, startTestServer, type TestServer, type TestTeam } from '../support/test-app';
import { startSession } from '../../server/auth/lucia';
import { insertRow } from '../support/db-snapshot';
import { photoLimits } from '../../server/services/photos.service';

let ts: TestServer;
let server: ServerProcess;
let team: TestTeam;
let sessionId: string;
let bigJpeg: Buffer;
const cookies: Record<string, string> = {};

const MB = 1024 * 1024;
/** Resident memory of a process, now and at its peak (kB in /proc/<pid>/status). */
function memoryOf(pid: number) {
  const status = fs.readFileSync(`/proc/${pid}/status`, 'utf8');
  const kb = (name: string) => Number(new RegExp(`^${name}:\\s+(\\d+) kB`, 'm').exec(status)![1]) * 1024;
  return { rss: kb('VmRSS'), peak: kb('VmHWM') };
}

/** A 8064 × 6048 (48.8 MP) progressive JPEG of a smooth scene with texture: about 5 MB, like a phone's. */
async function makeBigJpeg(): Promise<Buffer> {
  const w = 252;
  const h = 189;
  const small = Buffer.alloc(w * h * 3);
  for (let i = 0; i < small.length; i++) small[i] = (Math.sin(i * 0.37) * 60 + 128 + ((i * 7919) % 50)) | 0;
  return sharp(small, { raw: { width: w, height: h, channels: 3 } })
    .resize(w * 32, h * 32, { kernel: 'cubic' })
    .jpeg({ quality: 88, progressive: true })
    .toBuffer();
}

async function upload(who: string, file: Buffer, id = randomUUID()) {
  const form = new FormData();
  form.set('id', id);
  form.set('sessionId', sessionId);
  form.set('caption', 'Boot corner at full twist');
  form.set('photo', new Blob([new Uint8Array(file)], { type: 'image/jpeg' }), 'IMG_0001.JPG');
  const res = await fetch(`${server.baseUrl}/api/photos`, { method: 'POST', body: form, headers: { Origin: server.baseUrl, Cookie: cookies[who] } });
  return { status: res.status, body: (await res.json()) as { error?: { message: string } } };
}

beforeAll(async () => {
  ts = await startTestServer();
  team = await createTeam('Photo memory workshop');
  const vehicleId = randomUUID();
  sessionId = randomUUID();
  await insertRow(ts.sequelize, 'vehicles', {
    id: vehicleId,
    team_id: team.teamId,
    name: 'Photo truck',
    wheelbase_mm: 3800,
    track_front_mm: 1900,
    track_rear_mm: 1880,
    opening: { widthMm: 700, heightMm: 500, cornerRadiusMm: 80, centreYMm: 0, bottomZMm: 350 },
  });
  await insertRow(ts.sequelize, 'test_sessions', {
    id: sessionId,
    team_id: team.teamId,
    vehicle_id: vehicleId,
    tested_on: '2026-05-01',
    created_by: team.members.tester.userId,
  });
  for (const role of ['admin', 'engineer', 'tester'] as const) cookies[role] = (await startSession(team.members[role].userId, team.teamId)).split(';')[0];
  // A fourth person who records: a second tester.
  const other = await createTeam('Second tester source');
  await ts.sequelize.query(`UPDATE memberships SET team_id = :t WHERE user_id = :u`, { replacements: { t: team.teamId, u: other.members.tester.userId } });
  cookies.tester2 = (await startSession(other.members.tester.userId, team.teamId)).split(';')[0];
  bigJpeg = await makeBigJpeg();
  // As npm start runs it: glibc keeps fewer malloc arenas, so memory freed after a decode is reused (sharp's advice).
  server = await startServerProcess(process.env.DATABASE_URL!, { PHOTO_DIR: `${process.env.PHOTO_DIR ?? '.data/photos'}-memory`, MALLOC_ARENA_MAX: '2' });
}, 120_000);
afterAll(async () => {
  await server?.stop();
  await ts?.close();
});

describe('photo uploads and memory', () => {
  it('four people uploading a 48 MP progressive JPEG at once keep the server under its memory bound', async () => {
    // Warm up: sharp and the upload path loaded, one small photo stored.
    const small = await sharp({ create: { width: 800, height: 600, channels: 3, background: '#7a8' } })
      .jpeg()
      .toBuffer();
    expect((await upload('tester', small)).status).toBe(201);
    const before = memoryOf(server.child.pid!);
    const results = await Promise.all(['admin', 'engineer', 'tester', 'tester2'].map((who) => upload(who, bigJpeg)));
    const after = memoryOf(server.child.pid!);
    console.log(
      `photo memory: RSS ${Math.round(before.rss / MB)} MB before, peak ${Math.round(after.peak / MB)} MB during 4 concurrent ${bigJpeg.length} B uploads`,
    );
    expect(results.map((r) => r.status)).toEqual([201, 201, 201, 201]);
    expect(after.peak - before.rss).toBeLessThan(photoLimits.memoryBudgetMb * MB);
  }, 180_000);

  it('lets one person have at most two uploads in flight; the third is told to wait', async () => {
    const results = await Promise.all([0, 1, 2].map(() => upload('engineer', bigJpeg)));
    const statuses = results.map((r) => r.status).sort();
    expect(statuses).toEqual([201, 201, 429]);
    expect(results.find((r) => r.status === 429)!.body.error!.message).toMatch(/uploads.*at a time/);
    // Once they are in, the next one goes.
    expect((await upload('engineer', bigJpeg)).status).toBe(201);
  }, 180_000);

  it("refuses a photo past the workshop's storage, keeping it on the phone (507, not a permanent refusal)", async () => {
    const [{ used }] = await ts.sequelize.query<{ used: number }>(`SELECT coalesce(sum(bytes), 0)::float8 AS used FROM photos WHERE team_id = :t`, {
      replacements: { t: team.teamId },
      type: (await import('sequelize')).QueryTypes.SELECT,
    });
    // Fill the workshop up to its ceiling with records of large stored photos (at most 1 GB a row).
    for (let left = photoLimits.storagePerWorkshopMb * MB - used; left > 0; left -= 1024 * MB) {
      await insertRow(ts.sequelize, 'photos', {
        id: randomUUID(),
        team_id: team.teamId,
        session_id: sessionId,
        stored_name: `${randomUUID()}.jpg`,
        thumb_name: `${randomUUID()}.thumb.jpg`,
        mime: 'image/jpeg',
        width: 10,
        height: 10,
        bytes: Math.min(left, 1024 * MB),
        created_by: team.members.tester.userId,
      });
    }
    const small = await sharp({ create: { width: 640, height: 480, channels: 3, background: '#345' } })
      .jpeg()
      .toBuffer();
    const res = await upload('tester', small);
    expect(res.status).toBe(507);
    expect(res.body.error!.message).toMatch(/storage/);
  });
});
