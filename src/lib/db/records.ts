// The field's records in IndexedDB (tables vehicles, gaugePoints, sessions, poses, readings of
// field-db.ts) and their outbox entries. A record and its outbox entry are written in one
// transaction, so neither exists without the other. Values are checked with the shared zod
// schemas on the way in and on the way out: a bad value or a corrupt row comes back as a per-item
// result naming the record and the field, never as a thrown error.
import type { ZodType } from 'zod';
import { newReading, records, type RecordOf, type SyncEntity } from '@shared/records';
import type { Reading } from '@shared/schemas';
import { fieldDb, tableOf, type FieldDb } from './field-db';
import { tracked } from './writes-in-flight';
import { crossOff, journalEntries, noteTyping, type TypedEdit } from './typing-journal';

/** The shared schema a record of `entity` is checked with, on the way in and out. */
const schemaOf = (entity: SyncEntity): ZodType => records[entity].schema;

/** What an edit may change: any field but the record's identity and the version it builds on. */
export type Patch<E extends SyncEntity> = Partial<Omit<RecordOf<E>, 'id' | 'version'>>;

export interface ItemError {
  field: string;
  message: string;
}

export type ItemResult = { id: string; ok: true } | { id: string; ok: false; message: string; fields: ItemError[] };

export interface Checked<T> {
  records: T[];
  corrupt: { id: string; message: string }[];
}

/** Splits records into those the shared schema accepts and a refusal per other one, naming the field. */
function checkRecords<T extends { id: string }>(entity: SyncEntity, records: T[]): { valid: T[]; refused: ItemResult[] } {
  const valid: T[] = [];
  const refused: ItemResult[] = [];
  for (const r of records) {
    const parsed = schemaOf(entity).safeParse(r);
    if (parsed.success) valid.push(parsed.data as T);
    else {
      const fields = parsed.error.issues.map((i) => ({ field: i.path.join('.') || 'record', message: i.message }));
      refused.push({ id: r.id, ok: false, message: `${fields[0].field}: ${fields[0].message}`, fields });
    }
  }
  return { valid, refused };
}

/** Puts records and queues them; call inside a transaction over their table and the outbox. */
async function putQueued<T extends { id: string }>(entity: SyncEntity, valid: T[], db: FieldDb) {
  // The record's write and the look-up of its outbox entries go to IndexedDB together (one round
  // trip, not two: a keystroke pays for each); the look-up does not depend on the write.
  // One waiting entry per record is enough: the batch reads the latest content when it forms.
  const [, entries] = await Promise.all([
    tableOf(db, entity).bulkPut(valid as never[]),
    db.outbox
      .where('[entity+recordId]')
      .anyOf(valid.map((r) => [entity, r.id]))
      .toArray(),
  ]);
  const unclaimed = entries.filter((e) => e.batchKey === '');
  // The tester changed a record the server refused: every held record may go again (a fixed pose
  // lets its held readings through too); what is still wrong is held again with the new answer.
  if (unclaimed.some((e) => e.held)) await db.outbox.filter((e) => !!e.held).modify({ held: null });
  const waiting = new Set(unclaimed.map((e) => e.recordId));
  const queuedAt = new Date().toISOString();
  await db.outbox.bulkAdd(valid.filter((r) => !waiting.has(r.id)).map((r) => ({ entity, recordId: r.id, batchKey: '', queuedAt })));
}

/** Validates records, then writes the valid ones and their outbox entries in one transaction. */
export function saveRecords<T extends { id: string }>(entity: SyncEntity, records: T[], db: FieldDb = fieldDb): Promise<ItemResult[]> {
  return tracked(() => writeRecords(entity, records, db));
}

async function writeRecords<T extends { id: string }>(entity: SyncEntity, records: T[], db: FieldDb): Promise<ItemResult[]> {
  const { valid, refused: results } = checkRecords(entity, records);
  if (!valid.length) return results;
  try {
    await db.transaction('rw', tableOf(db, entity), db.outbox, () => putQueued(entity, valid, db));
    for (const r of valid) results.push({ id: r.id, ok: true });
    announceSaved();
  } catch (err) {
    const message = storageMessage(err);
    for (const r of valid) results.push({ id: r.id, ok: false, message, fields: [] });
  }
  return results;
}

/** One record; the result says whether it is stored. */
export async function saveRecord<T extends { id: string }>(entity: SyncEntity, record: T, db: FieldDb = fieldDb): Promise<ItemResult> {
  const [result] = await saveRecords(entity, [record], db);
  return result;
}

/**
 * Edits a stored record: merges the patch into the record as it is stored NOW, inside the
 * transaction that writes it and its outbox entry. Screens hand over only the fields a person
 * changed, never a whole record from their own copy: a copy taken before a push was answered
 * carries the old version, and writing it back would make the next push conflict with this
 * phone's own accepted edit (and undo whatever a pull brought meanwhile).
 */
export function patchRecord<E extends SyncEntity>(entity: E, id: string, patch: Patch<E>, db: FieldDb = fieldDb): Promise<ItemResult> {
  return journaled(db, { op: 'patch', entity, id, patch }, () => writePatch(entity, id, patch, db));
}

/** Runs a typed edit's write, noted in the typing journal until it settles (typing-journal.ts). */
function journaled(db: FieldDb, edit: TypedEdit, write: () => Promise<ItemResult>): Promise<ItemResult> {
  const n = noteTyping(db.name, edit);
  const done = write();
  void done.finally(() => crossOff(db.name, n));
  return done;
}

