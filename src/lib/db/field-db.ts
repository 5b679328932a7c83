// What the field client keeps in the browser, and where: one IndexedDB database ("twistlog-field")
// opened through Dexie.
//   vehicles, gaugePoints, sessions, poses, readings, retestRequests — records as in shared/records
//     (local edits and pulled server rows alike), keyed by their client-generated UUIDs;
//   outbox   — one entry per record waiting to be pushed (entity + id; the content is read from the
//     record table when a batch is formed), or held back with the server's reason until fixed;
//   batches  — a formed batch with its idempotency key and exact contents, kept until the server
//     answers, so a retry after a crash or a lost answer sends the very same batch;
//   photos   — photo blobs until uploaded, then their server description;
//   conflicts — stale edits the server kept, for a person to resolve;
//   meta     — small values: pull cursor, last sync, last error, display unit.
// Every write transaction uses durability 'strict': Chrome's default ('relaxed') may report
// success before the data is on disk. Keep every earlier version() when the schema changes.
// Dexie's cache of live queries' results is off: a keystroke is written past Dexie
// (guessed-write.ts), and a cached result would not know of it.
import Dexie, { type EntityTable } from 'dexie';
import type { GaugePoint, Pose, Reading, RetestRequest, TestSession, Vehicle } from '@shared/schemas';
import type { FieldError } from '@shared/schemas/common';
import type { PushRequest, SyncConflict, SyncEntity } from '@shared/schemas/sync';
import { records, syncEntities } from '@shared/records';

export interface OutboxEntry {
  seq?: number;
  entity: SyncEntity;
  recordId: string;
  /** '' while waiting; the batch's idempotency key once claimed by a formed batch. */
  batchKey: string;
  queuedAt: string;
  /** Held back from batches: the server refused the record, or failed on it again and again. */
  held?: Hold | null;
}

/** Why a record is held back, in the server's words, naming the field where it can. */
export interface Hold {
  message: string;
  fields: FieldError[];
  at: string;
}

export interface PendingBatch {
  key: string;
  changes: PushRequest['changes'];
  outboxSeqs: number[];
  formedAt: string;
  /** Answers that said the server wrote nothing (a refusal naming no record, or a failure of its own). */
  tries?: number;
  /** Not sent again before this time (backing off). */
  retryAt?: string | null;
  lastError?: string | null;
}

export type PhotoStatus = 'pending' | 'uploaded' | 'failed';

export interface StoredPhoto {
  id: string;
  sessionId: string;
  poseId: string | null;
  caption: string;
  /** Present until the server has the photo. */
  blob: Blob | null;
  mime: string;
  bytes: number;
  takenAt: string;
  status: PhotoStatus;
  error: string | null;
}

export interface MetaEntry {
  key: string;
  value: unknown;
}

/**
 * The record tables' Dexie stores, from the registry's indexes. Dexie upgrades a phone's database
 * only when the version number rises: a changed index needs a new version() with these stores
 * (field-db.test.ts pins version 1's), never an edit of an earlier one.
 */
export function recordStores(entities: readonly SyncEntity[] = syncEntities): Record<string, string> {
  return Object.fromEntries(entities.map((e) => [records[e].dexie.table, ['id', ...records[e].dexie.indexes].join(', ')]));
}

/** The records of version 1; every later version() adds its own. */
export const VERSION_1_RECORDS = ['vehicle', 'gaugePoint', 'testSession', 'pose', 'reading'] as const satisfies SyncEntity[];

export class FieldDb extends Dexie {
  vehicles!: EntityTable<Vehicle, 'id'>;
  gaugePoints!: EntityTable<GaugePoint, 'id'>;
  sessions!: EntityTable<TestSession, 'id'>;
  poses!: EntityTable<Pose, 'id'>;
  readings!: EntityTable<Reading, 'id'>;
  retestRequests!: EntityTable<RetestRequest, 'id'>;
  outbox!: EntityTable<OutboxEntry, 'seq'>;
  batches!: EntityTable<PendingBatch, 'key'>;
  photos!: EntityTable<StoredPhoto, 'id'>;
  conflicts!: EntityTable<SyncConflict, 'id'>;
  meta!: EntityTable<MetaEntry, 'key'>;

  constructor(name = 'twistlog-field') {
    super(name, { chromeTransactionDurability: 'strict', cache: 'disabled' });
    this.version(1).stores({
      ...recordStores(VERSION_1_RECORDS),
      outbox: '++seq, [entity+recordId], batchKey',
      batches: 'key',
      photos: 'id, sessionId, status',
      conflicts: 'id, entityId',
      meta: 'key',
    });
    // Re-test requests, found by their session.
    this.version(2).stores(recordStores(['retestRequest']));
  }
}

export const fieldDb = new FieldDb();

// Another tab still open on an older schema blocks an upgrade: close this connection so the
// other tab's upgrade can go ahead, and ask this tab to reload onto the new version.
fieldDb.on('versionchange', () => {
  fieldDb.close();
  if (typeof window !== 'undefined') window.dispatchEvent(new CustomEvent('twistlog:db-outdated'));
  return false;
});

/** Record tables by sync entity (the table each record of shared/records names). */
export function tableOf(db: FieldDb, entity: SyncEntity) {
  return db.table(records[entity].dexie.table) as EntityTable<{ id: string; version: number }, 'id'>;
}
