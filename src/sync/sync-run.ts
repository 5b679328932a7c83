// One sync run: push the outbox batch by batch, upload waiting photos, then pull everything new.
// Pure over its inputs (a database and a transport), so it runs the same in a test.
import { ApiError } from '@/lib/api-client';
import type { FieldDb } from '@/lib/db/field-db';
import { completeBatch, formBatch, releaseBatch } from '@/lib/db/outbox';
import { getMeta, setMeta } from '@/lib/db/meta';
import { applyPull } from '@/lib/db/server-changes';
import { markPhotoFailed, markPhotoUploaded, nextPendingPhotos, notePhotoError } from '@/lib/db/photos';
import type { SyncTransport } from './transport';
import { CLIENT_BATCH_CHANGES } from '@shared/schemas/sync';


export interface Progress {
  photoId: string;
  loaded: number;
  total: number;
}

export type RunResult = { ok: true } | { ok: false; error: ApiError };

export async function runSync(db: FieldDb, transport: SyncTransport, onProgress: (p: Progress | null) => void = () => {}): Promise<RunResult> {
  try {
    await pushAll(db, transport);
    await uploadPhotos(db, transport, onProgress);
    await pullAll(db, transport);
    await setMeta('lastSyncAt', new Date().toISOString(), db);
    await setMeta('lastError', null, db);
    return { ok: true };
  } catch (err) {
    const error = err instanceof ApiError ? err : new ApiError(0, 'client', (err as Error).message);
    await setMeta('lastError', { message: error.message, fields: error.fields, at: new Date().toISOString() }, db);
    return { ok: false, error };
  } finally {
    onProgress(null);
  }
}

export async function pushAll(db: FieldDb, transport: SyncTransport) {
  for (;;) {
    const batch = await formBatch(CLIENT_BATCH_CHANGES, db);
    if (!batch) return;
    try {
      const response = await transport.push({ idempotencyKey: batch.key, changes: batch.changes });
      await completeBatch(batch.key, response, db);
    } catch (err) {
      // Refused as a whole (bad record): free the records so a fix is sent fresh; a network
      // failure keeps the batch exactly as it is for the retry.
      if (err instanceof ApiError && err.status === 400) await releaseBatch(batch.key, db);
      throw err;
    }
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
