// One sync run: push the outbox batch by batch, upload waiting photos, then pull everything new.
// Pure over its inputs (a database and a transport), so it runs the same in a test.
import { ApiError } from '@/lib/api-client';
import type { FieldDb, PendingBatch } from '@/lib/db/field-db';
import { completeBatch, formBatch, holdRecords, noteBatchFailure, releaseHolds } from '@/lib/db/outbox';
import { getMeta, setMeta } from '@/lib/db/meta';
import { applyPull } from '@/lib/db/server-changes';
import { markPhotoFailed, markPhotoUploaded, nextPendingPhotos, notePhotoError } from '@/lib/db/photos';
import type { SyncTransport } from '../api/transport';
import { CLIENT_BATCH_CHANGES, type PushResponse } from '@shared/schemas/sync';
import type { FieldError } from '@shared/schemas/common';

export interface Progress {
  photoId: string;
  loaded: number;
  total: number;
}

export type RunResult = { ok: true } | { ok: false; error: ApiError; retryAt?: string | null };

export interface RunOptions {
  /** A person asked for it (Sync now): held records and a batch that is backing off go at once. */
  force?: boolean;
}

/**
 * Push, then upload photos, then pull. A push the server refuses or fails on does not stop the
 * rest: the records it could not take stay on the phone (held, or backing off), and photos and
 * the pull go on, which is safe because a pull never overwrites a record still in the outbox.
 * Only an unreachable server ends the run early.
 */
export async function runSync(
  db: FieldDb,
  transport: SyncTransport,
  onProgress: (p: Progress | null) => void = () => {},
  opts: RunOptions = {},
): Promise<RunResult> {
  try {
    if (opts.force) await releaseHolds(db);
    const pushed = await pushAll(db, transport);
    await uploadPhotos(db, transport, onProgress);
    await pullAll(db, transport);
    await setMeta('lastSyncAt', new Date().toISOString(), db);
    await setMeta('lastError', pushed.ok ? null : { message: pushed.error.message, fields: pushed.error.fields, at: new Date().toISOString() }, db);
    return pushed;
  } catch (err) {
    const error = err instanceof ApiError ? err : new ApiError(0, 'client', (err as Error).message);
    await setMeta('lastError', { message: error.message, fields: error.fields, at: new Date().toISOString() }, db);
    return { ok: false, error };
  } finally {
    onProgress(null);
  }
}

/** No answer from the server, or one saying it is unavailable: the batch waits exactly as it is. */
const unreachable = (e: ApiError) => e.status === 0 || e.status === 502 || e.status === 503 || e.status === 504;

/** The records of a batch that a refusal names (`body.changes.3.record.label`), with what was wrong with each. */
function namedRecords(batch: PendingBatch, error: ApiError) {
  const named = new Map<string, { message: string; fields: FieldError[] }>();
  for (const f of error.fields) {
    const m = /^body\.changes\.(\d+)(\.|$)/.exec(f.field);
    const change = m ? batch.changes[Number(m[1])] : undefined;
    if (!change) continue;
    const key = `${change.entity}:${change.record.id}`;
    const entry = named.get(key) ?? { message: '', fields: [] };
    entry.fields.push(f);
    entry.message = entry.fields.map((x) => x.message).join('; ');
    named.set(key, entry);
  }
  return named;
}

/** A batch waiting before its next try, said in the tester's words (the server's own message in brackets). */
const backingOff = (batch: PendingBatch) =>
  new ApiError(
    0,
    'backing_off',
    `the server could not take ${batch.changes.length === 1 ? 'a record' : `${batch.changes.length} records`} and wrote nothing (${batch.lastError ?? 'no reason given'}); trying again shortly`,
  );

export async function pushAll(db: FieldDb, transport: SyncTransport): Promise<RunResult> {
  let refused: ApiError | null = null;
  let held = 0;
  for (;;) {
    const limit = Math.min(CLIENT_BATCH_CHANGES, (await getMeta('pushLimit', db)) ?? CLIENT_BATCH_CHANGES);
    const batch = await formBatch(limit, db);
    if (!batch) {
      // Everything that could go went: the next failing batch starts from the full size again.
      if (limit < CLIENT_BATCH_CHANGES) await setMeta('pushLimit', null, db);
      return refused ? { ok: false, error: refused } : { ok: true };
    }
    if (batch.retryAt && Date.parse(batch.retryAt) > Date.now()) return { ok: false, error: backingOff(batch), retryAt: batch.retryAt };
    let response: PushResponse;
    try {
      response = await transport.push({ idempotencyKey: batch.key, changes: batch.changes });
    } catch (err) {
      const error = err instanceof ApiError ? err : new ApiError(0, 'client', (err as Error).message);
      if (unreachable(error)) throw error;
      // The server answered and wrote nothing. Records it named are held for the tester; the
      // rest go on in the next batch. Otherwise back off, then narrow the batch down.
      const named = error.status === 400 ? namedRecords(batch, error) : new Map();
      if (named.size) {
        await holdRecords(batch.key, named, db);
        held += named.size;
        refused = new ApiError(
          400,
          'held',
          `the server refused ${held === 1 ? 'a record' : `${held} records`}: held back on this phone until changed (see Sync)`,
        );
        continue;
      }
      const next = await noteBatchFailure(batch.key, error, db);
      if (next.retryAt) return { ok: false, error: backingOff({ ...batch, lastError: error.message }), retryAt: next.retryAt };
      continue;
    }
    await completeBatch(batch.key, response, db);
  }
}

export async function uploadPhotos(db: FieldDb, transport: SyncTransport, onProgress: (p: Progress | null) => void) {
  for (const photo of await nextPendingPhotos(db)) {
    if (!photo.blob) continue;
    const form = new FormData();
    form.set('id', photo.id);
    form.set('sessionId', photo.sessionId);
    if (photo.poseId) form.set('poseId', photo.poseId);
    form.set('caption', photo.caption);
    form.set('photo', photo.blob, `${photo.id}.${photo.mime.split('/')[1] ?? 'jpg'}`);
    try {
      await transport.uploadPhoto(form, (loaded, total) => onProgress({ photoId: photo.id, loaded, total }));
      await markPhotoUploaded(photo.id, db);
    } catch (err) {
      if (err instanceof ApiError && (err.status === 413 || (err.status === 400 && err.fields.some((f) => f.field === 'photo')))) {
        await markPhotoFailed(photo.id, err.message, db);
        continue;
      }
      if (err instanceof ApiError && err.status !== 0) {
        // e.g. its session is not on the server yet: try again next run.
        await notePhotoError(photo.id, err.message, db);
        continue;
      }
      throw err;
    }
  }
}

export async function pullAll(db: FieldDb, transport: SyncTransport) {
  for (let page = 0; page < 1000; page++) {
    const since = await getMeta('pullCursor', db);
    const changes = await transport.pull(since);
    await applyPull(changes, db);
    if (!changes.hasMore) return;
  }
}
