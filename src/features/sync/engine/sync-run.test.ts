// The outbox and the sync run on fake-indexeddb with a scripted server: batches are sent once and
// retried unchanged, a write that fails half-way leaves nothing, conflicts and refusals are kept.
import 'fake-indexeddb/auto';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { ApiError } from '@/lib/api-client';
import { FieldDb } from '@/lib/db/field-db';
import { saveRecord, saveRecords, setReadingValue } from '@/lib/db/records';
import { getMeta } from '@/lib/db/meta';
import { addPhoto } from '@/lib/db/photos';
import type { PullResponse, PushRequest, PushResponse } from '@shared/schemas/sync';
import { runSync } from './sync-run';
import type { SyncTransport } from '../api/transport';
import { newReading, newTestSession } from '@shared/records';

let db: FieldDb;
beforeEach(async () => {
  db = new FieldDb(`test-${crypto.randomUUID()}`);
  await db.open();
});
afterEach(async () => {
  db.close();
  await db.delete();
});

const uuid = () => crypto.randomUUID();
const session = (over: Record<string, unknown> = {}) => ({
  ...newTestSession({ vehicleId: uuid(), title: 'Yard flex test', testedOn: '2026-03-14', safetyAckAt: '2026-03-14T09:00:00.000Z' }),
  ...over,
});
const reading = (poseId: string, valueMm: number) => newReading({ poseId, gaugePointId: uuid(), axis: 'lateral', valueMm });

const emptyPull = (cursor: number): PullResponse => ({
  cursor,
  hasMore: false,
  vehicles: [],
  gaugePoints: [],
  testSessions: [],
  poses: [],
  readings: [],
  retestRequests: [],
  photos: [],
  conflicts: [],
});

/** A scripted server: records what it receives; each push answer can be replaced per call. */
function fakeServer(answer: (req: PushRequest, call: number) => PushResponse | Promise<PushResponse>) {
  const pushes: PushRequest[] = [];
  const uploads: FormData[] = [];
  const transport: SyncTransport = {
    async push(req) {
      pushes.push(structuredClone(req));
      return answer(req, pushes.length);
    },
    pull: async () => emptyPull(7),
    async uploadPhoto(form, onProgress) {
      uploads.push(form);
      onProgress(10, 10);
    },
  };
  return { transport, pushes, uploads };
}

const acceptAll = (req: PushRequest): PushResponse => ({
  accepted: req.changes.map((c) => ({ entity: c.entity, id: c.record.id, version: c.record.version === 1 ? 1 : c.record.version + 1 })),
  conflicts: [],
});

describe('local writes', () => {
  it('writes a record and one outbox entry together; a second edit does not queue it twice', async () => {
    const s = session();
    expect(await saveRecord('testSession', s, db)).toEqual({ id: s.id, ok: true });
    expect(await saveRecord('testSession', { ...s, title: 'Edited' }, db)).toEqual({ id: s.id, ok: true });
    expect((await db.sessions.get(s.id))?.title).toBe('Edited');
    expect(await db.outbox.count()).toBe(1);
  });

  it('keeps one reading per slot when keystrokes arrive faster than the writes', async () => {
    const slot = { poseId: uuid(), gaugePointId: uuid(), axis: 'lateral' as const };
    const results = await Promise.all(['1', '12', '123', '12'].map((typed) => setReadingValue(slot, Number(typed), db)));
    expect(results.every((r) => r.ok)).toBe(true);
    const stored = await db.readings.toArray();
    expect(stored).toHaveLength(1);
    expect(stored[0].valueMm).toBe(12);
    expect(await db.outbox.count()).toBe(1);
  });

  it('refuses a bad value per item, naming the field, and stores the good ones', async () => {
    const poseId = uuid();
    const good = reading(poseId, 12);
    const bad = { ...reading(poseId, 1), valueMm: Number.NaN };
    const results = await saveRecords('reading', [good, bad], db);
    expect(results).toEqual([
      { id: bad.id, ok: false, message: expect.stringMatching(/^valueMm:/), fields: [expect.objectContaining({ field: 'valueMm' })] },
      { id: good.id, ok: true },
    ]);
    expect(await db.readings.count()).toBe(1);
    expect(await db.outbox.count()).toBe(1);
  });

  it('keeps neither the record nor its outbox entry when the write fails between the two', async () => {
    const s = session();
    await saveRecord('testSession', s, db);
    await db.outbox.clear();
    // The outbox write fails after the record was put in the same transaction (e.g. disk full).
    db.outbox.hook('creating', () => {
      throw new Error('disk full');
    });
    const result = await saveRecord('testSession', { ...s, title: 'Lost edit' }, db);
    expect(result.ok).toBe(false);
    expect(result.ok === false && result.message).toMatch(/disk full/);
    expect((await db.sessions.get(s.id))?.title).toBe('Yard flex test');
    expect(await db.outbox.count()).toBe(0);
  });
});

