// Typing into a reading's slot on fake-indexeddb. A keystroke is written on the guess that the
// slot still holds what this page last wrote there, checked inside the same transaction: whatever
// changed the slot or its outbox entry meanwhile (a push answered, a batch formed, a hold, a
// conflict, a pull, an emptied store), the keystroke lands on what is stored, queued once, with
// the stored version, and nothing of the wrong guess is kept.
import 'fake-indexeddb/auto';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { liveQuery } from 'dexie';
import { newReading } from '@shared/records';
import { FieldDb } from './field-db';
import { setReadingValue } from './records';

let db: FieldDb;
beforeEach(async () => {
  db = new FieldDb(`slot-${crypto.randomUUID()}`);
  await db.open();
});
afterEach(async () => {
  db.close();
  await db.delete();
});

const slotOf = () => ({ poseId: crypto.randomUUID(), gaugePointId: crypto.randomUUID(), axis: 'vertical' as const });
const inSlot = (slot: ReturnType<typeof slotOf>) =>
  db.readings.where('[poseId+gaugePointId+axis]').equals([slot.poseId, slot.gaugePointId, slot.axis]).toArray();
const waiting = () => db.outbox.where('batchKey').equals('').toArray();

async function type(slot: ReturnType<typeof slotOf>, ...values: (number | null)[]) {
  for (const v of values) expect(await setReadingValue(slot, v, db)).toMatchObject({ ok: true });
}

