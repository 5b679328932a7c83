// The sync contract between the field client and the server: what a pushed batch carries, what
// the server answers, and what a pull returns. A pushed record's `version` is its base version
// (the server version it was edited from; 1 for a record the server has never seen).
import * as z from 'zod';
import { id, isoDateTime, text } from './common';
import { vehicle } from './vehicle';
import { gaugePoint } from './gauge-point';
import { testSession } from './test-session';
import { pose } from './pose';
import { reading } from './reading';
import { photo } from './photo';

export const syncEntities = ['vehicle', 'gaugePoint', 'testSession', 'pose', 'reading'] as const;
export const syncEntity = z.enum(syncEntities);
export type SyncEntity = z.infer<typeof syncEntity>;

/** One change: the whole record as the client has it now. */
export const syncChange = z.discriminatedUnion('entity', [
  z.object({ entity: z.literal('vehicle'), record: vehicle }),
  z.object({ entity: z.literal('gaugePoint'), record: gaugePoint }),
  z.object({ entity: z.literal('testSession'), record: testSession }),
  z.object({ entity: z.literal('pose'), record: pose }),
  z.object({ entity: z.literal('reading'), record: reading }),
]);
export type SyncChange = z.infer<typeof syncChange>;

/**
 * Changes per batch the field client sends: about 280 kB of JSON, fine on a phone's mobile data,
 * and few enough round trips that a session's readings land at over half the speed of a plain
 * INSERT (npm run bench); smaller batches spend more on each request than on the rows.
 */
export const CLIENT_BATCH_CHANGES = 1_000;

/** Most changes in one batch: a whole long session of readings fits (64 points × 3 axes × 50 poses). */
export const MAX_BATCH_CHANGES = 12_000;

export const pushRequest = z.object({
  /** Printable ASCII only: the key is stored as text (a NUL in it could not be). */
  idempotencyKey: z.string().min(8).max(100).regex(/^[\x21-\x7e]+$/, 'must be printable ASCII'),
  changes: z.array(syncChange).min(1).max(MAX_BATCH_CHANGES),
});
export type PushRequest = z.infer<typeof pushRequest>;

export const syncConflict = z.object({
  id,
  entity: syncEntity,
  entityId: id,
  baseVersion: z.number().int(),
  serverVersion: z.number().int(),
  clientRecord: z.record(z.string(), z.unknown()),
  serverRecord: z.record(z.string(), z.unknown()),
  createdAt: isoDateTime,
  resolvedAt: isoDateTime.nullable(),
  resolution: z.enum(['client', 'server']).nullable(),
});
export type SyncConflict = z.infer<typeof syncConflict>;

export const pushResponse = z.object({
  /** Records written, with the version the server now holds. */
  accepted: z.array(z.object({ entity: syncEntity, id, version: z.number().int() })),
  /** Stale edits: kept on the server beside the server's version, for a person to resolve. */
  conflicts: z.array(syncConflict),
});
export type PushResponse = z.infer<typeof pushResponse>;

export const pullQuery = z.object({
  since: z.coerce.number().int().min(0).default(0),
  limit: z.coerce.number().int().min(1).max(5_000).default(2_000),
});

const withSeq = <T extends z.ZodTypeAny>(schema: T) => z.intersection(schema, z.object({ changeSeq: z.number().int() }));

export const pullResponse = z.object({
  /** Pass back as `since` next time. */
  cursor: z.number().int(),
  /** More changes wait beyond `cursor`: pull again at once. */
  hasMore: z.boolean(),
  vehicles: z.array(withSeq(vehicle)),
  gaugePoints: z.array(withSeq(gaugePoint)),
  testSessions: z.array(withSeq(testSession)),
  poses: z.array(withSeq(pose)),
  readings: z.array(withSeq(reading)),
  photos: z.array(withSeq(photo)),
  conflicts: z.array(syncConflict),
});
export type PullResponse = z.infer<typeof pullResponse>;

export const resolveConflictInput = z.object({ keep: z.enum(['client', 'server']) });
export type ResolveConflictInput = z.infer<typeof resolveConflictInput>;

/** The fields of a photo upload besides the file itself (multipart form fields). */
export const photoUploadFields = z.object({
  id,
  sessionId: id,
  poseId: z.union([id, z.literal('')]).optional().transform((v) => v || null),
  caption: text(500).default(''),
});
export type PhotoUploadFields = z.input<typeof photoUploadFields>;
