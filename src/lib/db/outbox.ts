// The outbox (table outbox of field-db.ts) and formed batches (table batches): which records
// wait to be pushed, and the exact batch in flight. A batch is formed once and kept, with its
// idempotency key, until the server answers; a retry sends it unchanged.
import type { PushResponse, SyncChange, SyncEntity } from '@shared/schemas/sync';
import { syncEntities } from '@shared/schemas/sync';
import { fieldDb, tableOf, type FieldDb, type PendingBatch } from './field-db';

/** The batch in flight, or a new one from the waiting entries (parents first); null when nothing waits. */
export async function formBatch(maxChanges: number, db: FieldDb = fieldDb): Promise<PendingBatch | null> {
  const tables = syncEntities.map((e) => tableOf(db, e));
  return db.transaction('rw', [db.outbox, db.batches, ...tables], async () => {
    const inFlight = await db.batches.toCollection().first();
    if (inFlight) return inFlight;
    const waiting = await db.outbox.where('batchKey').equals('').sortBy('seq');
    if (!waiting.length) return null;
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
 * The server's answer to a batch: accepted records take the server's version; a conflicted record
 * shows the server's version locally (the server keeps both for a person to resolve).
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
    for (const c of response.conflicts) {
      await tableOf(db, c.entity).put(c.serverRecord as { id: string; version: number });
      await db.conflicts.put(c);
    }
    await db.outbox.bulkDelete(batch.outboxSeqs);
    await db.batches.delete(key);
  });
}

/** A batch the server refused as a whole: its records wait again, re-read fresh after the tester fixes them. */
export async function releaseBatch(key: string, db: FieldDb = fieldDb): Promise<void> {
  await db.transaction('rw', db.outbox, db.batches, async () => {
    await db.outbox.where('batchKey').equals(key).modify({ batchKey: '' });
    await db.batches.delete(key);
  });
}

/** Entities with a local change not yet accepted by the server (waiting or in flight). */
export async function pendingRecordIds(db: FieldDb = fieldDb): Promise<Set<string>> {
  const all = await db.outbox.toArray();
  return new Set(all.map((e) => `${e.entity}:${e.recordId}`));
}
