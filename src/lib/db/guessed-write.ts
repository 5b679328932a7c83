// A keystroke in a reading's slot, written straight through IndexedDB (not through Dexie) when
// records.ts has a guess of what the slot holds. The write is handed over in the input's own
// handler, before the screen renders the typed digit, to the keystroke worker
// (guessed-write.worker.ts), which reads, checks the guess and commits on its own thread: the
// commit no longer waits until the page's main thread is free to read IndexedDB's answers. Where
// there is no worker (not started yet, none in this browser, or it failed), the same transaction
// (guessed-put.ts) runs here in the page. Dexie would open it a microtask later and, on commit, run
// every live query the write touches before the code that waits for the commit; here the commit is
// announced first and the live queries are told in a later task.
import Dexie, { cmp, RangeSet, type DBCoreIndex, type ObservabilitySet } from 'dexie';
import type { Reading } from '@shared/schemas';
import type { FieldDb } from './field-db';
import { putOnGuessIn, type GuessedPut, type GuessedPutResult, type Slot } from './guessed-put';
import type { WorkerWrite } from './guessed-write.worker';

export { slotReading, type Slot } from './guessed-put';

/**
 * Puts `record` over `guess` (the slot's reading as this page last wrote it) if the slot still
 * holds exactly `guess` and its outbox entry still waits, unclaimed and not held. Resolves
 * { ok: true, committedAt } once committed with strict durability, { ok: false } when the guess was
 * wrong (nothing written), and null when the store is not open here (the caller writes through
 * Dexie, which opens it).
 */
export function putOnGuess(db: FieldDb, slot: Slot, guess: Reading, record: Reading): Promise<GuessedPutResult | null> {
  const idb = db.isOpen() ? db.backendDB() : null;
  if (!idb) return Promise.resolve(null);
  const put: GuessedPut = { stores: { readings: db.readings.name, outbox: db.outbox.name }, slot, guess, record };
  // Either way the requests are made now, in the caller's task: in the worker, or else here.
  const w = keystrokeWorker(idb);
  const done = w ? inWorker(w, idb, put).then((r) => r ?? putOnGuessIn(idb, put)) : putOnGuessIn(idb, put);
  return done.then((result) => {
    if (result.ok) setTimeout(() => tellLiveQueries(db, guess, record));
    return result;
  });
}

type Waiting = { resolve: (r: GuessedPutResult | null) => void; reject: (e: unknown) => void };

// The page's one keystroke worker, started with the page's first keystroke write (or its first
// guessed one); writes sent before it has loaded wait in its queue, in order. Never again once it
// failed.
let worker: Worker | null = null;
let workerFailed = false;
let nextWrite = 0;
const waiting = new Map<number, Waiting>();

/** Starts the keystroke worker and its connection to the store, ahead of the next keystroke. */
export function startKeystrokeWorker(db: FieldDb) {
  if (db.isOpen()) keystrokeWorker(db.backendDB());
}

/** The write done by the keystroke worker; null when it has no connection (the page then writes). */
function inWorker(w: Worker, idb: IDBDatabase, put: GuessedPut): Promise<GuessedPutResult | null> {
  const n = ++nextWrite;
  return new Promise((resolve, reject) => {
    waiting.set(n, { resolve, reject });
    w.postMessage({ n, name: idb.name, version: idb.version, put } satisfies WorkerWrite);
  });
}

/** The keystroke worker, started here if need be; null where there is none (Node, an old browser) or it failed. */
function keystrokeWorker(idb: IDBDatabase): Worker | null {
  if (worker || workerFailed || typeof Worker === 'undefined') return worker;
  try {
    worker = new Worker(new URL('./guessed-write.worker.ts', import.meta.url), { type: 'module', name: 'twistlog-keystrokes' });
  } catch {
    workerFailed = true;
    return null;
  }
  worker.onmessage = ({ data }: MessageEvent<{ n: number; result?: GuessedPutResult | null; error?: { name: string; message: string } }>) => {
    const w = waiting.get(data.n);
    waiting.delete(data.n);
    if (data.error) w?.reject(new DOMException(data.error.message, data.error.name));
    else w?.resolve(data.result ?? null);
  };
  // The worker could not load (offline before it was cached) or failed: writes that waited on it
  // are written again from what is stored (the caller's way when a guess is wrong), and the page
  // writes every later keystroke itself.
  worker.onerror = worker.onmessageerror = () => {
    workerFailed = true;
    worker?.terminate();
    worker = null;
    for (const w of waiting.values()) w.resolve({ ok: false });
    waiting.clear();
  };
  worker.postMessage({ open: { name: idb.name, version: idb.version } });
  return worker;
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
