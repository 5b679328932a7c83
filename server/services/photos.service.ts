// Photos: checked, read for capture time and GPS (exifr; GPS kept only where the workshop says so),
// re-encoded without any metadata and thumbnailed (sharp), then stored under server-made names and
// recorded against the session.
//
// Memory: sharp decodes the whole image, and a 48 MP progressive JPEG takes a few hundred MB while
// it does. Decodes therefore run one at a time per process (a queue, with libvips' own thread pool
// and cache kept small), a short queue beyond which the upload is asked to come back later, at most
// two uploads in flight per person (routes/photos.ts), and a storage ceiling per workshop. Phones
// shrink photos before storing them (src/lib/photo-shrink.ts), so large originals are the exception.
import pLimit from 'p-limit';
import type { Metadata as ImageMetadata } from 'sharp';
import { QueryTypes, UniqueConstraintError } from 'sequelize';
import { AppError, Conflict, Invalid, NotFound, Unavailable } from '../http/errors';
import { PhotoModel, PoseModel, TeamModel, TestSessionModel } from '../models';
import { readPhotoFile, removePhotoFiles, writePhotoFiles, type StoredObject } from '../storage/photo-store';
import type { AuthContext } from '../auth/context';
import { withTeamChanges } from './team-changes';
import type { Photo } from '../../shared/schemas';

/** Largest upload: a full-resolution phone photo is 3–12 MB (common practice). */
export const MAX_PHOTO_BYTES = 20 * 1024 * 1024;
/** Pixel ceiling against decompression bombs: 50 MP covers the 48 MP phone sensors (from memory). */
export const MAX_PHOTO_PIXELS = 50_000_000;
/** The stored copy's longest side; plenty to read a gauge mark, far smaller than the original. */
const STORED_MAX_SIDE = 2560;
const THUMB_MAX_SIDE = 320;

/** The bounds (the README's security paragraph states them). */
export const photoLimits = {
  /** Decodes at once per process, and uploads that may wait for one. */
  concurrentDecodes: 1,
  queuedDecodes: 4,
  /** Uploads one person may have on their way at once (counted in PostgreSQL, throttle.ts). */
  inFlightPerPerson: 2,
  /** Stored photos per workshop (re-encoded copies), in MB. */
  storagePerWorkshopMb: 5 * 1024,
  /** What four simultaneous 48 MP uploads may add to a server's resident memory (tests/api/photo-memory.test.ts). */
  memoryBudgetMb: 400,
} as const;

// sharp and exifr are loaded with the first upload, not at start-up. One libvips worker thread per
// image and no operation cache: memory follows the decode queue.
let imaging: Promise<{ sharp: typeof import('sharp').default; exifr: typeof import('exifr').default }> | undefined;
const loadImaging = () =>
  (imaging ??= Promise.all([import('sharp'), import('exifr')]).then(([s, e]) => {
    s.default.concurrency(1);
    s.default.cache(false);
    return { sharp: s.default, exifr: e.default };
  }));
const decodeQueue = pLimit(photoLimits.concurrentDecodes);

type ImageKind = 'jpeg' | 'png' | 'webp';

/** What the first bytes say the file is; the extension and the client's MIME type are not trusted. */
export function sniffImage(buf: Buffer): ImageKind | null {
  if (buf.length >= 3 && buf[0] === 0xff && buf[1] === 0xd8 && buf[2] === 0xff) return 'jpeg';
  if (buf.length >= 8 && buf.subarray(0, 8).equals(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]))) return 'png';
  if (buf.length >= 12 && buf.toString('latin1', 0, 4) === 'RIFF' && buf.toString('latin1', 8, 12) === 'WEBP') return 'webp';
  return null;
}

interface Metadata {
  capturedAt: Date | null;
  gpsLat: number | null;
  gpsLon: number | null;
}

