// A batch the server fails on (500) never stops a phone: photos still upload, the pull still
// runs, the batch backs off, is narrowed down to the record at fault, and that record is held
// back with the server's message and can be saved as a file (JSON and CSV).
import 'fake-indexeddb/auto';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import Papa from 'papaparse';
import { ApiError } from '@/lib/api-client';
import { FieldDb } from '@/lib/db/field-db';
import { saveRecord, saveRecords } from '@/lib/db/records';
import { getMeta } from '@/lib/db/meta';
import { addPhoto } from '@/lib/db/photos';
import { fieldLookups, unsentRecords } from '@/lib/db/unsent';
import { runSync } from './engine/sync-run';
import type { SyncTransport } from './api/transport';
import type { PullResponse, PushRequest, PushResponse } from '@shared/schemas/sync';
import { unsentAsCsv, unsentAsJson } from './unsent-export';
import { newPose, newReading, newTestSession } from '@shared/records';

let db: FieldDb;
beforeEach(async () => {
  vi.useFakeTimers({ toFake: ['Date'], now: new Date('2026-03-14T10:00:00Z') });
  db = new FieldDb(`unsent-${crypto.randomUUID()}`);
  await db.open();
});
afterEach(async () => {
  vi.useRealTimers();
  db.close();
  await db.delete();
});

const uuid = () => crypto.randomUUID();
const vehicleId = uuid();
const gaugePointId = uuid();
const session = newTestSession({ vehicleId, title: 'Yard flex test', testedOn: '2026-03-14' });
const pose = newPose({ sessionId: session.id, seq: 1, label: 'Front left up', liftFlMm: 300, recordedAt: '2026-03-14T09:00:00.000Z' });
const reading = (valueMm: number, axis: 'foreAft' | 'lateral' | 'vertical' = 'lateral') => newReading({ poseId: pose.id, gaugePointId, axis, valueMm });
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
const accept = (req: PushRequest): PushResponse => ({ accepted: req.changes.map((c) => ({ entity: c.entity, id: c.record.id, version: 1 })), conflicts: [] });
const serverFailure = () => new ApiError(500, 'internal', 'something went wrong on the server');

/** Moves the clock past any backoff. */
const later = (ms: number) => vi.setSystemTime(Date.now() + ms);

describe('a batch the server fails on', () => {
  it('answered 500 three times: photos upload, the pull runs, and the record is held back and can be saved as a file', async () => {
    await saveRecord('pose', pose, db);
    await addPhoto(
      { id: uuid(), sessionId: session.id, poseId: pose.id, caption: 'gap at A', file: new Blob([new Uint8Array([0xff, 0xd8, 0xff])], { type: 'image/jpeg' }) },
      db,
    );
    const deskSession = { ...session, id: uuid(), title: 'From the desk', changeSeq: 7 };
    let pushes = 0;
    let uploads = 0;
    let pulls = 0;
    const transport: SyncTransport = {
      push: async () => {
        pushes += 1;
        throw serverFailure();
      },
      uploadPhoto: async () => void (uploads += 1),
      pull: async () => {
        pulls += 1;
        return { ...emptyPull(7), testSessions: [deskSession] };
      },
    };

    const first = await runSync(db, transport);
    expect(first).toMatchObject({ ok: false, retryAt: expect.any(String) });
    expect(first.ok === false && first.error.message).toBe(
      'the server could not take a record and wrote nothing (something went wrong on the server); trying again shortly',
    );
    // The failing push stopped neither the photo nor the pull.
    expect(uploads).toBe(1);
    expect(pulls).toBe(1);
    expect((await db.sessions.get(deskSession.id))?.title).toBe('From the desk');
    expect(await getMeta('pullCursor', db)).toBe(7);

    // Backing off: a run before the wait is over does not send the batch again, but still pulls.
    await runSync(db, transport);
    expect(pushes).toBe(1);
    expect(pulls).toBe(2);

    later(6_000);
    await runSync(db, transport);
    later(21_000);
    await runSync(db, transport);
    expect(pushes).toBe(3);
    expect(pulls).toBe(4);

    // Third failure of a one-record batch: that record is held back, with the server's message.
    expect(await db.batches.count()).toBe(0);
    const unsent = await unsentRecords(db);
    expect(unsent).toEqual([expect.objectContaining({ entity: 'pose', state: 'held', problem: 'something went wrong on the server' })]);
    await runSync(db, transport);
    expect(pushes).toBe(3);

    const look = await fieldLookups(db);
    const json = JSON.parse(unsentAsJson(unsent, look));
    expect(json.records).toEqual([
      expect.objectContaining({ what: 'Front left up', state: 'held', entity: 'pose', record: expect.objectContaining({ id: pose.id, liftFlMm: 300 }) }),
    ]);
    const csv = Papa.parse<Record<string, string>>(unsentAsCsv(unsent, look, 'mm'), { header: true }).data;
    expect(csv).toEqual([
      expect.objectContaining({
        what: 'Front left up',
        state: 'held back',
        problem: 'something went wrong on the server',
        id: pose.id,
        values: expect.stringContaining('Lift front left: 300 mm'),
      }),
    ]);
    expect(JSON.parse(csv[0].record)).toMatchObject({ id: pose.id, label: 'Front left up' });
  });

  it('narrows a large batch down to the one record the server fails on; all the others land', async () => {
    await saveRecord('pose', pose, db);
    const readings = Array.from({ length: 9 }, (_, i) => reading(90 + i, (['foreAft', 'lateral', 'vertical'] as const)[i % 3]));
    await saveRecords('reading', readings, db);
    const poison = readings[6].id;
    const landed = new Set<string>();
    let pushes = 0;
    const transport: SyncTransport = {
      async push(req) {
        pushes += 1;
        if (req.changes.some((c) => c.record.id === poison)) throw serverFailure();
        for (const c of req.changes) landed.add(c.record.id);
        return accept(req);
      },
      uploadPhoto: async () => {},
      pull: async () => emptyPull(1),
    };
    for (let run = 0; run < 40 && (await db.outbox.filter((e) => !e.held).count()) > 0; run++) {
      await runSync(db, transport);
      later(21_000);
    }
    expect(landed).toEqual(new Set([pose.id, ...readings.map((r) => r.id)].filter((id) => id !== poison)));
    expect((await unsentRecords(db)).map((u) => [u.record.id, u.state])).toEqual([[poison, 'held']]);
    // 10 changes halved down to the one at fault: 5 narrowings of 3 tries each, and the batches that land.
    expect(pushes).toBeLessThanOrEqual(19);
  });
});
