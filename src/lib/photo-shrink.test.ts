// The EXIF carried from a camera's photo to its shrunk copy: found in the original, its
// orientation set upright (the shrunk pixels are drawn upright), placed in the new JPEG, and read
// back by exifr as the server reads it (capture time, GPS). shrinkPhoto itself runs in Chromium
// (tests/browser/photo-shrink.test.ts).
import { describe, expect, it } from 'vitest';
import sharp from 'sharp';
import exifr from 'exifr';
import { exifSegment, uprightExif, withExif } from './photo-shrink';

const cameraJpeg = () =>
  sharp({ create: { width: 40, height: 20, channels: 3, background: '#886644' } })
    .withExif({
      IFD0: { Make: 'Test camera' },
      IFD2: { DateTimeOriginal: '2026:03:14 10:21:05' },
      IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '47/1 30/1 0/1', GPSLongitudeRef: 'E', GPSLongitude: '8/1 15/1 0/1' },
    })
    .withMetadata({ orientation: 6 })
    .jpeg()
    .toBuffer();

describe('EXIF from the camera to the shrunk photo', () => {
  it('finds the Exif segment, and none in a JPEG without one', async () => {
    const segment = exifSegment(new Uint8Array(await cameraJpeg()));
    expect(segment).not.toBeNull();
    expect(String.fromCharCode(...segment!.subarray(4, 8))).toBe('Exif');
    const plain = await sharp({ create: { width: 8, height: 8, channels: 3, background: '#000' } })
      .jpeg()
      .toBuffer();
    expect(exifSegment(new Uint8Array(plain))).toBeNull();
    expect(exifSegment(new Uint8Array([1, 2, 3]))).toBeNull();
  });

  it('carries capture time and GPS into the new JPEG with the orientation upright', async () => {
    const original = await cameraJpeg();
    expect((await exifr.parse(original, { translateValues: false })).Orientation).toBe(6);
    const shrunk = await sharp({ create: { width: 20, height: 40, channels: 3, background: '#886644' } })
      .jpeg()
      .toBuffer();
    const out = Buffer.from(withExif(new Uint8Array(shrunk), uprightExif(exifSegment(new Uint8Array(original))!)));
    const meta = await exifr.parse(out, { gps: true, translateValues: false });
    expect(meta.Orientation).toBe(1);
    expect(meta.latitude).toBeCloseTo(47.5, 6);
    expect(meta.longitude).toBeCloseTo(8.25, 6);
    expect(meta.DateTimeOriginal).toBeInstanceOf(Date);
    // Still a JPEG any decoder reads, at the shrunk size.
    expect(await sharp(out).metadata()).toMatchObject({ format: 'jpeg', width: 20, height: 40, orientation: 1 });
  });
});