/** Replays edits a reload cut before they were stored, in the order they were typed. */
export async function replayTyping(db: FieldDb = fieldDb): Promise<void> {
  for (const entry of journalEntries(db.name)) {
    if (entry.op === 'reading') await setReadingValue(entry.slot, entry.valueMm, db);
    else await patchRecord(entry.entity, entry.id, entry.patch as Patch<SyncEntity>, db);
    crossOff(db.name, entry.n);
  }
}

function writePatch<E extends SyncEntity>(entity: E, id: string, patch: Patch<E>, db: FieldDb): Promise<ItemResult> {
  return tracked(async () => {
    let wrote = false;
    try {
      const result = await db.transaction('rw', tableOf(db, entity), db.outbox, async (): Promise<ItemResult> => {
        const stored = await tableOf(db, entity).get(id);
        if (!stored) return { id, ok: false, message: `this ${entity} is not on this phone any more`, fields: [] };
        const { valid, refused } = checkRecords(entity, [{ ...stored, ...patch, id: stored.id, version: stored.version }]);
        if (!valid.length) return refused[0];
        await putQueued(entity, valid, db);
        wrote = true;
        return { id, ok: true };
      });
      if (wrote) announceSaved();
      return result;
    } catch (err) {
      return { id, ok: false, message: storageMessage(err), fields: [] };
    }
  });
}

/** The fields of `after` that differ from `before`: what a form changed, as a patch. */
export function changedFields<T extends Record<string, unknown>>(before: T, after: T): Partial<T> {
  const patch: Partial<T> = {};
  for (const key of Object.keys(after) as (keyof T)[]) {
    if (JSON.stringify(before[key]) !== JSON.stringify(after[key])) patch[key] = after[key];
  }
  return patch;
}

/** Rows read back from storage, checked against the shared schema; corrupt ones are reported, not trusted. */
export function checkRows<T extends { id: string }>(entity: SyncEntity, rows: unknown[]): Checked<T> {
  const out: Checked<T> = { records: [], corrupt: [] };
  for (const row of rows) {
    const parsed = schemaOf(entity).safeParse(row);
    if (parsed.success) out.records.push(parsed.data as T);
    else {
      const issue = parsed.error.issues[0];
      out.corrupt.push({ id: String((row as { id?: unknown })?.id ?? '?'), message: `${entity} ${issue.path.join('.')}: ${issue.message}` });
    }
  }
  return out;
}

/** Tells whoever listens (the sync engine) that something new waits, without this layer knowing who. */
export function announceSaved() {
  if (typeof window !== 'undefined') window.dispatchEvent(new Event('twistlog:saved'));
}

export function storageMessage(err: unknown): string {
  const e = err as { name?: string; message?: string; inner?: { name?: string } };
  const name = e?.inner?.name ?? e?.name;
  if (name === 'QuotaExceededError') return 'the phone is out of storage space for Twistlog: nothing new was saved';
  return `could not save on this device: ${e?.message ?? String(err)}`;
}

// Keystrokes arrive faster than IndexedDB answers: writes to one slot run one after another, or
// two quick keystrokes could both find no reading and create two records for the same slot.
const slotWrites = new Map<string, Promise<ItemResult>>();

/**
 * Sets (or clears, with null) the reading at one gauge point and axis of a pose. The same record
 * is reused for its slot, even after a clear, since the server holds one reading per slot.
 */
export function setReadingValue(
  slot: { poseId: string; gaugePointId: string; axis: Reading['axis'] },
  valueMm: number | null,
  db: FieldDb = fieldDb,
): Promise<ItemResult> {
  const key = `${db.name}|${slot.poseId}|${slot.gaugePointId}|${slot.axis}`;
  const previous = slotWrites.get(key);
  const write = journaled(db, { op: 'reading', slot, valueMm }, () =>
    tracked(() => (previous ? previous.catch(() => undefined) : Promise.resolve()).then(() => writeReadingValue(slot, valueMm, db))),
  );
  slotWrites.set(key, write);
  void write.finally(() => {
    if (slotWrites.get(key) === write) slotWrites.delete(key);
  });
  return write;
}

// The look-up and the write share one transaction: a keystroke costs one commit, not two.
async function writeReadingValue(
  slot: { poseId: string; gaugePointId: string; axis: Reading['axis'] },
  valueMm: number | null,
  db: FieldDb,
): Promise<ItemResult> {
  let wrote = false;
  try {
    const result = await db.transaction('rw', db.readings, db.outbox, async (): Promise<ItemResult> => {
      // A slot can hold a cleared reading pulled from another device beside the live one: edit the live one.
      const inSlot = await db.readings.where('[poseId+gaugePointId+axis]').equals([slot.poseId, slot.gaugePointId, slot.axis]).toArray();
      const existing = inSlot.find((r) => !r.deletedAt) ?? inSlot[0];
      let record: Reading;
      if (valueMm === null) {
        if (!existing || existing.deletedAt) return { id: existing?.id ?? '', ok: true };
        record = { ...existing, deletedAt: new Date().toISOString() };
      } else {
        const base: Reading = existing ?? newReading({ ...slot, valueMm });
        record = { ...base, valueMm, deletedAt: null };
      }
      const { valid, refused } = checkRecords('reading', [record]);
      if (!valid.length) return refused[0];
      await putQueued('reading', valid, db);
      wrote = true;
      return { id: record.id, ok: true };
    });
    if (wrote) announceSaved();
    return result;
  } catch (err) {
    return { id: '', ok: false, message: storageMessage(err), fields: [] };
  }
}
