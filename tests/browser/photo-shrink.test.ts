// Photos shrink on the phone before they are stored and uploaded (src/lib/photo-shrink.ts), run in
// Chromium as the field app runs it: a 12 MP camera photo turned sideways by its EXIF orientation
// comes out upright, 3,000 px on its long edge, with the capture time and GPS still readable; a
// small photo and a file that is not an image are left as they are.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import path from 'node:path';
import sharp from 'sharp';
import exifr from 'exifr';
import { build, type Rollup } from 'vite';
import type { Browser, Page } from 'playwright-core';
import { launchBrowser } from '../support/browser';
import { repoRoot } from '../support/test-app';

let browser: Browser;
let page: Page;

beforeAll(async () => {
  // The module as the app bundles it, loaded into a blank page.
  const out = (await build({
    configFile: false,
    logLevel: 'silent',
    build: { write: false, minify: false, lib: { entry: path.join(repoRoot, 'src/lib/photo-shrink.ts'), formats: ['iife'], name: 'PhotoShrink' } },
  })) as Rollup.RollupOutput[];
  const code = out[0].output[0].code;
  browser = await launchBrowser();
  page = await browser.newPage();
  await page.setContent('<!doctype html><title>shrink</title>');
  await page.addScriptTag({ content: code });
});
afterAll(async () => browser?.close());

/** Runs shrinkPhoto in the page on these bytes and returns what it made. */
async function shrinkInBrowser(bytes: Buffer, type: string): Promise<Buffer> {
  const b64 = await page.evaluate(
    async ({ data, type }) => {
      const input = Uint8Array.from(atob(data), (c) => c.charCodeAt(0));
      const shrink = (window as unknown as { PhotoShrink: { shrinkPhoto(b: Blob): Promise<Blob> } }).PhotoShrink.shrinkPhoto;
      const out = new Uint8Array(await (await shrink(new Blob([input], { type }))).arrayBuffer());
      let s = '';
      for (let i = 0; i < out.length; i += 0x8000) s += String.fromCharCode(...out.subarray(i, i + 0x8000));
      return btoa(s);
    },
    { data: bytes.toString('base64'), type },
  );
  return Buffer.from(b64, 'base64');
}

describe('shrinking a photo on the phone', () => {
  it('makes a sideways 4000 × 3000 camera photo upright at 3000 px, keeping capture time and GPS', async () => {
    // Left half dark, right half light, stored sideways (EXIF orientation 6: turn 90° clockwise to view).
    const stored = await sharp({ create: { width: 4000, height: 3000, channels: 3, background: '#202020' } })
      .composite([{ input: { create: { width: 2000, height: 3000, channels: 3, background: '#e0e0e0' } }, left: 2000, top: 0 }])
      .withExif({
        IFD0: { Make: 'Test camera' },
        IFD2: { DateTimeOriginal: '2026:03:14 10:21:05' },
        IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '47/1 30/1 0/1', GPSLongitudeRef: 'E', GPSLongitude: '8/1 15/1 0/1' },
      })
      .withMetadata({ orientation: 6 })
      .jpeg({ quality: 90 })
      .toBuffer();
    const out = await shrinkInBrowser(stored, 'image/jpeg');
    const meta = await sharp(out).metadata();
    expect(meta.format).toBe('jpeg');
    expect([meta.width, meta.height]).toEqual([2250, 3000]);
    expect(meta.orientation ?? 1).toBe(1);
    const exif = await exifr.parse(out, { gps: true });
    expect(exif.latitude).toBeCloseTo(47.5, 6);
    expect(exif.DateTimeOriginal).toBeInstanceOf(Date);
    // Upright: turned clockwise, the stored left (dark) half is now the top half.
    const { data } = await sharp(out).greyscale().resize(1, 2, { fit: 'fill' }).raw().toBuffer({ resolveWithObject: true });
    expect(data[0]).toBeLessThan(80);
    expect(data[1]).toBeGreaterThan(170);
    expect(out.length).toBeLessThan(stored.length);
  });

  it('leaves a photo already within 3000 px, and a file that is not an image, as they are', async () => {
    const small = await sharp({ create: { width: 1600, height: 1200, channels: 3, background: '#557766' } })
      .jpeg()
      .toBuffer();
    expect(Buffer.compare(await shrinkInBrowser(small, 'image/jpeg'), small)).toBe(0);
    const text = Buffer.from('not a photo at all');
    expect(Buffer.compare(await shrinkInBrowser(text, 'text/plain'), text)).toBe(0);
  });
});