describe('sync run', () => {
  it('pushes the outbox, takes the server versions, and empties it', async () => {
    const s = session();
    await saveRecord('testSession', s, db);
    const server = fakeServer(acceptAll);
    expect(await runSync(db, server.transport)).toEqual({ ok: true });
    expect(server.pushes).toHaveLength(1);
    expect(server.pushes[0].changes).toEqual([{ entity: 'testSession', record: s }]);
    expect(await db.outbox.count()).toBe(0);
    expect(await db.batches.count()).toBe(0);
    expect(await getMeta('pullCursor', db)).toBe(7);
    expect(await getMeta('lastSyncAt', db)).not.toBeNull();
  });

  it('after a lost answer, retries the very same batch (same key and contents), even if the record changed since', async () => {
    const s = session();
    await saveRecord('testSession', s, db);
    const server = fakeServer((req, call) => {
      if (call === 1) throw new ApiError(0, 'network', 'no connection to the server');
      return acceptAll(req);
    });
    const first = await runSync(db, server.transport);
    expect(first.ok).toBe(false);
    expect(await db.batches.count()).toBe(1);
    // Edited while the batch's answer was lost: the edit waits for a batch of its own.
    await saveRecord('testSession', { ...s, title: 'After the lost answer' }, db);
    expect((await runSync(db, server.transport)).ok).toBe(true);
    expect(server.pushes[1]).toEqual(server.pushes[0]);
    expect(server.pushes[2].changes[0].record).toMatchObject({ id: s.id, title: 'After the lost answer' });
    expect(server.pushes[2].idempotencyKey).not.toBe(server.pushes[0].idempotencyKey);
    expect(await db.outbox.count()).toBe(0);
  });

  it('keeps a conflict for a person and shows the server version meanwhile', async () => {
    const s = session();
    await saveRecord('testSession', { ...s, version: 2, title: 'Mine' }, db);
    const server = fakeServer((req) => ({
      accepted: [],
      conflicts: [
        {
          id: uuid(),
          entity: 'testSession',
          entityId: s.id,
          baseVersion: 2,
          serverVersion: 3,
          clientRecord: req.changes[0].record,
          serverRecord: { ...s, version: 3, title: 'Theirs' },
          createdAt: new Date().toISOString(),
          resolvedAt: null,
          resolution: null,
        },
      ],
    }));
    expect((await runSync(db, server.transport)).ok).toBe(true);
    expect(await db.sessions.get(s.id)).toMatchObject({ title: 'Theirs', version: 3 });
    const kept = await db.conflicts.toArray();
    expect(kept.map((c) => c.clientRecord.title)).toEqual(['Mine']);
    expect(await db.outbox.count()).toBe(0);
  });

  it('on a refused batch, holds the named record back with the field errors, and says so in words', async () => {
    const s = session();
    await saveRecord('testSession', s, db);
    const server = fakeServer(() => {
      throw new ApiError(400, 'invalid', 'batch rejected', [{ field: 'body.changes.0.record.vehicleId', message: 'refers to vehicle … not on the server' }]);
    });
    const result = await runSync(db, server.transport);
    expect(result.ok).toBe(false);
    expect(await db.batches.count()).toBe(0);
    const [entry] = await db.outbox.where('batchKey').equals('').toArray();
    expect(entry.held?.fields[0].field).toBe('body.changes.0.record.vehicleId');
    expect(await getMeta('lastError', db)).toMatchObject({
      message: 'the server refused a record: held back on this phone until changed (see Sync)',
      fields: [],
    });
  });

  it('pull keeps a local edit still waiting and takes the rest from the server', async () => {
    const mine = session({ title: 'Local edit' });
    await saveRecord('testSession', mine, db);
    const other = session({ title: 'From the desk' });
    const transport: SyncTransport = {
      push: async () => {
        throw new ApiError(0, 'network', 'offline');
      },
      pull: async () => ({
        ...emptyPull(40),
        testSessions: [
          { ...mine, title: 'Server copy', changeSeq: 39 },
          { ...other, changeSeq: 40 },
        ],
      }),
      uploadPhoto: async () => {},
    };
    const { pullAll } = await import('./sync-run');
    await pullAll(db, transport);
    expect((await db.sessions.get(mine.id))?.title).toBe('Local edit');
    expect((await db.sessions.get(other.id))?.title).toBe('From the desk');
    expect(await getMeta('pullCursor', db)).toBe(40);
  });

  it('uploads a waiting photo, then drops its blob; a photo the server refuses stays with the reason', async () => {
    const s = session();
    const ok = uuid();
    const refused = uuid();
    await addPhoto({ id: ok, sessionId: s.id, poseId: null, caption: '', file: new Blob([new Uint8Array([0xff, 0xd8, 0xff])], { type: 'image/jpeg' }) }, db);
    await addPhoto({ id: refused, sessionId: s.id, poseId: null, caption: '', file: new Blob([new Uint8Array([1, 2, 3])], { type: 'image/png' }) }, db);
    const transport: SyncTransport = {
      push: async (req) => acceptAll(req),
      pull: async () => emptyPull(1),
      async uploadPhoto(form) {
        if (form.get('id') === refused)
          throw new ApiError(400, 'invalid', 'photo: not a JPEG, PNG or WebP image', [{ field: 'photo', message: 'unsupported' }]);
      },
    };
    expect((await runSync(db, transport)).ok).toBe(true);
    expect(await db.photos.get(ok)).toMatchObject({ status: 'uploaded', blob: null });
    expect(await db.photos.get(refused)).toMatchObject({ status: 'failed', error: expect.stringMatching(/not a JPEG/) });
  });
});
