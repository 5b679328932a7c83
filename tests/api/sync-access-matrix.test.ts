// The access matrix through sync push: every entity × field × role, as an update of a record the
// server has, in an open session and in a session whose envelope is signed, and as a new record
// carrying a value in a field its author may not set. What a role may do lands (the database holds
// the new value); what it may not is refused with a 400 naming the field, and the database of both
// workshops is exactly as before (every row hashed, support/db-snapshot.ts).
//
// The expectations below are written out in words, independently of server/services/sync-access.ts:
// - admin and engineer may change anything anywhere;
// - a tester records: every field of vehicles, gauge points, sessions, poses and readings, except
//   a reading's review (excluded, excludeReason, flagNote), deleting a vehicle or a session, and
//   anything at all in a session whose envelope is signed;
// - a viewer may not push (403).
// Re-test requests move through states with rules of their own: tests/api/retest-requests.test.ts.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { createTeam, sessionAgent, startTestServer, type Agent, type TestServer, type TestTeam } from '../support/test-app';
import { batchKey } from '../support/sync';
import { changedTables, insertRow, scopedTables, snapshot, type ScopedTable } from '../support/db-snapshot';
import { syncTables } from '../../server/services/sync-tables';
import { toRecord } from '../../server/services/to-record';
import { syncAccess } from '../../server/services/sync-access';
import { syncEntities, type SyncEntity } from '../../shared/schemas/sync';
import type { Role } from '../../shared/schemas';
import { newGaugePoint, newPose, newReading, newTestSession, newVehicle } from '../../shared/records';
import { roles as allRoles } from '../../shared/permissions';

let ts: TestServer;
let tables: ScopedTable[];
let other: TestTeam;
beforeAll(async () => {
  ts = await startTestServer();
  tables = await scopedTables(ts.sequelize);
  other = await createTeam('Neighbour workshop');
});
afterAll(async () => ts?.close());

type Patch = Record<string, unknown>;
const entities = ['vehicle', 'gaugePoint', 'testSession', 'pose', 'reading'] as const satisfies SyncEntity[];
type Entity = (typeof entities)[number];
const roles: Role[] = [...allRoles];

/** What the product promises, in words (see the file's head). */
function promised(role: Role, entity: Entity, fields: string[], inSignedSession: boolean): 'allowed' | 'refused' | 'forbidden' {
  if (role === 'viewer') return 'forbidden';
  if (role === 'admin' || role === 'engineer') return 'allowed';
  if (inSignedSession) return 'refused';
  if (entity === 'reading' && fields.some((f) => ['excluded', 'excludeReason', 'flagNote'].includes(f))) return 'refused';
  if ((entity === 'vehicle' || entity === 'testSession') && fields.includes('deletedAt')) return 'refused';
  return 'allowed';
}

// ---------------------------------------------------------------------------------------------
// A workshop with two vehicles, an open session (two poses, one reading), a second open session,
// and a signed session (two poses, one reading, a signed envelope).

interface Fixture {
  team: TestTeam;
  agents: Record<Role, Agent>;
  ids: Record<string, string>;
}