describe('a keystroke in a reading slot', () => {
  it('edits the one reading of the slot and queues it once, keystroke after keystroke', async () => {
    const slot = slotOf();
    await type(slot, 1, 12, 123, 12);
    const [r] = await inSlot(slot);
    expect(await inSlot(slot)).toHaveLength(1);
    expect(r).toMatchObject({ valueMm: 12, version: 1, deletedAt: null });
    expect((await waiting()).map((e) => e.recordId)).toEqual([r.id]);
  });

  it('keeps the version a push answer gave the reading (no conflict with its own edit)', async () => {
    const slot = slotOf();
    await type(slot, 4);
    const [r] = await inSlot(slot);
    // The push was answered: the reading has the server's version and its outbox entry is gone.
    await db.readings.update(r.id, { version: 2 });
    await db.outbox.clear();
    await type(slot, 45);
    expect(await db.readings.get(r.id)).toMatchObject({ valueMm: 45, version: 2 });
    expect((await waiting()).map((e) => e.recordId)).toEqual([r.id]);
  });

  it('queues the reading again when a formed batch claimed its entry', async () => {
    const slot = slotOf();
    await type(slot, 4);
    await db.outbox.toCollection().modify({ batchKey: 'batch-in-flight' });
    await type(slot, 45);
    expect((await waiting()).map((e) => e.recordId)).toEqual([(await inSlot(slot))[0].id]);
    expect(await db.outbox.count()).toBe(2);
  });

  it('lets held records go again when the tester changes a held reading', async () => {
    const slot = slotOf();
    await type(slot, 4);
    await db.outbox.toCollection().modify({ held: { message: 'refused', fields: [], at: '2026-03-14T09:00:00.000Z' } });
    await type(slot, 45);
    const entries = await db.outbox.toArray();
    expect(entries).toHaveLength(1);
    expect(entries[0].held).toBeNull();
  });

  it('edits the reading a conflict put in the slot, and keeps nothing of the one it replaced', async () => {
    const slot = slotOf();
    await type(slot, 4);
    const [mine] = await inSlot(slot);
    // A conflict on a new reading: the server's reading of the slot replaced it.
    const theirs = { ...newReading({ ...slot, valueMm: 7 }), version: 3 };
    await db.transaction('rw', db.readings, db.outbox, async () => {
      await db.readings.delete(mine.id);
      await db.outbox.clear();
      await db.readings.put(theirs);
    });
    await type(slot, 45);
    expect(await inSlot(slot)).toEqual([expect.objectContaining({ id: theirs.id, valueMm: 45, version: 3 })]);
    expect((await db.outbox.toArray()).map((e) => e.recordId)).toEqual([theirs.id]);
  });

  it('edits a reading another device recorded in the slot, rather than adding a second one', async () => {
    const slot = slotOf();
    const pulled = { ...newReading({ ...slot, valueMm: 7 }), version: 2 };
    await db.readings.put(pulled);
    await type(slot, 8);
    expect(await inSlot(slot)).toEqual([expect.objectContaining({ id: pulled.id, valueMm: 8, version: 2 })]);
    expect((await db.outbox.toArray()).map((e) => e.recordId)).toEqual([pulled.id]);
  });

  it('starts a new reading when the store was emptied meanwhile', async () => {
    const slot = slotOf();
    await type(slot, 4);
    await db.transaction('rw', db.readings, db.outbox, async () => {
      await db.readings.clear();
      await db.outbox.clear();
    });
    await type(slot, 45);
    const [r] = await inSlot(slot);
    expect(await inSlot(slot)).toHaveLength(1);
    expect(r).toMatchObject({ valueMm: 45, version: 1 });
    expect((await waiting()).map((e) => e.recordId)).toEqual([r.id]);
  });

  it('clears the reading and types into the same record again', async () => {
    const slot = slotOf();
    await type(slot, 4, null);
    const [cleared] = await inSlot(slot);
    expect(cleared.deletedAt).not.toBeNull();
    await type(slot, null, 5);
    expect(await inSlot(slot)).toEqual([expect.objectContaining({ id: cleared.id, valueMm: 5, deletedAt: null })]);
  });

  it('keeps neither the reading nor its outbox entry when the outbox write fails', async () => {
    const slot = slotOf();
    db.outbox.hook('creating', () => {
      throw new Error('disk full');
    });
    const result = await setReadingValue(slot, 4, db);
    expect(result).toMatchObject({ ok: false, message: expect.stringMatching(/disk full/) });
    expect(await db.readings.count()).toBe(0);
    expect(await db.outbox.count()).toBe(0);
  });

  it("tells the store's live queries of a keystroke written past Dexie", async () => {
    const slot = slotOf();
    await type(slot, 4);
    const seen: (number | null)[] = [];
    const subscription = liveQuery(() => db.readings.where('poseId').equals(slot.poseId).toArray()).subscribe((rows) => seen.push(rows[0]?.valueMm ?? null));
    await expect.poll(() => seen.at(-1)).toBe(4);
    await type(slot, 45);
    await expect.poll(() => seen.at(-1)).toBe(45);
    subscription.unsubscribe();
  });

  it('sends the reads that check the guess with the write, not before it, as the keystroke is typed', async () => {
    // Every request to IndexedDB in order, and when its answer came back.
    const log: string[] = [];
    const watch = (proto: object, storeOf: (self: never) => IDBObjectStore) => {
      for (const method of ['get', 'getAll', 'getAllKeys', 'count', 'openCursor', 'put', 'add', 'delete'] as const) {
        const original = (proto as Record<string, (...args: unknown[]) => IDBRequest>)[method];
        if (!original) continue;
        vi.spyOn(proto as Record<string, (...args: unknown[]) => IDBRequest>, method).mockImplementation(function (this: never, ...args: unknown[]) {
          const what = `${method} ${storeOf(this).name}`;
          log.push(`ask ${what}`);
          const request = original.apply(this, args);
          request.addEventListener('success', () => log.push(`answer ${what}`));
          return request;
        });
      }
    };
    watch(IDBObjectStore.prototype, (store: IDBObjectStore) => store);
    watch(IDBIndex.prototype, (index: IDBIndex) => index.objectStore);
    const slot = slotOf();
    await type(slot, 4);
    log.length = 0;
    const typed = setReadingValue(slot, 45, db);
    // The keystroke's requests are made in the input's own handler, before anything else runs.
    expect(log).toEqual(['ask getAll readings', 'ask getAll outbox', 'ask put readings']);
    expect(await typed).toMatchObject({ ok: true });
    expect(log.slice(3)).toEqual(['answer getAll readings', 'answer getAll outbox', 'answer put readings']);
    vi.restoreAllMocks();
  });
});
