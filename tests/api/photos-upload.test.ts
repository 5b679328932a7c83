// Photo upload through HTTP: limits, bad files, GPS stripped from the stored copy, team-scoped serving.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import sharp from 'sharp';
import exifr from 'exifr';
import { createTeam, signedInAgent, startTestServer, type TestServer } from '../support/test-app';
import { batchKey, change, sessionRecord, vehicleWithPoints } from '../support/sync';
import { PhotoModel } from '../../server/models';
import { storedPhotoBytes } from '../support/photos';
import { MAX_PHOTO_BYTES } from '../../server/services/photos.service';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

/** A small JPEG carrying GPS and capture-time EXIF, as a phone camera writes it. */
async function jpegWithGps() {
  return sharp({ create: { width: 64, height: 48, channels: 3, background: { r: 120, g: 90, b: 60 } } })
    .withExif({
      IFD0: { Make: 'Test camera', Model: 'Field phone' },
      IFD2: { DateTimeOriginal: '2026:03:14 10:21:05' },
      IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '47/1 30/1 0/1', GPSLongitudeRef: 'E', GPSLongitude: '8/1 15/1 0/1' },
    })
    .jpeg()
    .toBuffer();
}

async function setup(photoGps: 'keep' | 'drop' = 'keep') {
  const team = await createTeam();
  // The workshop's admin chooses whether photos keep their GPS position (Team page).
  const admin = await signedInAgent(ts, team.members.admin.email);
  expect((await admin.patch('/api/team').send({ photoGps })).status).toBe(200);
  const tester = await signedInAgent(ts, team.members.tester.email);
  const { vehicleId } = await vehicleWithPoints(tester);
  const session = sessionRecord(vehicleId);
  const pushed = await tester.post('/api/sync/push').send({ idempotencyKey: batchKey(), changes: [change('testSession', session)] });
  expect(pushed.status).toBe(200);
  return { team, admin, tester, sessionId: session.id };
}

const upload = (agent: Awaited<ReturnType<typeof signedInAgent>>, fields: Record<string, string>, file: Buffer, name = 'IMG_0001.jpg') => {
  let req = agent.post('/api/photos');
  for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
  return req.attach('photo', file, { filename: name, contentType: 'image/jpeg' });
};

describe('GPS in photos follows the workshop setting', () => {
  it('drops the position when the workshop drops it (the capture time stays)', async () => {
    const { tester, sessionId } = await setup('drop');
    const id = randomUUID();
    const res = await upload(tester, { id, sessionId }, await jpegWithGps());
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ hasGps: false });
    expect(res.body.capturedAt).toMatch(/^2026-03-14T/);
    const row = await PhotoModel.findByPk(id);
    expect([row?.gpsLat, row?.gpsLon]).toEqual([null, null]);
  });

  it("is the admin's to change; switching to drop erases positions already kept", async () => {
    const { team, admin, tester, sessionId } = await setup('keep');
    const id = randomUUID();
    expect((await upload(tester, { id, sessionId }, await jpegWithGps())).body).toMatchObject({ hasGps: true });
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    expect((await engineer.patch('/api/team').send({ photoGps: 'drop' })).status).toBe(403);
    expect((await admin.patch('/api/team').send({ photoGps: 'nowhere' })).status).toBe(400);
    const changed = await admin.patch('/api/team').send({ photoGps: 'drop' });
    expect(changed.status).toBe(200);
    expect(changed.body.team).toMatchObject({ photoGps: 'drop' });
    expect((await tester.get('/api/team')).body.team.photoGps).toBe('drop');
    const row = await PhotoModel.findByPk(id);
    expect([row?.gpsLat, row?.gpsLon]).toEqual([null, null]);
    // The phone learns it on its next pull: the photo's record changed.
    expect((await tester.get('/api/sync/pull?since=0')).body.photos.find((p: { id: string }) => p.id === id)).toMatchObject({ hasGps: false });
  });
});