async function buildFixture(): Promise<Fixture> {
  const team = await createTeam('Sync matrix workshop');
  const t = team.teamId;
  const by = team.members.engineer.userId;
  const ids: Record<string, string> = {};
  for (const k of ['v1', 'v2', 'g1', 'g2', 'openSession', 'spareSession', 'signedSession', 'p1', 'p2', 'q1', 'q2', 'r1', 't1', 'envelope'])
    ids[k] = randomUUID();
  const insert = (table: string, row: Record<string, unknown>) => insertRow(ts.sequelize, table, row);
  const opening = { widthMm: 700, heightMm: 500, cornerRadiusMm: 80, centreYMm: 0, bottomZMm: 350 };
  for (const [id, name] of [
    [ids.v1, 'Matrix truck'],
    [ids.v2, 'Second truck'],
  ]) {
    await insert('vehicles', { id, team_id: t, name, wheelbase_mm: 3800, track_front_mm: 1900, track_rear_mm: 1880, opening });
  }
  await insert('gauge_points', { id: ids.g1, team_id: t, vehicle_id: ids.v1, label: 'A', y_mm: 300, z_mm: 800 });
  await insert('gauge_points', { id: ids.g2, team_id: t, vehicle_id: ids.v1, label: 'B', y_mm: -300, z_mm: 800 });
  for (const s of [ids.openSession, ids.spareSession, ids.signedSession]) {
    await insert('test_sessions', { id: s, team_id: t, vehicle_id: ids.v1, tested_on: '2026-05-01', created_by: by });
  }
  const pose = (id: string, session: string, seq: number) =>
    insert('poses', {
      id,
      team_id: t,
      session_id: session,
      seq,
      kind: seq ? 'wheels' : 'level',
      lift_fl_mm: seq ? 300 : 0,
      recorded_at: new Date(),
      created_by: by,
    });
  await pose(ids.p1, ids.openSession, 0);
  await pose(ids.p2, ids.openSession, 1);
  await pose(ids.q1, ids.signedSession, 0);
  await pose(ids.q2, ids.signedSession, 1);
  await insert('readings', { id: ids.r1, team_id: t, pose_id: ids.p1, gauge_point_id: ids.g1, axis: 'lateral', value_mm: 93.5, entered_by: by });
  await insert('readings', { id: ids.t1, team_id: t, pose_id: ids.q1, gauge_point_id: ids.g1, axis: 'lateral', value_mm: 88, entered_by: by });
  await insert('envelopes', {
    id: ids.envelope,
    team_id: t,
    vehicle_id: ids.v1,
    session_id: ids.signedSession,
    params: {},
    status: 'signed',
    snapshot: {},
    content_hash: 'x'.repeat(64),
    signed_by: by,
    signed_at: new Date(),
    created_by: by,
  });
  const agents = {} as Record<Role, Agent>;
  for (const role of roles) agents[role] = await sessionAgent(ts, team.members[role].userId, t);
  return { team, agents, ids };
}

/** The record as the server holds it now (what a phone that pulled it would push back). */
async function current(entity: SyncEntity, id: string): Promise<Record<string, unknown> & { id: string; version: number }> {
  const spec = syncTables[entity];
  const [row] = await ts.sequelize.query<Record<string, unknown>>(`SELECT * FROM ${spec.table} WHERE id = :id`, {
    replacements: { id },
    type: QueryTypes.SELECT,
  });
  const { changeSeq: _seq, ...record } = toRecord(entity, row);
  return record;
}

const later = () => new Date(Date.now() + 3_600_000).toISOString();
const axes = ['foreAft', 'lateral', 'vertical'];
const swap = (v: unknown, a: string, b: string) => (v === a ? b : a);

/** A different, valid value for one field (a patch: excluding a reading brings its reason along). */
function changeOf(entity: Entity, field: string, r: Record<string, unknown>, f: Fixture): Patch {
  const more = (n: unknown) => (n as number) + 10;
  const text = (v: unknown) => `${String(v ?? '')} changed`.trim();
  const by: Record<Entity, Record<string, () => Patch>> = {
    vehicle: {
      opening: () => ({ opening: { ...(r.opening as object), widthMm: more((r.opening as { widthMm: number }).widthMm) } }),
    },
    gaugePoint: {
      vehicleId: () => ({ vehicleId: swap(r.vehicleId, f.ids.v1, f.ids.v2) }),
      label: () => ({ label: r.label === 'Z9' ? 'Z8' : 'Z9' }),
    },
    testSession: {
      vehicleId: () => ({ vehicleId: swap(r.vehicleId, f.ids.v1, f.ids.v2) }),
      testedOn: () => ({ testedOn: r.testedOn === '2026-04-01' ? '2026-04-02' : '2026-04-01' }),
      readingMode: () => ({ readingMode: swap(r.readingMode, 'gap', 'displacement') }),
    },
    pose: {
      sessionId: () => ({ sessionId: r.sessionId === f.ids.spareSession ? f.ids.openSession : f.ids.spareSession }),
      label: () => ({ label: text(r.label).slice(-80) }),
      kind: () => ({ kind: swap(r.kind, 'wheels', 'level') }),
      rampAngleDeg: () => ({ rampAngleDeg: r.rampAngleDeg === 20 ? 15 : 20 }),
      rampDistanceMm: () => ({ rampDistanceMm: r.rampDistanceMm === 500 ? 600 : 500 }),
      rampWheel: () => ({ rampWheel: r.rampWheel === 'fl' ? 'fr' : 'fl' }),
    },
    reading: {
      poseId: () => ({ poseId: r.poseId === f.ids.p1 ? f.ids.p2 : r.poseId === f.ids.p2 ? f.ids.p1 : r.poseId === f.ids.q1 ? f.ids.q2 : f.ids.q1 }),
      gaugePointId: () => ({ gaugePointId: swap(r.gaugePointId, f.ids.g1, f.ids.g2) }),
      axis: () => ({ axis: axes[(axes.indexOf(r.axis as string) + 1) % 3] }),
      valueMm: () => ({ valueMm: (r.valueMm as number) + 905.5 }),
      excluded: () => (r.excluded ? { excluded: false } : { excluded: true, excludeReason: 'tape slipped' }),
      excludeReason: () => ({ excludeReason: r.excludeReason === 'checked twice' ? 'checked again' : 'checked twice' }),
    },
  };
  // A field with no entry of its own changes as its column type suggests (free text gets a word
  // more, a number 10 more): a field whose values are a list needs an entry above.
  const type = syncTables[entity].columns.find((c) => c.key === field)?.type;
  const byType: Partial<Record<string, () => Patch>> = {
    text: () => ({ [field]: text(r[field]) }),
    float8: () => ({ [field]: more(r[field]) }),
    int4: () => ({ [field]: more(r[field]) }),
    bool: () => ({ [field]: !r[field] }),
    timestamptz: () => ({ [field]: later() }),
  };
  const make = by[entity][field] ?? (type ? byType[type] : undefined);
  if (!make) throw new Error(`no test change for ${entity}.${field}: add one (every field of every record is in the matrix)`);
  return make();
}