async function readMetadata(buf: Buffer): Promise<Metadata> {
  try {
    const { exifr } = await loadImaging();
    const m = await exifr.parse(buf, { gps: true, exif: true, tiff: true, xmp: false, icc: false, iptc: false });
    const when = m?.DateTimeOriginal ?? m?.CreateDate;
    const lat = typeof m?.latitude === 'number' && Number.isFinite(m.latitude) ? m.latitude : null;
    const lon = typeof m?.longitude === 'number' && Number.isFinite(m.longitude) ? m.longitude : null;
    return { capturedAt: when instanceof Date && !Number.isNaN(when.getTime()) ? when : null, gpsLat: lat, gpsLon: lon };
  } catch {
    // Unreadable EXIF is not a reason to lose the photo.
    return { capturedAt: null, gpsLat: null, gpsLon: null };
  }
}

function tooManyPixels(size: string | null) {
  const message = `${size ? `${size} is ` : ''}more than ${MAX_PHOTO_PIXELS / 1e6} megapixels`;
  return new Invalid(`photo: ${message}`, [{ field: 'photo', message }]);
}

async function reencode(buf: Buffer) {
  const { sharp } = await loadImaging();
  const input = () => sharp(buf, { limitInputPixels: MAX_PHOTO_PIXELS, failOn: 'error' });
  let meta: ImageMetadata;
  try {
    meta = await input().metadata();
  } catch (err) {
    if (/pixel limit/i.test(String((err as Error).message))) throw tooManyPixels(null);
    throw new Invalid('photo: the file could not be read as an image', [{ field: 'photo', message: 'not a readable image' }]);
  }
  const pixels = (meta.width ?? 0) * (meta.height ?? 0);
  if (pixels > MAX_PHOTO_PIXELS) throw tooManyPixels(`${meta.width}×${meta.height}`);
  try {
    // rotate() applies the EXIF orientation; no withMetadata/withExif, so nothing (GPS included) is copied.
    const stored = await input()
      .rotate()
      .resize({ width: STORED_MAX_SIDE, height: STORED_MAX_SIDE, fit: 'inside', withoutEnlargement: true })
      .jpeg({ quality: 85 })
      .toBuffer({ resolveWithObject: true });
    const thumb = await sharp(stored.data)
      .resize({ width: THUMB_MAX_SIDE, height: THUMB_MAX_SIDE, fit: 'inside', withoutEnlargement: true })
      .jpeg({ quality: 75 })
      .toBuffer();
    return { stored, thumb };
  } catch (err) {
    if (/pixel limit/i.test(String((err as Error).message))) throw tooManyPixels(null);
    throw new Invalid('photo: the image data is damaged', [{ field: 'photo', message: 'the image data is damaged' }]);
  }
}

const iso = (d: Date | string | null | undefined) => (d ? new Date(d).toISOString() : null);

export const photoOut = (p: PhotoModel): Photo & { changeSeq: number } => ({
  id: p.id,
  version: p.version,
  deletedAt: iso(p.deletedAt),
  sessionId: p.sessionId,
  poseId: p.poseId,
  caption: p.caption,
  mime: p.mime,
  width: p.width,
  height: p.height,
  bytes: p.bytes,
  capturedAt: iso(p.capturedAt),
  hasGps: p.gpsLat != null && p.gpsLon != null,
  changeSeq: p.changeSeq,
});

/** A raw photos row (as a pull reads it) → the photo record. */
/**
 * Stores one uploaded photo. The client's id makes a retried upload (lost answer) return the
 * photo already stored instead of storing it twice.
 */