describe('photo upload', () => {
  it('reads capture time and GPS, then stores a copy without location metadata, and a thumbnail', async () => {
    const { tester, sessionId } = await setup();
    const original = await jpegWithGps();
    // The fixture really carries GPS, or the check below would prove nothing.
    expect((await exifr.gps(original))?.latitude).toBeCloseTo(47.5, 6);
    const id = randomUUID();
    const res = await upload(tester, { id, sessionId, caption: 'Gap at point A' }, original, '../../etc/passwd.jpg');
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ id, sessionId, hasGps: true, mime: 'image/jpeg', width: 64, height: 48 });
    expect(res.body.capturedAt).toMatch(/^2026-03-14T/);

    const row = await PhotoModel.findByPk(id);
    expect(row?.gpsLat).toBeCloseTo(47.5, 6);
    expect(row?.storedName).not.toMatch(/passwd|IMG/);
    const stored = (await storedPhotoBytes(row!.storedName))!;
    expect(stored).not.toBeNull();
    expect(await exifr.gps(stored)).toBeUndefined();
    expect(await exifr.parse(stored)).toBeUndefined();
    expect(await storedPhotoBytes(row!.thumbName)).not.toBeNull();

    const full = await tester.get(`/api/photos/${id}`).buffer(true);
    expect(full.status).toBe(200);
    expect(full.headers['content-type']).toBe('image/jpeg');
    expect(Buffer.compare(full.body, stored)).toBe(0);
    expect((await tester.get(`/api/photos/${id}/thumb`)).status).toBe(200);

    // A retried upload after a lost answer stores nothing twice.
    const again = await upload(tester, { id, sessionId, caption: 'Gap at point A' }, original);
    expect(again.status).toBe(200);
    expect(await PhotoModel.count({ where: { sessionId } })).toBe(1);
  });

  it('serves a photo only to its own team', async () => {
    const { tester, sessionId } = await setup();
    const id = randomUUID();
    expect((await upload(tester, { id, sessionId }, await jpegWithGps())).status).toBe(201);
    const other = await createTeam('Other workshop');
    const outsider = await signedInAgent(ts, other.members.engineer.email);
    expect((await outsider.get(`/api/photos/${id}`)).status).toBe(404);
    expect((await outsider.get(`/api/photos/${id}/thumb`)).status).toBe(404);
  });

  it('refuses a file whose first bytes are not an image, whatever its name and type say', async () => {
    const { tester, sessionId } = await setup();
    const id = randomUUID();
    const res = await upload(tester, { id, sessionId }, Buffer.from('<?php echo "not a photo"; ?>'.repeat(20)), 'photo.jpg');
    expect(res.status).toBe(400);
    expect(res.body.error.fields[0]).toMatchObject({ field: 'photo' });
    expect(res.body.error.message).toMatch(/first bytes/);
    expect(await PhotoModel.count({ where: { id } })).toBe(0);
  });

  it('refuses a file over the size limit with 413', async () => {
    const { tester, sessionId } = await setup();
    const big = Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0]), Buffer.alloc(MAX_PHOTO_BYTES + 1024)]);
    const res = await upload(tester, { id: randomUUID(), sessionId }, big);
    expect(res.status).toBe(413);
    expect(res.body.error.message).toMatch(/larger than/);
  });

  it('refuses an image that claims more pixels than the limit (decompression bomb)', async () => {
    const { tester, sessionId } = await setup();
    const small = await sharp({ create: { width: 16, height: 16, channels: 3, background: '#888' } })
      .jpeg()
      .toBuffer();
    // Rewrite the frame header (SOF0: FF C0, length, precision, height, width) to claim 30000 × 30000.
    const sof = small.indexOf(Buffer.from([0xff, 0xc0]));
    expect(sof).toBeGreaterThan(0);
    const bomb = Buffer.from(small);
    bomb.writeUInt16BE(30000, sof + 5);
    bomb.writeUInt16BE(30000, sof + 7);
    const res = await upload(tester, { id: randomUUID(), sessionId }, bomb);
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/megapixels/);
  });

  it('refuses two files in one upload, naming the field', async () => {
    const { tester, sessionId } = await setup();
    const jpeg = await jpegWithGps();
    const res = await tester
      .post('/api/photos')
      .field('id', randomUUID())
      .field('sessionId', sessionId)
      .attach('photo', jpeg, 'a.jpg')
      .attach('photo', jpeg, 'b.jpg');
    expect(res.status).toBe(400);
    expect(res.body.error.fields[0].field).toBe('photo');
  });
});
