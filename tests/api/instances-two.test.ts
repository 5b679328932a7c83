// Two app processes on one PostgreSQL, one photo store (the S3 fake) and one mail sink, as two
// instances behind a load balancer: a phone (the field client's sync run, over Node) and the desk
// alternate between them request by request, and everything behaves as on one instance: sign-in,
// push, pull, photo upload and download, review validators, throttling, sign-off and sending the
// fabrication sheet (quotas and the mail log counted once). The second instance runs the bundled
// server (npm run build:server), so the bundle is proven on the same path as the sources.
import 'fake-indexeddb/auto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import sharp from 'sharp';
import { FieldDb } from '@/lib/db/field-db';
import { saveRecords } from '@/lib/db/records';
import { addPhoto } from '@/lib/db/photos';
import { runSync } from '@/features/sync/engine/sync-run';
import type { SyncTransport } from '@/features/sync/api/transport';
import path from 'node:path';
import { buildServer } from '../../server/scripts/build-server.mjs';
import { createTeam, repoRoot, startTestServer, TEST_PASSWORD, type TestServer, type TestTeam } from '../support/test-app';
import { nodeTransport, signInCookie, startServerProcess, type ServerProcess } from '../faults/fault-rig';
import { startMailSink, type MailSink } from '../../server/mail/sink';
import { syntheticRecords } from '../support/synthetic-records';
import { DEFAULT_DRAFT_PARAMS } from '../../shared/schemas/envelope';
import { ReadingModel } from '../../server/models';
import { signInThrottle } from '../../server/auth/throttle';

let ts: TestServer;
let sink: MailSink;
let a: ServerProcess;
let b: ServerProcess;
let team: TestTeam;

beforeAll(async () => {
  ts = await startTestServer(); // this file's models and database connection
  sink = await startMailSink();
  // Both instances send to the one sink and keep photos in the one bucket (S3_* from npm test).
  const shared = { SMTP_HOST: '127.0.0.1', SMTP_PORT: String(sink.port) };
  const bundle = await buildServer(path.join(repoRoot, '.data', `server-build-${process.env.SMTP_PORT}`));
  [a, b] = await Promise.all([startServerProcess(process.env.DATABASE_URL!, shared), startServerProcess(process.env.DATABASE_URL!, shared, bundle)]);
  team = await createTeam('Two instance workshop');
}, 120_000);

afterAll(async () => {
  await Promise.all([a?.stop(), b?.stop()]);
  await sink?.close();
  await ts?.close();
});

/** A sync transport that sends each call to the next instance in turn. */
function alternating(transports: SyncTransport[]): SyncTransport & { calls: string[] } {
  let n = 0;
  const calls: string[] = [];
  const next = (what: string) => {
    const i = n++ % transports.length;
    calls.push(`${what}@${i}`);
    return transports[i];
  };
  return {
    calls,
    push: (batch) => next('push').push(batch),
    pull: (since) => next('pull').pull(since),
    uploadPhoto: (form, onProgress) => next('photo').uploadPhoto(form, onProgress),
  };
}

