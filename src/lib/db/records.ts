// The field's records in IndexedDB (tables vehicles, gaugePoints, sessions, poses, readings of
// field-db.ts) and their outbox entries. A record and its outbox entry are written in one
// transaction, so neither exists without the other. Values are checked with the shared zod
// schemas on the way in and on the way out: a bad value or a corrupt row comes back as a per-item
// result naming the record and the field, never as a thrown error.
import type { ZodType } from 'zod';
import { newReading, records, type RecordOf, type SyncEntity } from '@shared/records';
import type { Reading } from '@shared/schemas';
import { fieldDb, tableOf, type FieldDb, type OutboxEntry } from './field-db';
import { tracked } from './writes-in-flight';
import { crossOff, journalEntries, noteTyping, type TypedEdit } from './typing-journal';
import { putOnGuess, slotReading, startKeystrokeWorker, type Slot } from './guessed-write';
import { preciseNow } from './guessed-put';

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

/** The outbox entries of records, as stored now (one key is one read; several walk the index). */
function entriesOf(entity: SyncEntity, ids: string[], db: FieldDb): Promise<OutboxEntry[]> {
  const index = db.outbox.where('[entity+recordId]');
  return (ids.length === 1 ? index.equals([entity, ids[0]]) : index.anyOf(ids.map((id) => [entity, id]))).toArray();
}

/**
 * Puts records and queues each one that is not waiting yet; call inside a transaction over their
 * table and the outbox, with the records' outbox entries as stored in it now. One waiting entry
 * per record is enough: the batch reads the latest content when it forms.
 */
async function putQueued<T extends { id: string }>(entity: SyncEntity, valid: T[], entries: OutboxEntry[], db: FieldDb) {
  const unclaimed = entries.filter((e) => e.batchKey === '');
  // The tester changed a record the server refused: every held record may go again (a fixed pose
  // lets its held readings through too); what is still wrong is held again with the new answer.
  if (unclaimed.some((e) => e.held)) await db.outbox.filter((e) => !!e.held).modify({ held: null });
  const waiting = new Set(unclaimed.map((e) => e.recordId));
  const queuedAt = new Date().toISOString();
  await Promise.all([
    tableOf(db, entity).bulkPut(valid as never[]),
    db.outbox.bulkAdd(valid.filter((r) => !waiting.has(r.id)).map((r) => ({ entity, recordId: r.id, batchKey: '', queuedAt }))),
  ]);
}

/** Validates records, then writes the valid ones and their outbox entries in one transaction. */
export function saveRecords<T extends { id: string }>(entity: SyncEntity, records: T[], db: FieldDb = fieldDb): Promise<ItemResult[]> {
  return tracked(() => writeRecords(entity, records, db));
}

