// The sync pull as a phone receives it: built by PostgreSQL, yet the same records field for field
// as the row mappers give (to-record.ts toRecord, photoOut for photos, the push's conflicts);
// and with a cheap validator, so a phone asking again with nothing changed gets 304 with no body,
// while any change a pull could carry (another phone's push, a desk edit, a photo, the person's own
// kept conflict) or another page, or another person, gets the whole answer.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import sharp from 'sharp';
import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { createTeam, signedInAgent, startTestServer, type Agent, type TestServer } from '../support/test-app';
import { batchKey, change, poseRecord, readingRecord, sessionRecord, vehicleWithPoints } from '../support/sync';
import { PhotoModel } from '../../server/models';
import { photoOut } from '../../server/services/photos.service';
import { syncTables } from '../../server/services/sync-tables';
import { toRecord } from '../../server/services/to-record';
import { pullResponse } from '../../shared/schemas/sync';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

const pull = (agent: Agent, query: string, etag?: string) => {
  const req = agent.get(`/api/sync/pull?${query}`);
  return etag ? req.set('If-None-Match', etag) : req;
};

/** A team whose tester pushed a session with a ramp pose and readings, a photo and a kept conflict. */
async function recordedSession() {
  const team = await createTeam();
  const tester = await signedInAgent(ts, team.members.tester.email);
  const engineer = await signedInAgent(ts, team.members.engineer.email);
  const { vehicleId, pointIds } = await vehicleWithPoints(tester);
  const session = sessionRecord(vehicleId);
  const level = poseRecord(session.id, 0);
  const ramp = poseRecord(session.id, 1, {
    kind: 'ramp',
    rampAngleDeg: 20,
    rampDistanceMm: 1250.5,
    rampWheel: 'fl',
    liftFlMm: 1250.5 * Math.sin(Math.PI / 9),
    notes: 'front left on the ramp',
  });
  const readings = pointIds.flatMap((p, i) => [readingRecord(level.id, p, 'lateral', 90 + i), readingRecord(ramp.id, p, 'lateral', 90.25 + i * 1.1)]);
  const pushed = await tester.post('/api/sync/push').send({
    idempotencyKey: batchKey(),
    changes: [change('testSession', session), change('pose', level), change('pose', ramp), ...readings.map((r) => change('reading', r))],
  });
  expect(pushed.status).toBe(200);
  const jpeg = await sharp({ create: { width: 64, height: 48, channels: 3, background: '#6b5a3c' } })
    .jpeg()
    .toBuffer();
  const photoId = randomUUID();
  const uploaded = await tester.post('/api/photos').field('id', photoId).field('sessionId', session.id).field('poseId', ramp.id).attach('photo', jpeg, 'a.jpg');
  expect(uploaded.status).toBe(201);
  // The engineer's edit first, then the tester's stale one: a conflict kept for the tester.
  await engineer.post('/api/sync/push').send({ idempotencyKey: batchKey(), changes: [change('reading', { ...readings[0], valueMm: 95 })] });
  const stale = await tester.post('/api/sync/push').send({ idempotencyKey: batchKey(), changes: [change('reading', { ...readings[0], valueMm: 97 })] });
  expect(stale.body.conflicts).toHaveLength(1);
  return { team, tester, engineer, session, readings, photoId, conflict: stale.body.conflicts[0] };
}

async function rows(table: string, teamId: string) {
  return ts.sequelize.query<Record<string, unknown>>(`SELECT * FROM ${table} WHERE team_id = $1 ORDER BY change_seq`, {
    bind: [teamId],
    type: QueryTypes.SELECT,
  });
}

