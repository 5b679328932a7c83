// The transaction of a keystroke written on a guess (guessed-write.ts), in plain IndexedDB with no
// Dexie, so that the page and the keystroke worker (guessed-write.worker.ts) run the very same
// code: the reads that check the guess go out with the write, and when they show the slot or its
// outbox entry changed (a push answered, a batch formed, a pull, another tab), the transaction is
// aborted before it commits and nothing of it is kept.
import type { Reading } from '@shared/schemas';

export type Slot = { poseId: string; gaugePointId: string; axis: Reading['axis'] };

/** The slot's reading to edit: the live one, or else a cleared one (pulled from another device). */
export const slotReading = (inSlot: Reading[]): Reading | undefined => inSlot.find((r) => !r.deletedAt) ?? inSlot[0];

/** What a keystroke's guessed write needs, all of it structured-cloneable (it crosses to the worker). */
export interface GuessedPut {
  /** The object stores' names: the readings and the outbox. */
  stores: { readings: string; outbox: string };
  slot: Slot;
  /** The slot's reading as this page last wrote it. */
  guess: Reading;
  record: Reading;
}

/** ok: committed (with strict durability) at `committedAt`; false: the guess was wrong and nothing was written. */
export type GuessedPutResult = { ok: true; committedAt: number } | { ok: false };

/** Now, in milliseconds since the epoch at the clock's full resolution: comparable between a page and its worker. */
export const preciseNow = () => performance.timeOrigin + performance.now();

/**
 * Puts `record` over `guess` if the slot still holds exactly `guess` and its outbox entry still
 * waits, unclaimed and not held; rejects with IndexedDB's error when the transaction fails.
 */
export function putOnGuessIn(idb: IDBDatabase, { stores, slot, guess, record }: GuessedPut): Promise<GuessedPutResult> {
  return new Promise((resolve, reject) => {
    const tx = idb.transaction([stores.readings, stores.outbox], 'readwrite', { durability: 'strict' });
    const readings = tx.objectStore(stores.readings);
    // IndexedDB runs a transaction's requests in the order they are made: the reads see the slot
    // and the outbox as they were before this write, and their answers are in when the write's is.
    const inSlot = readings.index('[poseId+gaugePointId+axis]').getAll([slot.poseId, slot.gaugePointId, slot.axis]);
    const entries = tx.objectStore(stores.outbox).index('[entity+recordId]').getAll(['reading', guess.id]);
    let wrong = false;
    readings.put(record).onsuccess = () => {
      const unclaimed = (entries.result as { batchKey: string; held?: unknown }[]).filter((e) => e.batchKey === '');
      wrong = JSON.stringify(slotReading(inSlot.result as Reading[])) !== JSON.stringify(guess) || !unclaimed.length || unclaimed.some((e) => e.held);
      if (wrong) tx.abort();
    };
    tx.oncomplete = () => resolve({ ok: true, committedAt: preciseNow() });
    tx.onabort = () => (wrong ? resolve({ ok: false }) : reject(tx.error ?? new Error('the write was aborted')));
  });
}