async function writeRecords<T extends { id: string }>(entity: SyncEntity, records: T[], db: FieldDb): Promise<ItemResult[]> {
  const { valid, refused: results } = checkRecords(entity, records);
  if (!valid.length) return results;
  try {
    await db.transaction('rw', tableOf(db, entity), db.outbox, async () =>
      putQueued(
        entity,
        valid,
        await entriesOf(
          entity,
          valid.map((r) => r.id),
          db,
        ),
        db,
      ),
    );
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
        // Both reads go to IndexedDB together: a keystroke pays for each round trip.
        const [stored, entries] = await Promise.all([tableOf(db, entity).get(id), entriesOf(entity, [id], db)]);
        if (!stored) return { id, ok: false, message: `this ${entity} is not on this phone any more`, fields: [] };
        const { valid, refused } = checkRecords(entity, [{ ...stored, ...patch, id: stored.id, version: stored.version }]);
        if (!valid.length) return refused[0];
        await putQueued(entity, valid, entries, db);
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

/**
 * Tells whoever listens (the sync engine) that something new waits, without this layer knowing who.
 * The event's detail says when the write committed (milliseconds since the epoch, `preciseNow`):
 * a keystroke committed in the keystroke worker is announced here only once the page's main thread
 * hears of it, which may be several milliseconds later.
 */
export function announceSaved(committedAt: number = preciseNow()) {
  if (typeof window !== 'undefined') window.dispatchEvent(new CustomEvent('twistlog:saved', { detail: { committedAt } }));
}

export function storageMessage(err: unknown): string {
  const e = err as { name?: string; message?: string; inner?: { name?: string } };
  const name = e?.inner?.name ?? e?.name;
  if (name === 'QuotaExceededError') return 'the phone is out of storage space for Twistlog: nothing new was saved';
  return `could not save on this device: ${e?.message ?? String(err)}`;
}

// Keystrokes arrive faster than IndexedDB answers: writes to one slot run one after another, or
// two quick keystrokes could both find no reading and create two records for the same slot. A
// keystroke with no write of its slot in flight starts at once, in the input's own handler.
const slotWrites = new Map<string, Promise<ItemResult>>();

/**
 * Sets (or clears, with null) the reading at one gauge point and axis of a pose. The same record
 * is reused for its slot, even after a clear, since the server holds one reading per slot.
 */
export function setReadingValue(slot: Slot, valueMm: number | null, db: FieldDb = fieldDb): Promise<ItemResult> {
  const key = `${db.name}|${slot.poseId}|${slot.gaugePointId}|${slot.axis}`;
  const previous = slotWrites.get(key);
  const write = journaled(db, { op: 'reading', slot, valueMm }, () =>
    tracked(() =>
      previous ? previous.catch(() => undefined).then(() => writeReadingValue(slot, valueMm, key, db)) : writeReadingValue(slot, valueMm, key, db),
    ),
  );
  slotWrites.set(key, write);
  void write.finally(() => {
    if (slotWrites.get(key) === write) slotWrites.delete(key);
  });
  return write;
}

// The reading each slot was last given here, exactly as stored. The next keystroke in the slot is
// written on this guess, with the reads that check it sent in the same round trip to IndexedDB
// rather than one before the write (guessed-write.ts): a keystroke then costs one round trip and
// the commit. The guess is never trusted: when the reads show that the slot or its outbox entry
// changed meanwhile, the transaction is aborted before it commits and the keystroke is written
// from what is stored.
const lastWritten = new Map<string, Reading>();

class GuessedWrong extends Error {}

const readSlot = (slot: Slot, db: FieldDb) => db.readings.where('[poseId+gaugePointId+axis]').equals([slot.poseId, slot.gaugePointId, slot.axis]).toArray();

/** The slot's reading after a keystroke, from the one stored in it; null when there is nothing to change. */
function nextReading(existing: Reading | undefined, slot: Slot, valueMm: number | null): Reading | null {
  if (valueMm === null) return existing && !existing.deletedAt ? { ...existing, deletedAt: new Date().toISOString() } : null;
  return { ...(existing ?? newReading({ ...slot, valueMm })), valueMm, deletedAt: null };
}

async function writeReadingValue(slot: Slot, valueMm: number | null, key: string, db: FieldDb): Promise<ItemResult> {
  try {
    const written = (await writeAsGuessed(slot, valueMm, key, db)) ?? (await writeFromStore(slot, valueMm, db));
    if (written.ok === false) return written;
    if (written.record) {
      lastWritten.set(key, written.record);
      announceSaved(written.committedAt);
    }
    return { id: written.id, ok: true };
  } catch (err) {
    return { id: '', ok: false, message: storageMessage(err), fields: [] };
  }
}

/** A slot's write: the reading as stored (null: nothing to change), or why it was refused. */
type SlotWrite = { id: string; ok: true; record: Reading | null; committedAt?: number } | Extract<ItemResult, { ok: false }>;

/**
 * Writes the keystroke on the guess that the slot holds what this page last wrote in it (nothing,
 * when it wrote nothing there yet) and that its outbox entry still waits; null when there is no
 * guess to make or it was wrong (nothing is then written).
 */
async function writeAsGuessed(slot: Slot, valueMm: number | null, key: string, db: FieldDb): Promise<SlotWrite | null> {
  const guess = lastWritten.get(key);
  const next = nextReading(guess, slot, valueMm);
  const [record] = next ? checkRecords('reading', [next]).valid : [];
  if (!record) return null;
  if (guess) {
    const put = await putOnGuess(db, slot, guess, record);
    return put?.ok ? { id: record.id, ok: true, record, committedAt: put.committedAt } : null;
  }
  // The slot's first keystroke on this page: a new reading and its outbox entry, if the slot is empty.
  try {
    await db.transaction('rw', db.readings, db.outbox, async () => {
      const [inSlot] = await Promise.all([
        readSlot(slot, db),
        db.readings.put(record),
        db.outbox.add({ entity: 'reading', recordId: record.id, batchKey: '', queuedAt: new Date().toISOString() }),
      ]);
      if (inSlot.length) throw new GuessedWrong();
    });
    startKeystrokeWorker(db);
    return { id: record.id, ok: true, record };
  } catch (err) {
    if (err instanceof GuessedWrong) return null;
    throw err;
  }
}

/** Reads the slot and its outbox entries, then writes: the way when the guess could not be made or was wrong. */
function writeFromStore(slot: Slot, valueMm: number | null, db: FieldDb): Promise<SlotWrite> {
  return db.transaction('rw', db.readings, db.outbox, async (): Promise<SlotWrite> => {
    const existing = slotReading(await readSlot(slot, db));
    const next = nextReading(existing, slot, valueMm);
    if (!next) return { id: existing?.id ?? '', ok: true, record: null };
    const { valid, refused } = checkRecords('reading', [next]);
    if (!valid.length) return refused[0] as SlotWrite;
    // A new reading has a new id: nothing of it can be in the outbox yet.
    await putQueued('reading', valid, existing ? await entriesOf('reading', [next.id], db) : [], db);
    return { id: next.id, ok: true, record: valid[0] };
  });
}