describe('the pull answer', () => {
  it('carries the same records, field for field, as the row mappers', async () => {
    const f = await recordedSession();
    const res = await pull(f.tester, 'since=0');
    expect(res.status).toBe(200);
    expect(() => pullResponse.parse(res.body)).not.toThrow();
    const mapped = async (entity: keyof typeof syncTables) => (await rows(syncTables[entity].table, f.team.teamId)).map((r) => toRecord(entity, r));
    expect(res.body.vehicles).toEqual(await mapped('vehicle'));
    expect(res.body.gaugePoints).toEqual(await mapped('gaugePoint'));
    expect(res.body.testSessions).toEqual(await mapped('testSession'));
    expect(res.body.poses).toEqual(await mapped('pose'));
    expect(res.body.poses[1]).toMatchObject({ rampWheel: 'fl', rampDistanceMm: 1250.5, notes: 'front left on the ramp' });
    expect(res.body.readings).toEqual(await mapped('reading'));
    expect(res.body.readings).toHaveLength(f.readings.length);
    expect(res.body.photos).toEqual([photoOut((await PhotoModel.findByPk(f.photoId))!)]);
    expect(res.body.conflicts).toEqual([f.conflict]);
    const tables = ['vehicles', 'gauge_points', 'test_sessions', 'poses', 'readings', 'photos', 'sync_conflicts'];
    const [{ top }] = await ts.sequelize.query<{ top: number }>(
      `SELECT greatest(${tables.map((t) => `(SELECT max(change_seq) FROM ${t} WHERE team_id = $1)`).join(', ')}) AS top`,
      {
        bind: [f.team.teamId],
        type: QueryTypes.SELECT,
      },
    );
    expect(res.body).toMatchObject({ cursor: Number(top), hasMore: false });
    // The conflict is the tester's alone.
    expect((await pull(f.engineer, 'since=0')).body.conflicts).toEqual([]);
  });

  it('pages every table without skipping a row, page for page as before', async () => {
    const f = await recordedSession();
    const seen = new Map<string, string[]>();
    let since = 0;
    let pages = 0;
    for (;;) {
      const page = await pull(f.tester, `since=${since}&limit=3`);
      pages += 1;
      for (const key of ['vehicles', 'gaugePoints', 'testSessions', 'poses', 'readings', 'photos'] as const) {
        for (const r of page.body[key] as { id: string; changeSeq: number }[]) {
          expect(r.changeSeq).toBeGreaterThan(since);
          expect(r.changeSeq).toBeLessThanOrEqual(page.body.cursor);
          seen.set(key, [...(seen.get(key) ?? []), r.id]);
        }
      }
      since = page.body.cursor;
      if (!page.body.hasMore) break;
      expect(pages).toBeLessThan(20);
    }
    expect(pages).toBeGreaterThan(2);
    expect(seen.get('readings')?.sort()).toEqual(f.readings.map((r) => r.id).sort());
    expect(seen.get('gaugePoints')).toHaveLength(4);
    expect(seen.get('photos')).toEqual([f.photoId]);
    const last = await pull(f.tester, `since=${since}`);
    expect(last.body).toMatchObject({ cursor: since, hasMore: false, vehicles: [], readings: [], photos: [] });
  });

  it('answers 304 with no body while nothing changed, and the whole answer after any change', async () => {
    const f = await recordedSession();
    const first = await pull(f.tester, 'since=0');
    const etag = first.headers.etag;
    expect(etag).toMatch(/^W\/"pull\./);
    const again = await pull(f.tester, 'since=0', etag);
    expect(again.status).toBe(304);
    expect(again.text).toBe('');

    // Another page, or another person (even asking the same page), is another answer.
    expect((await pull(f.tester, 'since=1', etag)).status).toBe(200);
    expect((await pull(f.tester, 'since=0&limit=50', etag)).status).toBe(200);
    expect((await pull(f.engineer, 'since=0', etag)).status).toBe(200);

    // A desk edit of a reading: the tester's copy is stale.
    const edited = await f.engineer.patch(`/api/readings/${f.readings[1].id}/review`).send({ version: 1, excluded: true, excludeReason: 'tape slipped' });
    expect(edited.status).toBe(200);
    const afterEdit = await pull(f.tester, 'since=0', etag);
    expect(afterEdit.status).toBe(200);
    expect(afterEdit.body.readings.find((r: { id: string }) => r.id === f.readings[1].id)).toMatchObject({ excluded: true, version: 2 });
    const etag2 = afterEdit.headers.etag;
    expect(etag2).not.toBe(etag);
    expect((await pull(f.tester, 'since=0', etag2)).status).toBe(304);

    // The tester decides the kept conflict: the conflict row changes, and so does the answer.
    expect((await f.tester.post(`/api/sync/conflicts/${f.conflict.id}/resolve`).send({ keep: 'server' })).status).toBe(200);
    const afterResolve = await pull(f.tester, 'since=0', etag2);
    expect(afterResolve.status).toBe(200);
    expect(afterResolve.body.conflicts[0]).toMatchObject({ id: f.conflict.id, resolution: 'server' });

    // A photo from another phone of the workshop.
    const etag3 = afterResolve.headers.etag;
    const other = await signedInAgent(ts, f.team.members.admin.email);
    const jpeg = await sharp({ create: { width: 32, height: 32, channels: 3, background: '#333333' } })
      .jpeg()
      .toBuffer();
    expect((await other.post('/api/photos').field('id', randomUUID()).field('sessionId', f.session.id).attach('photo', jpeg, 'b.jpg')).status).toBe(201);
    expect((await pull(f.tester, 'since=0', etag3)).status).toBe(200);
  });

  it('is refused to a viewer and shows nothing of another workshop', async () => {
    const f = await recordedSession();
    const viewer = await signedInAgent(ts, f.team.members.viewer.email);
    expect((await pull(viewer, 'since=0')).status).toBe(403);
    const other = await createTeam('Other workshop');
    const outsider = await signedInAgent(ts, other.members.tester.email);
    const theirs = await pull(outsider, 'since=0');
    expect(theirs.status).toBe(200);
    expect([theirs.body.vehicles, theirs.body.readings, theirs.body.photos, theirs.body.conflicts]).toEqual([[], [], [], []]);
  });
});
