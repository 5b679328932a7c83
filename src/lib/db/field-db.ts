// What the field client keeps in the browser, and where: one IndexedDB database ("twistlog-field")
// opened through Dexie.
//   vehicles, gaugePoints, sessions, poses, readings — records as in shared/schemas (local edits
//     and pulled server rows alike), keyed by their client-generated UUIDs;
//   outbox   — one entry per record waiting to be pushed (entity + id; the content is read from the
//     record table when a batch is formed), or held back with the server's reason until fixed;
//   batches  — a formed batch with its idempotency key and exact contents, kept until the server
//     answers, so a retry after a crash or a lost answer sends the very same batch;
//   photos   — photo blobs until uploaded, then their server description;
//   conflicts — stale edits the server kept, for a person to resolve;
//   meta     — small values: pull cursor, last sync, last error, display unit.
// Every write transaction uses durability 'strict': Chrome's default ('relaxed') may report
// success before the data is on disk. Keep every earlier version() when the schema changes.
import Dexie, { type EntityTable } from 'dexie';
import type { GaugePoint, Pose, Reading, TestSession, Vehicle } from '@shared/schemas';
import type { FieldError } from '@shared/schemas/common';
import type { PushRequest, SyncConflict, SyncEntity } from '@shared/schemas/sync';

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

export class FieldDb extends Dexie {
  vehicles!: EntityTable<Vehicle, 'id'>;
  gaugePoints!: EntityTable<GaugePoint, 'id'>;
  sessions!: EntityTable<TestSession, 'id'>;
  poses!: EntityTable<Pose, 'id'>;
  readings!: EntityTable<Reading, 'id'>;
  outbox!: EntityTable<OutboxEntry, 'seq'>;
  batches!: EntityTable<PendingBatch, 'key'>;
  photos!: EntityTable<StoredPhoto, 'id'>;
  conflicts!: EntityTable<SyncConflict, 'id'>;
  meta!: EntityTable<MetaEntry, 'key'>;

  constructor(name = 'twistlog-field') {
    super(name, { chromeTransactionDurability: 'strict' });
    this.version(1).stores({
      vehicles: 'id',
      gaugePoints: 'id, vehicleId',
      sessions: 'id, vehicleId, testedOn',
      poses: 'id, sessionId',
      readings: 'id, poseId, [poseId+gaugePointId+axis]',
      outbox: '++seq, [entity+recordId], batchKey',
      batches: 'key',
      photos: 'id, sessionId, status',
      conflicts: 'id, entityId',
      meta: 'key',
    });
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

/** Record tables by sync entity. */
export function tableOf(db: FieldDb, entity: SyncEntity) {
  return {
    vehicle: db.vehicles,
    gaugePoint: db.gaugePoints,
    testSession: db.sessions,
    pose: db.poses,
    reading: db.readings,
  }[entity] as EntityTable<{ id: string; version: number }, 'id'>;
}
