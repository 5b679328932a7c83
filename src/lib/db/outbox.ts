// The outbox (table outbox of field-db.ts) and formed batches (table batches): which records
// wait to be pushed, which are held back and why, and the exact batch in flight. A batch is formed
// once and kept, with its idempotency key, until the server answers; a retry after a lost answer
// sends it unchanged. Only an answer saying the server wrote nothing (a refusal, or a failure of
// its own) frees its records: the ones it named are held for the tester to fix, the rest go again.
import type { FieldError } from '@shared/schemas/common';
import type { PushResponse, SyncChange, SyncEntity } from '@shared/schemas/sync';
import { syncEntities } from '@shared/schemas/sync';
import { fieldDb, tableOf, type FieldDb, type Hold, type PendingBatch } from './field-db';
import { setMeta } from './meta';

/** The batch in flight, or a new one from the waiting entries (parents first); null when nothing waits. */
export async function formBatch(maxChanges: number, db: FieldDb = fieldDb): Promise<PendingBatch | null> {
  const tables = syncEntities.map((e) => tableOf(db, e));
  return db.transaction('rw', [db.outbox, db.batches, ...tables], async () => {
    const inFlight = await db.batches.toCollection().first();
    if (inFlight) return inFlight;
    const waiting = (await db.outbox.where('batchKey').equals('').sortBy('seq')).filter((e) => !e.held);
    if (!waiting.length) return null;
    // Parents first, so a batch cut at maxChanges never sends a reading before its pose.
    const order = (e: { entity: SyncEntity }) => syncEntities.indexOf(e.entity);
    waiting.sort((a, b) => order(a) - order(b) || a.seq! - b.seq!);
    const picked = new Map<string, { entity: SyncEntity; recordId: string; seqs: number[] }>();
    for (const e of waiting) {
      const k = `${e.entity}:${e.recordId}`;
      const p = picked.get(k);
      if (p) p.seqs.push(e.seq!);
      else if (picked.size < maxChanges) picked.set(k, { entity: e.entity, recordId: e.recordId, seqs: [e.seq!] });
    }
    const changes: SyncChange[] = [];
    const seqs: number[] = [];
    for (const entity of syncEntities) {
      const mine = [...picked.values()].filter((p) => p.entity === entity);
      if (!mine.length) continue;
      const records = await tableOf(db, entity).bulkGet(mine.map((p) => p.recordId));
      mine.forEach((p, i) => {
        seqs.push(...p.seqs);
        const record = records[i];
        if (record) changes.push({ entity, record: stripLocal(record) } as SyncChange);
      });
    }
    const key = crypto.randomUUID();
    await db.outbox.where('seq').anyOf(seqs).modify({ batchKey: key });
    if (!changes.length) {
      await db.outbox.bulkDelete(seqs);
      return null;
    }
    const batch: PendingBatch = { key, changes, outboxSeqs: seqs, formedAt: new Date().toISOString() };
    await db.batches.add(batch);
    return batch;
  });
}

/** Pulled rows carry changeSeq; the push contract does not. */
function stripLocal(record: Record<string, unknown>) {
  const { changeSeq: _drop, ...rest } = record;
  return rest;
}

/**
 * The server's answer to a batch. Accepted records take the server's new version, whether or not
 * they were edited since the batch was formed: such an edit builds on the batch and goes next. A
 * conflicted record shows the server's version, unless the tester typed into it since (that edit
 * is kept and sent again, joining the same kept conflict on the server).
 */