/** Which record of the fixture each case edits: in an open session, and (for session parts) in the signed one. */
const targets = (f: Fixture): Record<Entity, { open: string; signed?: string }> => ({
  vehicle: { open: f.ids.v2 },
  gaugePoint: { open: f.ids.g2 },
  testSession: { open: f.ids.openSession, signed: f.ids.signedSession },
  pose: { open: f.ids.p2, signed: f.ids.q2 },
  reading: { open: f.ids.r1, signed: f.ids.t1 },
});

let slotsTaken = 0;
const freeSlots = (f: Fixture) => [
  { poseId: f.ids.p1, gaugePointId: f.ids.g1, axis: 'foreAft' as const },
  { poseId: f.ids.p1, gaugePointId: f.ids.g1, axis: 'vertical' as const },
  { poseId: f.ids.p1, gaugePointId: f.ids.g2, axis: 'lateral' as const },
  { poseId: f.ids.p1, gaugePointId: f.ids.g2, axis: 'foreAft' as const },
  { poseId: f.ids.p1, gaugePointId: f.ids.g2, axis: 'vertical' as const },
];

/** A new record of each kind, with every field at its default (in an open session, or a signed one). */
function newRecord(entity: Entity, f: Fixture, inSigned: boolean): Record<string, unknown> & { id: string; version: number } {
  const id = randomUUID();
  const base = { id, deletedAt: null };
  switch (entity) {
    case 'vehicle':
      return newVehicle({
        ...base,
        name: 'New truck',
        wheelbaseMm: 3600,
        trackFrontMm: 1800,
        trackRearMm: 1800,
        opening: { widthMm: 600, heightMm: 400, cornerRadiusMm: 50, centreYMm: 0, bottomZMm: 300 },
        nominalGapMm: 80,
      });
    case 'gaugePoint':
      return newGaugePoint({ ...base, vehicleId: f.ids.v2, label: `N${id.slice(0, 4)}`, yMm: 10, zMm: 20 });
    case 'testSession':
      return newTestSession({ ...base, vehicleId: f.ids.v1, title: 'New', testedOn: '2026-06-01' });
    case 'pose':
      return newPose({ ...base, sessionId: inSigned ? f.ids.signedSession : f.ids.openSession, seq: 7, label: 'New pose', liftFrMm: 250 });
    case 'reading': {
      // Each new reading takes a slot of its own (the first updates move r1 off p1).
      const slot = inSigned ? { poseId: f.ids.q2, gaugePointId: f.ids.g1, axis: 'foreAft' as const } : freeSlots(f)[slotsTaken++ % 5];
      return newReading({ ...base, ...slot, valueMm: 4.5 });
    }
  }
}

interface Case {
  name: string;
  entity: Entity;
  /** The record to push with the change made (built when the case runs: earlier cases move versions on). */
  build: () => Promise<{ record: Record<string, unknown> & { id: string; version: number }; changedFields: string[] }>;
  /** The field the refusal must name. */
  named: string;
  inSigned: boolean;
}

