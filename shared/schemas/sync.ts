// The sync contract between the field client and the server: what a pushed batch carries, what
// the server answers, and what a pull returns. A pushed record's `version` is its base version
// (the server version it was edited from; 1 for a record the server has never seen).
import * as z from 'zod';
import { id, isoDateTime, text } from './common';
import { photo } from './photo';
import { records, syncEntities, type PullKeyOf, type RecordInputOf, type RecordOf, type SyncEntity } from '../records';

export { syncEntities, type SyncEntity };
export const syncEntity = z.enum(syncEntities as [SyncEntity, ...SyncEntity[]]);

/** One change: the whole record as the client has it now. */
export type SyncChange = { [E in SyncEntity]: { entity: E; record: RecordOf<E> } }[SyncEntity];
type SyncChangeInput = { [E in SyncEntity]: { entity: E; record: RecordInputOf<E> } }[SyncEntity];
export const syncChange = z.discriminatedUnion(
  'entity',
  syncEntities.map((entity) => z.object({ entity: z.literal(entity), record: records[entity].schema })) as unknown as [z.ZodObject, z.ZodObject],
) as unknown as z.ZodType<SyncChange, SyncChangeInput>;

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
  idempotencyKey: z
    .string()
    .min(8)
    .max(100)
    .regex(/^[\x21-\x7e]+$/, 'must be printable ASCII'),
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

type Pulled<T> = T & { changeSeq: number };
export type PullResponse = {
  /** Pass back as `since` next time. */
  cursor: number;
  /** More changes wait beyond `cursor`: pull again at once. */
  hasMore: boolean;
  photos: Pulled<z.infer<typeof photo>>[];
  conflicts: SyncConflict[];
} & { [E in SyncEntity as PullKeyOf<E>]: Pulled<RecordOf<E>>[] };

export const pullResponse = z.object({
  cursor: z.number().int(),
  hasMore: z.boolean(),
  ...Object.fromEntries(syncEntities.map((entity) => [records[entity].pullKey, z.array(withSeq(records[entity].schema))])),
  photos: z.array(withSeq(photo)),
  conflicts: z.array(syncConflict),
}) as unknown as z.ZodType<PullResponse>;

export const resolveConflictInput = z.object({ keep: z.enum(['client', 'server']) });
export type ResolveConflictInput = z.infer<typeof resolveConflictInput>;

/** The fields of a photo upload besides the file itself (multipart form fields). */
export const photoUploadFields = z.object({
  id,
  sessionId: id,
  poseId: z
    .union([id, z.literal('')])
    .optional()
    .transform((v) => v || null),
  caption: text(500).default(''),
});
export type PhotoUploadFields = z.input<typeof photoUploadFields>;
