// Where photo files live: the re-encoded copy and its thumbnail, under names the server makes up
// (a random UUID), so a client's file name never reaches storage. Two drivers behind one small
// interface: S3-compatible object storage (any number of app instances share it; `npm start` and
// `npm test` run a local fake) when S3_BUCKET is set, else a folder on this machine (PHOTO_DIR),
// which suits one instance in development. The settings are read from the environment when the
// store is first used (server/config.ts validates them at start-up).
import type { Readable } from 'node:stream';
import { randomUUID } from 'node:crypto';
import { diskStore } from './disk-store';
import { s3Store, s3SettingsFrom } from './s3-store';

export interface StoredObject {
  body: Readable;
  bytes: number;
}

export interface PhotoStore {
  /** Where the files go, for logs and the readiness answer ("s3://bucket", "/path"). */
  readonly where: string;
  put(name: string, data: Buffer): Promise<void>;
  /** The stored file, or null when no such name is stored. */
  get(name: string): Promise<StoredObject | null>;
  remove(names: string[]): Promise<void>;
  /** Every stored name (tests and housekeeping). */
  list(): Promise<string[]>;
  /** Throws when the storage cannot be reached (the readiness check). */
  check(): Promise<void>;
}

let current: { key: string; store: PhotoStore } | undefined;

/** The store the environment names; the same object for as long as the settings stay the same. */
export function photoStore(env: NodeJS.ProcessEnv = process.env): PhotoStore {
  const s3 = s3SettingsFrom(env);
  const key = s3 ? JSON.stringify(s3) : `disk:${env.PHOTO_DIR ?? ''}`;
  if (current?.key !== key) current = { key, store: s3 ? s3Store(s3) : diskStore(env.PHOTO_DIR ?? '.data/photos') };
  return current.store;
}

export interface StoredPhotoFiles {
  storedName: string;
  thumbName: string;
}

const NAME = /^[0-9a-f-]{36}(\.thumb)?\.jpg$/;

/** Only names this module made are accepted: nothing else can be asked of the storage. */
export function checkedName(name: string): string {
  if (!NAME.test(name)) throw new Error(`not a stored photo name: ${name}`);
  return name;
}

/** Stores a photo and its thumbnail under fresh names; a failure leaves neither behind. */
export async function writePhotoFiles(photo: Buffer, thumb: Buffer): Promise<StoredPhotoFiles> {
  const base = randomUUID();
  const files = { storedName: `${base}.jpg`, thumbName: `${base}.thumb.jpg` };
  const store = photoStore();
  try {
    await store.put(files.storedName, photo);
    await store.put(files.thumbName, thumb);
  } catch (err) {
    await store.remove([files.storedName, files.thumbName]).catch(() => {});
    throw err;
  }
  return files;
}

export function removePhotoFiles(files: StoredPhotoFiles): Promise<void> {
  return photoStore().remove([files.storedName, files.thumbName]);
}

export function readPhotoFile(name: string): Promise<StoredObject | null> {
  return photoStore().get(checkedName(name));
}