/** A fetch to one instance with a cookie, as the desk's browser would send it. */
async function desk(server: ServerProcess, cookie: string, method: string, path: string, body?: unknown, headers: Record<string, string> = {}) {
  const res = await fetch(server.baseUrl + path, {
    method,
    headers: { Cookie: cookie, Origin: server.baseUrl, ...(body === undefined ? {} : { 'Content-Type': 'application/json' }), ...headers },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  const type = res.headers.get('content-type') ?? '';
  const data = type.includes('json') ? await res.json() : Buffer.from(await res.arrayBuffer());
  return { status: res.status, headers: res.headers, data };
}

/** A whole session as the phone stores it: vehicle, gauge points, poses and readings of a synthetic flex test. */
function phoneSession() {
  const made = syntheticRecords({
    name: 'Two instance truck',
    seed: 11,
    testedOn: '2026-11-30',
    session: { title: 'Yard flex, two instances', conditions: 'dry', crew: 'tester and spotter', safetyAckAt: '2026-11-30T09:00:00.000Z' },
  });
  const readings = made.readingsByPose.flatMap((rs) => rs.map(({ reading }) => reading));
  return { vehicle: made.vehicle, points: made.points, session: made.session, poses: made.poses, readings };
}

describe('two instances on one database, one photo store and one mail sink', () => {
  it('serves a phone and the desk alternately as one instance would', async () => {
    // Sign-in on one instance; the session works on the other.
    const phoneCookie = await signInCookie(a.baseUrl, team.members.tester.email, TEST_PASSWORD);
    const deskCookie = await signInCookie(b.baseUrl, team.members.engineer.email, TEST_PASSWORD);
    expect((await desk(a, deskCookie, 'GET', '/api/team')).status).toBe(200);
    expect((await desk(b, phoneCookie, 'GET', '/api/team')).status).toBe(200);

    // The phone records offline, with a photo, then syncs: each call to the other instance.
    const db = new FieldDb(`two-instances-${randomUUID()}`);
    const records = phoneSession();
    for (const [entity, list] of [
      ['vehicle', [records.vehicle]],
      ['gaugePoint', records.points],
      ['testSession', [records.session]],
      ['pose', records.poses],
      ['reading', records.readings],
    ] as const) {
      const saved = await saveRecords(entity, list as { id: string }[], db);
      expect(saved.filter((r) => !r.ok)).toEqual([]);
    }
    const jpeg = await sharp({ create: { width: 120, height: 90, channels: 3, background: '#5a6b3c' } })
      .jpeg()
      .toBuffer();
    const photoId = randomUUID();
    expect(
      await addPhoto(
        {
          id: photoId,
          sessionId: records.session.id,
          poseId: records.poses[2].id,
          caption: 'Gap at P2',
          file: new Blob([new Uint8Array(jpeg)], { type: 'image/jpeg' }),
        },
        db,
      ),
    ).toMatchObject({ ok: true });
    const phone = alternating([nodeTransport(a.baseUrl, phoneCookie), nodeTransport(b.baseUrl, phoneCookie)]);
    expect(await runSync(db, phone)).toEqual({ ok: true });
    expect(new Set(phone.calls.map((c) => c.split('@')[1]))).toEqual(new Set(['0', '1']));
    expect(phone.calls.some((c) => c.startsWith('photo@'))).toBe(true);
    expect(await db.outbox.count()).toBe(0);
    expect((await db.photos.get(photoId))?.status).toBe('uploaded');

    // The photo comes back whole from either instance.
    const fromA = await desk(a, deskCookie, 'GET', `/api/photos/${photoId}`);
    const fromB = await desk(b, deskCookie, 'GET', `/api/photos/${photoId}`);
    expect([fromA.status, fromB.status]).toEqual([200, 200]);
    expect(Buffer.compare(fromA.data as Buffer, fromB.data as Buffer)).toBe(0);
    expect((fromA.data as Buffer).subarray(0, 3)).toEqual(Buffer.from([0xff, 0xd8, 0xff]));

    // The desk's review: the validator one instance gave is the other's too.
    const review = await desk(b, deskCookie, 'GET', `/api/sessions/${records.session.id}/review`);
    expect(review.status).toBe(200);
    expect((review.data as { readings: unknown[] }).readings).toHaveLength(records.readings.length);
    const etag = review.headers.get('etag')!;
    expect((await desk(a, deskCookie, 'GET', `/api/sessions/${records.session.id}/review`, undefined, { 'If-None-Match': etag })).status).toBe(304);

    // The desk excludes a reading through one instance; the phone's next sync brings it back.
    const reading = records.readings[7];
    expect(
      (await desk(a, deskCookie, 'PATCH', `/api/readings/${reading.id}/review`, { version: 1, excluded: true, excludeReason: 'tape slipped' })).status,
    ).toBe(200);
    expect((await desk(b, deskCookie, 'GET', `/api/sessions/${records.session.id}/review`, undefined, { 'If-None-Match': etag })).status).toBe(200);
    expect(await runSync(db, phone)).toEqual({ ok: true });
    expect(await db.readings.get(reading.id)).toMatchObject({ excluded: true, excludeReason: 'tape slipped', version: 2 });

    // Sign-off on one instance, the sheet sent from the other: one e-mail, one log row.
    const draft = await desk(a, deskCookie, 'POST', `/api/sessions/${records.session.id}/envelopes`, {
      params: { ...DEFAULT_DRAFT_PARAMS, designTwistDeg: 20 },
    });
    expect(draft.status, JSON.stringify(draft.data)).toBe(201);
    const d = draft.data as { id: string; version: number };
    const signed = await desk(b, deskCookie, 'POST', `/api/envelopes/${d.id}/sign`, { version: d.version });
    expect(signed.status, JSON.stringify(signed.data)).toBe(200);
    const sent = await desk(a, deskCookie, 'POST', `/api/envelopes/${d.id}/send`, { to: 'cutter@bootmakers.test' });
    expect(sent.status, JSON.stringify(sent.data)).toBe(201);
    const mail = await sink.waitFor((m) => m.to.includes('cutter@bootmakers.test'));
    expect(mail.attachments[0]).toMatchObject({ contentType: 'application/pdf' });
    const [{ n }] = await ts.sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM mail_log WHERE team_id = $1 AND kind = 'sheet'`, {
      bind: [team.teamId],
      type: 'SELECT' as never,
    });
    expect(n).toBe(1);
    // Nothing was stored twice.
    expect(await ReadingModel.count({ where: { poseId: records.poses.map((p) => p.id) } })).toBe(records.readings.length);
    db.close();
  });

  it('counts sign-in failures once for both instances', async () => {
    const email = team.members.viewer.email;
    const attempt = (server: ServerProcess, password: string) =>
      fetch(`${server.baseUrl}/api/auth/sign-in`, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json', Origin: server.baseUrl },
        body: JSON.stringify({ email, password }),
      });
    // The free failures and the one that starts the wait, spread over both instances (auth/throttle.ts);
    // from then on the address waits, wherever its next guess lands.
    for (let i = 0; i <= signInThrottle.freeFailures; i++) expect((await attempt(i % 2 ? b : a, `wrong-${i}`)).status).toBe(401);
    for (const server of [a, b]) {
      const res = await attempt(server, 'wrong-again');
      expect(res.status).toBe(429);
      expect(Number(res.headers.get('retry-after'))).toBeGreaterThan(0);
    }
  });
});
