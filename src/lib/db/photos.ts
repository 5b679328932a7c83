// Photos in table photos of field-db.ts: the camera's blob from the moment it is taken until the
// server has it; then only its description (the blob is dropped to free the phone's storage).
import type { Photo } from '@shared/schemas';
import { fieldDb, type FieldDb, type StoredPhoto } from './field-db';
import { announceSaved, storageMessage, type ItemResult } from './records';
import { tracked } from './writes-in-flight';

const MAX_BYTES = 20 * 1024 * 1024;

export async function addPhoto(
  input: { id: string; sessionId: string; poseId: string | null; caption: string; file: Blob },
  db: FieldDb = fieldDb,
): Promise<ItemResult> {
  if (!input.file.type.startsWith('image/')) {
    return {
      id: input.id,
      ok: false,
      message: `photo: not an image (${input.file.type || 'unknown type'})`,
      fields: [{ field: 'photo', message: 'not an image' }],
    };
  }
  if (input.file.size > MAX_BYTES) {
    return { id: input.id, ok: false, message: 'photo: larger than 20 MB', fields: [{ field: 'photo', message: 'too large' }] };
  }
  const row: StoredPhoto = {
    id: input.id,
    sessionId: input.sessionId,
    poseId: input.poseId,
    caption: input.caption,
    blob: input.file,
    mime: input.file.type,
    bytes: input.file.size,
    takenAt: new Date().toISOString(),
    status: 'pending',
    error: null,
  };
  return tracked(async () => {
    try {
      await db.photos.add(row);
      announceSaved();
      return { id: input.id, ok: true };
    } catch (err) {
      return { id: input.id, ok: false, message: storageMessage(err), fields: [] };
    }
  });
}

export const nextPendingPhotos = (db: FieldDb = fieldDb) => db.photos.where('status').equals('pending').toArray();

export async function markPhotoUploaded(id: string, db: FieldDb = fieldDb) {
  await db.photos.update(id, { status: 'uploaded', blob: null, error: null });
}

/** A photo the server refused for good (wrong type, too large): kept on the phone with the reason. */
export async function markPhotoFailed(id: string, error: string, db: FieldDb = fieldDb) {
  await db.photos.update(id, { status: 'failed', error });
}

export async function notePhotoError(id: string, error: string, db: FieldDb = fieldDb) {
  await db.photos.update(id, { error });
}

/** Photos the server knows (pulled), merged without touching a blob still waiting to upload. */
export async function mergeServerPhotos(list: Photo[], db: FieldDb = fieldDb) {
  for (const p of list) {
    const local = await db.photos.get(p.id);
    if (local?.blob) continue;
    await db.photos.put({
      id: p.id,
      sessionId: p.sessionId,
      poseId: p.poseId,
      caption: p.caption,
      blob: null,
      mime: p.mime,
      bytes: p.bytes,
      takenAt: p.capturedAt ?? new Date().toISOString(),
      status: 'uploaded',
      error: null,
    });
  }
}
