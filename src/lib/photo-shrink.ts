// Photos are shrunk on the phone before they are stored and uploaded: a camera's 12–48 MP original
// becomes a JPEG of at most 3,000 px on its long edge (more than the server keeps, 2,560 px),
// which saves the tester's storage and data plan and the server's memory. The camera's EXIF
// block (capture time, and GPS where the workshop keeps it) is carried over for the server to
// read, with its orientation set to "upright", since the pixels drawn are upright already.
// A file the browser cannot decode is left as it is: the server says what is wrong with it.

/** The long edge of a shrunk photo, in pixels. */
export const SHRINK_LONG_EDGE = 3000;
const JPEG_QUALITY = 0.88;

export async function shrinkPhoto(file: Blob, longEdge = SHRINK_LONG_EDGE): Promise<Blob> {
  let bitmap: ImageBitmap;
  try {
    bitmap = await createImageBitmap(file, { imageOrientation: 'from-image' });
  } catch {
    return file;
  }
  const scale = longEdge / Math.max(bitmap.width, bitmap.height);
  if (scale >= 1) {
    bitmap.close();
    return file;
  }
  const width = Math.round(bitmap.width * scale);
  const height = Math.round(bitmap.height * scale);
  const canvas = new OffscreenCanvas(width, height);
  const context = canvas.getContext('2d');
  if (!context) {
    bitmap.close();
    return file;
  }
  context.imageSmoothingQuality = 'high';
  context.drawImage(bitmap, 0, 0, width, height);
  bitmap.close();
  const shrunk = new Uint8Array(await (await canvas.convertToBlob({ type: 'image/jpeg', quality: JPEG_QUALITY })).arrayBuffer());
  const exif = exifSegment(new Uint8Array(await file.arrayBuffer()));
  return new Blob([exif ? withExif(shrunk, uprightExif(exif)) : shrunk], { type: 'image/jpeg' });
}

const SOI = 0xd8;
const SOS = 0xda;
const APP1 = 0xe1;

/** The APP1 Exif segment of a JPEG (marker, length and payload), or null. */
export function exifSegment(jpeg: Uint8Array): Uint8Array | null {
  if (jpeg[0] !== 0xff || jpeg[1] !== SOI) return null;
  let at = 2;
  while (at + 4 <= jpeg.length && jpeg[at] === 0xff) {
    const marker = jpeg[at + 1];
    if (marker === SOS) return null;
    const length = (jpeg[at + 2] << 8) | jpeg[at + 3];
    const isExif = marker === APP1 && String.fromCharCode(...jpeg.subarray(at + 4, at + 8)) === 'Exif';
    if (isExif) return jpeg.slice(at, at + 2 + length);
    at += 2 + length;
  }
  return null;
}

const ORIENTATION_TAG = 0x0112;

/** A copy of an Exif segment with its orientation (IFD0 tag 0x0112) set to 1, upright. */
export function uprightExif(segment: Uint8Array): Uint8Array {
  const out = segment.slice();
  const tiff = 10; // marker (2) + length (2) + "Exif\0\0" (6)
  if (out.length < tiff + 8) return out;
  const view = new DataView(out.buffer, out.byteOffset, out.byteLength);
  const little = view.getUint16(tiff) === 0x4949;
  const ifd0 = tiff + view.getUint32(tiff + 4, little);
  if (ifd0 + 2 > out.length) return out;
  const entries = view.getUint16(ifd0, little);
  for (let i = 0; i < entries; i++) {
    const entry = ifd0 + 2 + i * 12;
    if (entry + 12 > out.length) break;
    if (view.getUint16(entry, little) === ORIENTATION_TAG) view.setUint16(entry + 8, 1, little);
  }
  return out;
}

/** The JPEG with an Exif segment placed right after its start marker. */
export function withExif(jpeg: Uint8Array, segment: Uint8Array): Uint8Array<ArrayBuffer> {
  const out = new Uint8Array(jpeg.length + segment.length);
  out.set(jpeg.subarray(0, 2), 0);
  out.set(segment, 2);
  out.set(jpeg.subarray(2), 2 + segment.length);
  return out;
}