function updateCases(f: Fixture): Case[] {
  const out: Case[] = [];
  for (const entity of entities) {
    const t = targets(f)[entity];
    for (const [where, id] of [
      ['open', t.open],
      ['signed', t.signed],
    ] as const) {
      if (!id) continue;
      for (const col of syncTables[entity].columns) {
        const build = async () => {
          const rec = await current(entity, id);
          const patch = changeOf(entity, col.key, rec, f);
          return { record: { ...rec, ...patch }, changedFields: Object.keys(patch) };
        };
        out.push({ name: `${entity}.${col.key} (${where} session)`, entity, build, named: col.key, inSigned: where === 'signed' });
      }
    }
  }
  return out;
}

function createCases(f: Fixture): Case[] {
  const out: Case[] = [];
  for (const entity of entities) {
    for (const inSigned of entity === 'pose' || entity === 'reading' ? [false, true] : [false]) {
      out.push({
        name: `new ${entity}${inSigned ? ' in a signed session' : ''}`,
        entity,
        build: async () => ({ record: newRecord(entity, f, inSigned), changedFields: [] }),
        named: 'id',
        inSigned,
      });
      if (inSigned) continue;
      for (const field of Object.keys(syncAccess[entity].defaults)) {
        const build = async () => {
          const rec = newRecord(entity, f, false);
          const patch = changeOf(entity, field, rec, f);
          return { record: { ...rec, ...patch }, changedFields: Object.keys(patch) };
        };
        out.push({ name: `new ${entity} with ${field} set`, entity, build, named: field, inSigned: false });
      }
    }
  }
  return out;
}

/** The same comparison the server makes: instants as instants, JSON as JSON. */
const same = (a: unknown, b: unknown) => {
  const norm = (v: unknown) => (typeof v === 'string' && /^\d{4}-\d\d-\d\dT/.test(v) ? new Date(v).getTime() : JSON.stringify(v ?? null));
  return norm(a) === norm(b);
};

describe('the sync rules table', () => {
  it('has a rule for every field of every synced record', () => {
    for (const entity of syncEntities) {
      expect(Object.keys(syncAccess[entity].fields).sort(), entity).toEqual(syncTables[entity].columns.map((c) => c.key).sort());
    }
  });
});

describe('sync push, every entity × field × role', () => {
  it.each(roles)(
    '%s',
    async (role) => {
      const f = await buildFixture();
      const failures: string[] = [];
      const cases = [...updateCases(f), ...createCases(f)];
      expect(cases.length).toBeGreaterThan(80);
      const people = [f.team, other].flatMap((t) => Object.values(t.members).map((m) => m.userId));
      for (const c of cases) {
        const { record, changedFields } = await c.build();
        const want = promised(role, c.entity, changedFields, c.inSigned);
        const before = await snapshot(ts.sequelize, tables, [f.team.teamId, other.teamId], people);
        const res = await f.agents[role].post('/api/sync/push').send({ idempotencyKey: batchKey(), changes: [{ entity: c.entity, record }] });
        const where = `${role} ${c.name}: ${res.status} ${JSON.stringify(res.body).slice(0, 300)}`;
        if (want === 'allowed') {
          if (res.status !== 200 || res.body.conflicts?.length) failures.push(`${where} — expected it to land`);
          else {
            const stored = await current(c.entity, record.id);
            for (const k of changedFields) if (!same(stored[k], record[k])) failures.push(`${where} — ${k} is ${JSON.stringify(stored[k])} in the database`);
          }
        } else {
          const status = want === 'forbidden' ? 403 : 400;
          if (res.status !== status) failures.push(`${where} — expected ${status}`);
          const fields: string[] = (res.body?.error?.fields ?? []).map((x: { field: string }) => x.field);
          if (want === 'refused' && !fields.includes(`body.changes.0.record.${c.named}`)) failures.push(`${where} — the answer does not name ${c.named}`);
          const diff = changedTables(before, await snapshot(ts.sequelize, tables, [f.team.teamId, other.teamId], people));
          if (diff.length) failures.push(`${where} — refused, yet ${diff.join(', ')} changed`);
        }
      }
      expect(failures).toEqual([]);
    },
    120_000,
  );
});

