// Two phones (two people of one workshop, each with the field client on fake-indexeddb) edit the
// same pose against the real server: one kept conflict, on the phone that sent second only,
// described in the trade's words; resolved either way, it lands once and both phones converge.
import 'fake-indexeddb/auto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { FieldDb } from '@/lib/db/field-db';
import { patchRecord } from '@/lib/db/records';
import { fieldLookups } from '@/lib/db/unsent';
import { runSync } from '@/features/sync/engine/sync-run';
import type { SyncTransport } from '@/features/sync/api/transport';
import { differences, differenceSentence } from '@/features/sync/describe';
import { createTeam, signedInAgent, startTestServer, TEST_PASSWORD, type TestServer } from '../support/test-app';
import { batchKey, change, poseRecord, sessionRecord, vehicleWithPoints } from '../support/sync';
import { nodeTransport, signInCookie } from '../faults/fault-rig';
import { PoseModel, SyncConflictModel } from '../../server/models';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

interface Phone {
  db: FieldDb;
  transport: SyncTransport;
  cookie: string;
  sync(): Promise<void>;
}

async function phone(email: string): Promise<Phone> {
  const db = new FieldDb(`phone-${crypto.randomUUID()}`);
  await db.open();
  const cookie = await signInCookie(ts.baseUrl, email, TEST_PASSWORD);
  const transport = nodeTransport(ts.baseUrl, cookie);
  return {
    db,
    transport,
    cookie,
    async sync() {
      const result = await runSync(db, transport);
      expect(result).toEqual({ ok: true });
    },
  };
}

async function resolve(p: Phone, conflictId: string, keep: 'client' | 'server') {
  const res = await fetch(`${ts.baseUrl}/api/sync/conflicts/${conflictId}/resolve`, {
    method: 'POST',
    headers: { Cookie: p.cookie, Origin: ts.baseUrl, 'Content-Type': 'application/json' },
    body: JSON.stringify({ keep }),
  });
  return { status: res.status, body: await res.json() };
}

async function setup() {
  const team = await createTeam('Two-phone workshop');
  const agent = await signedInAgent(ts, team.members.tester.email);
  const { vehicleId } = await vehicleWithPoints(agent, ['A', 'B']);
  const session = sessionRecord(vehicleId);
  const pose = poseRecord(session.id, 1, { label: 'Pose 1', liftFlMm: 0 });
  await agent.post('/api/sync/push').send({ idempotencyKey: batchKey(), changes: [change('testSession', session), change('pose', pose)] });
  const a = await phone(team.members.tester.email);
  const b = await phone(team.members.engineer.email);
  await a.sync();
  await b.sync();
  return { team, poseId: pose.id, a, b };
}

/** Both edit the pose offline; A sends first, then B: B's edit is kept as a conflict. */
async function concurrentEdits() {
  const f = await setup();
  expect((await patchRecord('pose', f.poseId, { label: 'Front left up', liftFlMm: 300 }, f.a.db)).ok).toBe(true);
  expect((await patchRecord('pose', f.poseId, { liftFrMm: 410 }, f.b.db)).ok).toBe(true);
  await f.a.sync();
  await f.b.sync();
  // B types on, not knowing yet: the note builds on the server's version, the conflict stays one.
  expect((await patchRecord('pose', f.poseId, { notes: 'spotter at the rear' }, f.b.db)).ok).toBe(true);
  await f.b.sync();
  await f.a.sync();
  return f;
}

describe('two phones editing the same pose', () => {
  it("keep one conflict, on the phone that sent second, in the trade's words", async () => {
    const { team, poseId, a, b } = await concurrentEdits();
    const open = await SyncConflictModel.findAll({ where: { teamId: team.teamId, resolvedAt: null } });
    expect(open).toHaveLength(1);
    expect(open[0].userId).toBe(team.members.engineer.userId);
    expect(await a.db.conflicts.count()).toBe(0);
    const [kept] = await b.db.conflicts.toArray();
    expect(kept.entityId).toBe(poseId);
    const sentences = differences('pose', kept.clientRecord, kept.serverRecord, await fieldLookups(b.db), 'mm').map(differenceSentence);
    expect(sentences).toEqual([
      'Pose name: Pose 1 on this phone, Front left up on the server',
      'Lift front left: 0 mm on this phone, 300 mm on the server',
      'Lift front right: 410 mm on this phone, 0 mm on the server',
    ]);
    // Meanwhile both phones show the server's pose, with B's later note on it.
    expect(await PoseModel.findByPk(poseId)).toMatchObject({ label: 'Front left up', liftFlMm: 300, liftFrMm: 0, notes: 'spotter at the rear' });
    for (const p of [a, b])
      expect(await p.db.poses.get(poseId)).toMatchObject({ label: 'Front left up', liftFrMm: 0, notes: 'spotter at the rear', version: 3 });
  });

  it('resolved "keep this phone\'s", lands once, and both phones converge', async () => {
    const { poseId, a, b } = await concurrentEdits();
    const [kept] = await b.db.conflicts.toArray();
    const first = await resolve(b, kept.id, 'client');
    expect(first.status).toBe(200);
    // The answer was lost and the tester taps again: the same answer, nothing written twice.
    const again = await resolve(b, kept.id, 'client');
    expect(again).toEqual(first);
    expect(await PoseModel.findByPk(poseId)).toMatchObject({ label: 'Pose 1', liftFlMm: 0, liftFrMm: 410, notes: 'spotter at the rear', version: 4 });
    await a.sync();
    await b.sync();
    for (const p of [a, b]) expect(await p.db.poses.get(poseId)).toMatchObject({ label: 'Pose 1', liftFrMm: 410, version: 4 });
    expect((await b.db.conflicts.get(kept.id))?.resolution).toBe('client');
  });

  it('resolved "keep the server\'s", writes nothing and both phones converge', async () => {
    const { poseId, a, b } = await concurrentEdits();
    const [kept] = await b.db.conflicts.toArray();
    expect((await resolve(b, kept.id, 'server')).status).toBe(200);
    expect((await resolve(b, kept.id, 'client')).status).toBe(409);
    expect(await PoseModel.findByPk(poseId)).toMatchObject({ label: 'Front left up', liftFrMm: 0, version: 3 });
    await a.sync();
    await b.sync();
    for (const p of [a, b]) expect(await p.db.poses.get(poseId)).toMatchObject({ label: 'Front left up', liftFrMm: 0, version: 3 });
    expect((await b.db.conflicts.get(kept.id))?.resolvedAt).not.toBeNull();
  });
});
