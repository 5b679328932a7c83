// What the photo store holds (the S3 fake under `npm test`), read the way the app reads it.
import { buffer } from 'node:stream/consumers';
import { photoStore, readPhotoFile } from '../../server/storage/photo-store';

/** The bytes stored under a photo's stored name, or null when nothing is stored under it. */
export async function storedPhotoBytes(name: string): Promise<Buffer | null> {
  const file = await readPhotoFile(name);
  return file ? buffer(file.body) : null;
}

/** Every name in the photo store. */
export const storedPhotoNames = () => photoStore().list();
