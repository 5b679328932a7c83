// Local edits on fake-indexeddb: an edit is a patch merged into the stored record, so it keeps
// the version the stored record has (after a push was answered) and whatever a pull brought.
import 'fake-indexeddb/auto';
import { describe, expect, it } from 'vitest';
import type { Pose } from '@shared/schemas';
import type { FieldDb } from './field-db';
import { freshFieldDbPerTest } from './fresh-field-db';
import { changedFields, patchRecord, replayTyping, saveRecord } from './records';
import { journalEntries, noteTyping } from './typing-journal';
import { newPose } from '@shared/records';

let db: FieldDb;
freshFieldDbPerTest('records', (opened) => (db = opened));

const pose = (): Pose => newPose({ sessionId: crypto.randomUUID(), seq: 0, label: 'Pose 1', kind: 'level', recordedAt: '2026-03-14T09:00:00.000Z' });

describe('patchRecord', () => {
  it('merges the changed fields into the stored record, keeping its version and the fields others changed', async () => {
    const p = pose();
    await saveRecord('pose', p, db);
    // A push was answered (version 2) and a pull brought a note from the desk meanwhile.
    await db.poses.update(p.id, { version: 2, notes: 'from the desk' });
    expect(await patchRecord('pose', p.id, { label: 'Level, tyres cold' }, db)).toEqual({ id: p.id, ok: true });
    expect(await db.poses.get(p.id)).toMatchObject({ version: 2, label: 'Level, tyres cold', notes: 'from the desk' });
    expect(await db.outbox.count()).toBe(1);
  });

  it('never changes the id or the version it builds on', async () => {
    const p = pose();
    await saveRecord('pose', p, db);
    await patchRecord('pose', p.id, { label: 'x', id: 'other', version: 9 } as never, db);
    expect(await db.poses.get(p.id)).toMatchObject({ id: p.id, version: 1, label: 'x' });
  });

  it('lands every one of many quick patches of different fields', async () => {
    const p = pose();
    await saveRecord('pose', p, db);
    await Promise.all([
      patchRecord('pose', p.id, { liftFlMm: 300 }, db),
      patchRecord('pose', p.id, { label: 'Front left up' }, db),
      patchRecord('pose', p.id, { notes: 'spotter at the rear' }, db),
      patchRecord('pose', p.id, { liftRrMm: -40 }, db),
    ]);
    expect(await db.poses.get(p.id)).toMatchObject({ liftFlMm: 300, label: 'Front left up', notes: 'spotter at the rear', liftRrMm: -40 });
  });

  it('refuses a bad value naming the field, and keeps the stored record', async () => {
    const p = pose();
    await saveRecord('pose', p, db);
    const result = await patchRecord('pose', p.id, { liftFlMm: Number.NaN }, db);
    expect(result).toMatchObject({ ok: false, fields: [expect.objectContaining({ field: 'liftFlMm' })] });
    expect((await db.poses.get(p.id))?.liftFlMm).toBe(0);
  });

  it('says so when the record is not on this phone', async () => {
    const result = await patchRecord('pose', crypto.randomUUID(), { label: 'x' }, db);
    expect(result).toMatchObject({ ok: false, message: expect.stringMatching(/not on this phone/) });
    expect(await db.outbox.count()).toBe(0);
  });
});

describe('changedFields', () => {
  it('keeps only what differs, nested values compared by content', () => {
    expect(changedFields({ a: 1, o: { w: 1 }, s: 'x' }, { a: 1, o: { w: 2 }, s: 'x' })).toEqual({ o: { w: 2 } });
  });
});

describe('typing a reload cut before it was stored', () => {
  it('is replayed in the order it was typed when the store opens again, then forgotten', async () => {
    const p = pose();
    await saveRecord('pose', p, db);
    const slot = { poseId: p.id, gaugePointId: crypto.randomUUID(), axis: 'lateral' as const };
    // Noted as typed, but the page went away before the writes ran.
    noteTyping(db.name, { op: 'reading', slot, valueMm: 4 });
    noteTyping(db.name, { op: 'reading', slot, valueMm: 45 });
    noteTyping(db.name, { op: 'patch', entity: 'pose', id: p.id, patch: { label: 'Front left up' } });
    await replayTyping(db);
    expect((await db.readings.toArray()).map((r) => r.valueMm)).toEqual([45]);
    expect((await db.poses.get(p.id))?.label).toBe('Front left up');
    expect(journalEntries(db.name)).toEqual([]);
  });

  it('forgets each edit once it is stored', async () => {
    const p = pose();
    await saveRecord('pose', p, db);
    await patchRecord('pose', p.id, { notes: 'chocks in' }, db);
    expect(journalEntries(db.name)).toEqual([]);
  });
});
