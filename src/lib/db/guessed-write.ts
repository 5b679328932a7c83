// A keystroke in a reading's slot, written straight through IndexedDB (not through Dexie) when
// records.ts has a guess of what the slot holds. The transaction is opened in the input's own
// handler, before the screen renders the typed digit, so its requests reach IndexedDB at once;
// Dexie would open it a microtask later and, on commit, run every live query the write touches
// before the code that waits for the commit. Here the commit is announced first and the live
// queries are told in a later task. The guess is checked in the same transaction: the reads go out
// with the write, and when they show the slot or its outbox entry changed (a push answered, a
// batch formed, a pull, another tab), the transaction is aborted and nothing of it is kept.
import Dexie, { cmp, RangeSet, type DBCoreIndex, type ObservabilitySet } from 'dexie';
import type { Reading } from '@shared/schemas';
import type { FieldDb, OutboxEntry } from './field-db';

export type Slot = { poseId: string; gaugePointId: string; axis: Reading['axis'] };

/** The slot's reading to edit: the live one, or else a cleared one (pulled from another device). */
export const slotReading = (inSlot: Reading[]): Reading | undefined => inSlot.find((r) => !r.deletedAt) ?? inSlot[0];

/**
 * Puts `record` over `guess` (the slot's reading as this page last wrote it) if the slot still
 * holds exactly `guess` and its outbox entry still waits, unclaimed and not held. Resolves true
 * once committed with strict durability, false when the guess was wrong (nothing written), and
 * null when the store is not open here (the caller writes through Dexie, which opens it).
 */
export function putOnGuess(db: FieldDb, slot: Slot, guess: Reading, record: Reading): Promise<boolean | null> {
  const idb = db.isOpen() ? db.backendDB() : null;
  if (!idb) return Promise.resolve(null);
  return new Promise((resolve, reject) => {
    const tx = idb.transaction([db.readings.name, db.outbox.name], 'readwrite', { durability: 'strict' });
    const readings = tx.objectStore(db.readings.name);
    // IndexedDB runs a transaction's requests in the order they are made: the reads see the slot
    // and the outbox as they were before this write, and their answers are in when the write's is.
    const inSlot = readings.index('[poseId+gaugePointId+axis]').getAll([slot.poseId, slot.gaugePointId, slot.axis]);
    const entries = tx.objectStore(db.outbox.name).index('[entity+recordId]').getAll(['reading', guess.id]);
    let wrong = false;
    readings.put(record).onsuccess = () => {
      const unclaimed = (entries.result as OutboxEntry[]).filter((e) => e.batchKey === '');
      wrong = JSON.stringify(slotReading(inSlot.result as Reading[])) !== JSON.stringify(guess) || !unclaimed.length || unclaimed.some((e) => e.held);
      if (wrong) tx.abort();
    };
    tx.oncomplete = () => {
      resolve(true);
      setTimeout(() => tellLiveQueries(db, guess, record));
    };
    tx.onabort = () => (wrong ? resolve(false) : reject(tx.error ?? new Error('the write was aborted')));
  });
}

/**
 * What Dexie would tell its live queries (in this tab and the others) after this put: the reading's
 * key, and each index whose key changed (the stored reading was the guess, so its old keys are known).
 */
function tellLiveQueries(db: FieldDb, before: Reading, after: Reading) {
  const table = db.core.table(db.readings.name);
  const part = (index: DBCoreIndex) => `idb://${db.name}/${db.readings.name}/${index.name ?? ''}`;
  const parts: ObservabilitySet = { [part(table.schema.primaryKey)]: new RangeSet().addKey(after.id) };
  for (const index of table.schema.indexes) {
    const [old, now] = [index.extractKey?.(before), index.extractKey?.(after)];
    if (cmp(old, now) !== 0) parts[part(index)] = new RangeSet().addKeys([old, now].filter((k) => k != null));
  }
  Dexie.on('storagemutated').fire(parts);
}