export async function completeBatch(key: string, response: PushResponse, db: FieldDb = fieldDb): Promise<void> {
  const tables = syncEntities.map((e) => tableOf(db, e));
  await db.transaction('rw', [db.outbox, db.batches, db.conflicts, ...tables], async () => {
    const batch = await db.batches.get(key);
    if (!batch) return;
    for (const entity of syncEntities) {
      const accepted = response.accepted.filter((a) => a.entity === entity);
      if (!accepted.length) continue;
      const table = tableOf(db, entity);
      const rows = await table.bulkGet(accepted.map((a) => a.id));
      await table.bulkPut(rows.flatMap((row, i) => (row ? [{ ...row, version: accepted[i].version }] : [])));
    }
    await db.outbox.bulkDelete(batch.outboxSeqs);
    const editedSince = new Set((await db.outbox.where('batchKey').equals('').toArray()).map((e) => `${e.entity}:${e.recordId}`));
    for (const c of response.conflicts) {
      const mine = String(c.clientRecord.id ?? c.entityId);
      if (editedSince.has(`${c.entity}:${mine}`)) continue;
      // A new reading that met another one in its slot: the conflict holds its value now.
      if (mine !== c.entityId) await tableOf(db, c.entity).delete(mine);
      await tableOf(db, c.entity).put(c.serverRecord as { id: string; version: number });
    }
    await db.conflicts.bulkPut(response.conflicts);
    await db.batches.delete(key);
  });
}

/**
 * A batch the server refused, naming some of its records: those are held back with the reason
 * until the tester changes one of them (or asks to try again); the others wait for the next batch.
 */
export async function holdRecords(key: string, held: Map<string, { message: string; fields: FieldError[] }>, db: FieldDb = fieldDb): Promise<void> {
  const at = new Date().toISOString();
  await db.transaction('rw', db.outbox, db.batches, async () => {
    const entries = await db.outbox.where('batchKey').equals(key).toArray();
    for (const e of entries) {
      const why = held.get(`${e.entity}:${e.recordId}`);
      await db.outbox.update(e.seq!, { batchKey: '', held: why ? { ...why, at } : (e.held ?? null) });
    }
    await db.batches.delete(key);
  });
}

/** Backing off after an answer that wrote nothing; how long the next try waits, by tries so far. */
const RETRY_DELAYS_MS = [5_000, 20_000];
/** After this many such answers a batch is narrowed down: halved, until the one record at fault is held. */
const TRIES_BEFORE_NARROWING = RETRY_DELAYS_MS.length + 1;

/**
 * The server answered this batch but wrote nothing: a refusal naming no record of it, or a failure
 * of its own. The batch backs off; on its third such answer it is split in half (the next batch
 * takes half as many changes), and a batch of one record is held back with the server's message.
 */
export async function noteBatchFailure(
  key: string,
  error: { message: string; fields: FieldError[] },
  db: FieldDb = fieldDb,
): Promise<{ retryAt: string | null }> {
  let narrowTo: number | null = null;
  let retryAt: string | null = null;
  await db.transaction('rw', db.outbox, db.batches, async () => {
    const batch = await db.batches.get(key);
    if (!batch) return;
    const tries = (batch.tries ?? 0) + 1;
    if (tries < TRIES_BEFORE_NARROWING) {
      retryAt = new Date(Date.now() + RETRY_DELAYS_MS[tries - 1]).toISOString();
      await db.batches.update(key, { tries, retryAt, lastError: error.message });
      return;
    }
    const hold: Hold | null = batch.changes.length === 1 ? { message: error.message, fields: error.fields, at: new Date().toISOString() } : null;
    await db.outbox
      .where('batchKey')
      .equals(key)
      .modify({ batchKey: '', ...(hold ? { held: hold } : {}) });
    await db.batches.delete(key);
    if (!hold) narrowTo = Math.ceil(batch.changes.length / 2);
  });
  if (narrowTo) await setMeta('pushLimit', narrowTo, db);
  return { retryAt };
}

/** The tester changed a held record or asked to try again: every held record goes with the next batch. */
export async function releaseHolds(db: FieldDb = fieldDb): Promise<void> {
  await db.transaction('rw', db.outbox, db.batches, async () => {
    await db.outbox.filter((e) => !!e.held).modify({ held: null });
    await db.batches.toCollection().modify({ retryAt: null });
  });
}
