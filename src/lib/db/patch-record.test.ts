// patchRecord on fake-indexeddb: an edit merges into the stored record (never a screen's stale copy),
// queues it once, and refuses a bad value or a missing record by name without writing anything.
import 'fake-indexeddb/auto';
import { describe, expect, it } from 'vitest';
import type { FieldDb } from './field-db';
import { freshFieldDbPerTest } from './fresh-field-db';
import { patchRecord, saveRecord } from './records';
import { newPose } from '@shared/records';

let db: FieldDb;
freshFieldDbPerTest('test', (opened) => (db = opened));

const pose = () => newPose({ sessionId: crypto.randomUUID(), seq: 1, label: 'Pose 1', recordedAt: '2026-03-14T09:00:00.000Z' });

describe('patchRecord', () => {
  it('merges into the stored record, keeping the version the store holds', async () => {
    const p = pose();
    await saveRecord('pose', p, db);
    // The server accepted an earlier push meanwhile: the store holds version 3.
    await db.poses.update(p.id, { version: 3, notes: 'typed before' });
    expect(await patchRecord('pose', p.id, { label: 'FL on block' }, db)).toEqual({ id: p.id, ok: true });
    expect(await db.poses.get(p.id)).toMatchObject({ version: 3, label: 'FL on block', notes: 'typed before' });
    expect((await db.outbox.toArray()).filter((e) => e.recordId === p.id)).toHaveLength(1);
  });

  it('refuses a value the shared schema refuses, naming the field, and leaves the record as it was', async () => {
    const p = pose();
    await saveRecord('pose', p, db);
    const result = await patchRecord('pose', p.id, { liftFlMm: 99_999 }, db);
    expect(result.ok).toBe(false);
    expect(!result.ok && result.fields[0].field).toBe('liftFlMm');
    expect((await db.poses.get(p.id))?.liftFlMm).toBe(0);
  });

  it('refuses a record that is not on this phone', async () => {
    const result = await patchRecord('pose', crypto.randomUUID(), { label: 'x' }, db);
    expect(result.ok).toBe(false);
    expect(await db.outbox.count()).toBe(0);
  });
});