describe('what the probe did, through sync', () => {
  it('a tester cannot exclude a reading or delete a signed session; nothing of the batch lands', async () => {
    const f = await buildFixture();
    const tester = f.agents.tester;
    const reading = await current('reading', f.ids.r1);
    const res = await tester.post('/api/sync/push').send({
      idempotencyKey: batchKey(),
      changes: [{ entity: 'reading', record: { ...reading, valueMm: 999, excluded: true, excludeReason: 'excluded by tester via sync' } }],
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.map((x: { field: string }) => x.field)).toEqual(
      expect.arrayContaining(['body.changes.0.record.excluded', 'body.changes.0.record.excludeReason']),
    );
    expect(res.body.error.message).toMatch(/session\.review/);
    expect(await current('reading', f.ids.r1)).toMatchObject({ valueMm: 93.5, excluded: false, excludeReason: null, version: 1 });

    const signed = await current('testSession', f.ids.signedSession);
    const del = await tester
      .post('/api/sync/push')
      .send({ idempotencyKey: batchKey(), changes: [{ entity: 'testSession', record: { ...signed, deletedAt: new Date().toISOString() } }] });
    expect(del.status).toBe(400);
    expect(del.body.error.fields.map((x: { field: string }) => x.field)).toContain('body.changes.0.record.deletedAt');
    expect((await current('testSession', f.ids.signedSession)).deletedAt).toBeNull();
  });

  it("a whole record sent back with an engineer's exclusion in it, untouched, is no review change", async () => {
    const f = await buildFixture();
    const r = await current('reading', f.ids.r1);
    const excluded = await f.agents.engineer.patch(`/api/readings/${r.id}/review`).send({ version: r.version, excluded: true, excludeReason: 'tape slipped' });
    expect(excluded.status).toBe(200);
    const now = await current('reading', f.ids.r1);
    const res = await f.agents.tester
      .post('/api/sync/push')
      .send({ idempotencyKey: batchKey(), changes: [{ entity: 'reading', record: { ...now, valueMm: 94 } }] });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(await current('reading', f.ids.r1)).toMatchObject({ valueMm: 94, excluded: true, excludeReason: 'tape slipped' });
  });

  it('a kept conflict cannot carry a review change past the role: resolving it "keep this phone\'s" is refused for a tester', async () => {
    const f = await buildFixture();
    const r = await current('reading', f.ids.r1);
    // The desk changes the reading; the tester's stale edit (with an exclusion) is kept as a conflict.
    expect((await f.agents.engineer.patch(`/api/readings/${r.id}/review`).send({ version: r.version, flagNote: 'check' })).status).toBe(200);
    const push = await f.agents.tester.post('/api/sync/push').send({
      idempotencyKey: batchKey(),
      changes: [{ entity: 'reading', record: { ...r, excluded: true, excludeReason: 'excluded by tester' } }],
    });
    expect(push.status).toBe(200);
    expect(push.body.conflicts).toHaveLength(1);
    const conflictId = push.body.conflicts[0].id;
    const people = Object.values(f.team.members).map((m) => m.userId);
    const before = await snapshot(ts.sequelize, tables, [f.team.teamId], people);
    const res = await f.agents.tester.post(`/api/sync/conflicts/${conflictId}/resolve`).send({ keep: 'client' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.map((x: { field: string }) => x.field)).toContain('clientRecord.excluded');
    expect(changedTables(before, await snapshot(ts.sequelize, tables, [f.team.teamId], people))).toEqual([]);
    // An engineer may keep the phone's version.
    const ok = await f.agents.engineer.post(`/api/sync/conflicts/${conflictId}/resolve`).send({ keep: 'client' });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    expect(await current('reading', f.ids.r1)).toMatchObject({ excluded: true, excludeReason: 'excluded by tester' });
  });

  it("the history keeps each changed field's before and after value", async () => {
    const f = await buildFixture();
    const r = await current('reading', f.ids.r1);
    const res = await f.agents.engineer.post('/api/sync/push').send({
      idempotencyKey: batchKey(),
      changes: [{ entity: 'reading', record: { ...r, valueMm: 95, excluded: true, excludeReason: 'tape slipped' } }],
    });
    expect(res.status).toBe(200);
    const events = await ts.sequelize.query<{
      action: string;
      detail: Record<string, { before: unknown; after: unknown }>;
      session_id: string;
      user_id: string;
    }>(`SELECT action, detail, session_id, user_id FROM history_events WHERE entity_id = :id ORDER BY id`, {
      replacements: { id: r.id },
      type: QueryTypes.SELECT,
    });
    expect(events).toEqual([
      {
        action: 'reading.exclude',
        session_id: f.ids.openSession,
        user_id: f.team.members.engineer.userId,
        detail: { valueMm: { before: 93.5, after: 95 }, excluded: { before: false, after: true }, excludeReason: { before: null, after: 'tape slipped' } },
      },
    ]);
  });
});