export async function savePhoto(
  auth: Pick<AuthContext, 'teamId' | 'userId'>,
  fields: { id: string; sessionId: string; poseId: string | null; caption: string },
  file: Buffer | undefined,
) {
  if (!file) throw new Invalid('photo: no file was sent', [{ field: 'photo', message: 'required' }]);
  const existing = await PhotoModel.findByPk(fields.id);
  if (existing) {
    if (existing.teamId !== auth.teamId) throw new Conflict('that photo id is taken');
    return { photo: photoOut(existing), created: false };
  }
  const kind = sniffImage(file);
  if (!kind) {
    throw new Invalid('photo: not a JPEG, PNG or WebP image (checked by its first bytes)', [
      { field: 'photo', message: 'unsupported file type: send a JPEG, PNG or WebP photo' },
    ]);
  }
  const session = await TestSessionModel.findOne({ where: { id: fields.sessionId, teamId: auth.teamId } });
  if (!session) throw new Invalid('body.sessionId: session not found', [{ field: 'body.sessionId', message: 'no such session in your team' }]);
  if (fields.poseId) {
    const pose = await PoseModel.findOne({ where: { id: fields.poseId, teamId: auth.teamId, sessionId: fields.sessionId } });
    if (!pose) throw new Invalid('body.poseId: pose not found in that session', [{ field: 'body.poseId', message: 'no such pose in that session' }]);
  }
  const team = await TeamModel.findByPk(auth.teamId, { attributes: ['photoGps'] });
  await checkStorage(auth.teamId, file.length);
  if (decodeQueue.pendingCount >= photoLimits.queuedDecodes) {
    throw new Unavailable('the server is busy with other photos: the phone sends this one again shortly', 15);
  }
  // Metadata first: the re-encoded copy no longer has it. GPS stays only if the workshop keeps it.
  const read = await readMetadata(file);
  const meta = team?.photoGps === 'keep' ? read : { ...read, gpsLat: null, gpsLon: null };
  const { stored, thumb } = await decodeQueue(() => reencode(file));
  const files = await writePhotoFiles(stored.data, thumb);
  try {
    const row = await withTeamChanges(auth.teamId, (transaction) =>
      PhotoModel.create(
        {
          id: fields.id,
          teamId: auth.teamId,
          sessionId: fields.sessionId,
          poseId: fields.poseId,
          caption: fields.caption,
          ...files,
          mime: 'image/jpeg',
          width: stored.info.width,
          height: stored.info.height,
          bytes: stored.data.length,
          ...meta,
          createdBy: auth.userId,
        },
        { transaction },
      ),
    );
    return { photo: photoOut(row), created: true };
  } catch (err) {
    await removePhotoFiles(files);
    // The same photo sent twice at once: the first one stored wins, the second answers with it.
    const winner = err instanceof UniqueConstraintError ? await PhotoModel.findOne({ where: { id: fields.id, teamId: auth.teamId } }) : null;
    if (winner) return { photo: photoOut(winner), created: false };
    throw err;
  }
}

/** A workshop's stored photos have a ceiling: past it the upload waits on the phone (507), nothing is lost. */
async function checkStorage(teamId: string, incoming: number) {
  const [{ used }] = await PhotoModel.sequelize!.query<{ used: number }>(
    'SELECT coalesce(sum(bytes), 0)::float8 AS used FROM photos WHERE team_id = $1 AND deleted_at IS NULL',
    { bind: [teamId], type: QueryTypes.SELECT },
  );
  const limit = photoLimits.storagePerWorkshopMb * 1024 * 1024;
  if (used + incoming > limit) {
    throw new AppError(
      507,
      'storage_full',
      `the workshop's photo storage is full (${Math.round(used / 1024 / 1024)} of ${photoLimits.storagePerWorkshopMb} MB): the photo stays on the phone until there is room`,
    );
  }
}

/** The stored file of a team's photo (full size or thumbnail), read from the photo store. */
export async function photoFile(auth: AuthContext, id: string, size: 'full' | 'thumb'): Promise<StoredObject> {
  const p = await PhotoModel.findOne({ where: { id, teamId: auth.teamId, deletedAt: null }, attributes: ['storedName', 'thumbName'] });
  if (!p) throw new NotFound('photo');
  const file = await readPhotoFile(size === 'thumb' ? p.thumbName : p.storedName);
  if (!file) throw new NotFound('photo file');
  return file;
}

export const tooLarge = () =>
  new AppError(413, 'too_large', `photo is larger than ${MAX_PHOTO_BYTES / 1024 / 1024} MB`, [{ field: 'photo', message: 'file too large' }]);
