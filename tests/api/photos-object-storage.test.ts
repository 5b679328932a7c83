// Photos live in S3-compatible object storage (the local fake under `npm test`), in a bucket that
// answers only signed requests: people reach a photo only through the app's route, after its
// access check, never from the bucket, never as a viewer or from another workshop.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import sharp from 'sharp';
import { createTeam, signedInAgent, agentFor, startTestServer, type TestServer } from '../support/test-app';
import { batchKey, change, sessionRecord, vehicleWithPoints } from '../support/sync';
import { storedPhotoBytes, storedPhotoNames } from '../support/photos';
import { PhotoModel } from '../../server/models';
import { photoStore } from '../../server/storage/photo-store';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

async function uploaded() {
  const team = await createTeam('Object storage workshop');
  const tester = await signedInAgent(ts, team.members.tester.email);
  const { vehicleId } = await vehicleWithPoints(tester);
  const session = sessionRecord(vehicleId);
  expect((await tester.post('/api/sync/push').send({ idempotencyKey: batchKey(), changes: [change('testSession', session)] })).status).toBe(200);
  const jpeg = await sharp({ create: { width: 80, height: 60, channels: 3, background: '#705030' } })
    .jpeg()
    .toBuffer();
  const id = randomUUID();
  const res = await tester
    .post('/api/photos')
    .field('id', id)
    .field('sessionId', session.id)
    .attach('photo', jpeg, { filename: 'gap.jpg', contentType: 'image/jpeg' });
  expect(res.status).toBe(201);
  const row = (await PhotoModel.findByPk(id))!;
  return { team, tester, id, row, answer: res.body as Record<string, unknown> };
}

describe('photos in object storage', () => {
  it('runs against the S3 fake in tests, as under npm start', () => {
    expect(process.env.S3_BUCKET, 'npm test starts the S3 fake and names its bucket').toBeTruthy();
    expect(photoStore().where).toMatch(/^s3:\/\//);
  });

  it('stores the photo and its thumbnail in the bucket under names the server made', async () => {
    const { row } = await uploaded();
    const names = await storedPhotoNames();
    expect(names).toEqual(expect.arrayContaining([row.storedName, row.thumbName]));
    expect((await storedPhotoBytes(row.storedName))!.subarray(0, 3)).toEqual(Buffer.from([0xff, 0xd8, 0xff]));
  });

  it('serves the bytes stored in the bucket to the team, through the app', async () => {
    const { tester, id, row } = await uploaded();
    const full = await tester.get(`/api/photos/${id}`).buffer(true);
    expect(full.status).toBe(200);
    expect(full.headers['content-type']).toBe('image/jpeg');
    expect(full.headers['cache-control']).toBe('private, max-age=31536000, immutable');
    expect(Buffer.compare(full.body, (await storedPhotoBytes(row.storedName))!)).toBe(0);
    const thumb = await tester.get(`/api/photos/${id}/thumb`).buffer(true);
    expect(Buffer.compare(thumb.body, (await storedPhotoBytes(row.thumbName))!)).toBe(0);
  });

  it('never lets a viewer, another workshop or a signed-out caller reach it', async () => {
    const { team, id } = await uploaded();
    const viewer = await signedInAgent(ts, team.members.viewer.email);
    const outsider = await signedInAgent(ts, (await createTeam('Another workshop')).members.admin.email);
    for (const path of [`/api/photos/${id}`, `/api/photos/${id}/thumb`]) {
      expect((await viewer.get(path)).status, `viewer ${path}`).toBe(403);
      expect((await outsider.get(path)).status, `other workshop ${path}`).toBe(404);
      expect((await agentFor(ts).get(path)).status, `signed out ${path}`).toBe(401);
    }
  });

  it('keeps the bucket private: its address and object names never reach a client, and unsigned requests get 403', async () => {
    const { tester, id, row, answer } = await uploaded();
    const text = JSON.stringify(answer) + JSON.stringify((await tester.get('/api/sync/pull?since=0')).body);
    for (const secret of [row.storedName, row.thumbName, process.env.S3_ENDPOINT!, process.env.S3_BUCKET!]) expect(text).not.toContain(secret);
    // Someone who learned the name anyway: the bucket refuses what is not signed with its keys.
    for (const url of [`${process.env.S3_ENDPOINT}/${process.env.S3_BUCKET}/${row.storedName}`, `${process.env.S3_ENDPOINT}/${process.env.S3_BUCKET}`]) {
      const res = await fetch(url);
      expect(res.status, url).toBe(403);
      expect(await res.text()).not.toContain('ÿØÿ');
    }
    expect(id).toBeTruthy();
  });

  it('answers 404 (not a broken image or a 500) when the stored file is gone', async () => {
    const { tester, id, row } = await uploaded();
    await photoStore().remove([row.storedName]);
    const res = await tester.get(`/api/photos/${id}`);
    expect(res.status).toBe(404);
    expect(res.body.error.message).toMatch(/photo file not found/);
  });
});
