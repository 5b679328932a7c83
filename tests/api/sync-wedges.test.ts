// Batches that pass the contract's validation but once made the push answer 500, so the phone
// retried the same batch forever: each is now refused with a 400 naming the record and field,
// accepted, or kept as a conflict, and never a 500.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTeam, signedInAgent, startTestServer, type Agent, type TestServer } from '../support/test-app';
import { batchKey, change, poseRecord, readingRecord, sessionRecord, vehicleWithPoints } from '../support/sync';
import { GaugePointModel, PoseModel, ReadingModel, SyncConflictModel, TestSessionModel } from '../../server/models';
import { newGaugePoint } from '../../shared/records';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

const push = (agent: Agent, ...changes: ReturnType<typeof change>[]) => agent.post('/api/sync/push').send({ idempotencyKey: batchKey(), changes });
const fields = (body: { error?: { fields?: { field: string }[] } }) => body.error?.fields?.map((f) => f.field);

async function twoPhones() {
  const team = await createTeam();
  const tester = await signedInAgent(ts, team.members.tester.email);
  const engineer = await signedInAgent(ts, team.members.engineer.email);
  const { vehicleId, pointIds } = await vehicleWithPoints(tester, ['A', 'B']);
  const session = sessionRecord(vehicleId);
  const level = poseRecord(session.id, 0);
  const ok = await push(tester, change('testSession', session), change('pose', level));
  expect(ok.status).toBe(200);
  const points = await GaugePointModel.findAll({ where: { vehicleId }, order: [['label', 'ASC']] });
  const point = (i: number) => ({
    id: points[i].id,
    version: points[i].version,
    vehicleId,
    label: points[i].label,
    yMm: points[i].yMm,
    zMm: points[i].zMm,
    deletedAt: null,
  });
  return { team, tester, engineer, vehicleId, pointIds, session, level, point };
}

describe('text and dates PostgreSQL cannot store are refused by the shared schema, naming the field', () => {
  it('a NUL character in any text field', async () => {
    const f = await twoPhones();
    const res = await push(
      f.tester,
      change('testSession', sessionRecord(f.vehicleId, { title: 'Yard\u0000test' })),
      change('pose', { ...f.level, version: 1, notes: 'chocks\u0000' }),
      change('gaugePoint', { ...f.point(0), label: 'A\u0000' }),
      change('reading', { ...readingRecord(f.level.id, f.pointIds[0], 'lateral', 12), flagNote: '\u0000' }),
    );
    expect(res.status).toBe(400);
    expect(fields(res.body)).toEqual([
      'body.changes.0.record.title',
      'body.changes.1.record.notes',
      'body.changes.2.record.label',
      'body.changes.3.record.flagNote',
    ]);
    expect(res.body.error.message).toMatch(/NUL/);
  });

  it('half of a surrogate pair (text PostgreSQL cannot store as JSON)', async () => {
    const f = await twoPhones();
    const res = await push(f.tester, change('pose', { ...f.level, label: 'Front \ud800 left' }));
    expect(res.status).toBe(400);
    expect(fields(res.body)).toEqual(['body.changes.0.record.label']);
  });

  it('a date in year 0000, and a time-zone offset beyond ±15:59', async () => {
    const f = await twoPhones();
    const res = await push(
      f.tester,
      change('testSession', sessionRecord(f.vehicleId, { testedOn: '0000-03-14', safetyAckAt: '2026-03-14T09:00:00+16:00' })),
      change('pose', poseRecord(f.session.id, 1, { recordedAt: '0000-03-14T09:00:00Z' })),
      change('pose', poseRecord(f.session.id, 2, { recordedAt: '2026-03-14T09:00:00-23:59' })),
    );
    expect(res.status).toBe(400);
    expect(fields(res.body)?.sort()).toEqual([
      'body.changes.0.record.safetyAckAt',
      'body.changes.0.record.testedOn',
      'body.changes.1.record.recordedAt',
      'body.changes.2.record.recordedAt',
    ]);
    // At the edge of what PostgreSQL takes: accepted.
    const edge = await push(f.tester, change('pose', poseRecord(f.session.id, 3, { recordedAt: '2026-03-14T09:00:00-15:59' })));
    expect(edge.status).toBe(200);
  });

  it('a version beyond what the column holds', async () => {
    const f = await twoPhones();
    const res = await push(f.tester, change('pose', { ...f.level, version: 2 ** 31 }));
    expect(res.status).toBe(400);
    expect(fields(res.body)).toEqual(['body.changes.0.record.version']);
  });
});

describe('gauge point labels renamed and added on two phones', () => {
  it('renaming a point and giving its old label to a new one, in one batch, lands', async () => {
    const f = await twoPhones();
    const added = newGaugePoint({ vehicleId: f.vehicleId, label: 'A', yMm: 0, zMm: 600 });
    const res = await push(f.tester, change('gaugePoint', { ...f.point(0), label: 'C' }), change('gaugePoint', added));
    expect(res.status).toBe(200);
    expect((await GaugePointModel.findAll({ where: { vehicleId: f.vehicleId, deletedAt: null } })).map((p) => p.label).sort()).toEqual(['A', 'B', 'C']);
  });

  it('two labels swapped in one batch land', async () => {
    const f = await twoPhones();
    const res = await push(f.tester, change('gaugePoint', { ...f.point(0), label: 'B' }), change('gaugePoint', { ...f.point(1), label: 'A' }));
    expect(res.status).toBe(200);
    expect((await GaugePointModel.findByPk(f.point(0).id))?.label).toBe('B');
  });

  it("the second phone's rename onto a label the first phone took is refused, naming it", async () => {
    const f = await twoPhones();
    const first = await push(f.tester, change('gaugePoint', { ...f.point(0), label: 'C' }));
    expect(first.status).toBe(200);
    const second = await push(f.engineer, change('gaugePoint', { ...f.point(1), label: 'C' }));
    expect(second.status).toBe(400);
    expect(fields(second.body)).toEqual(['body.changes.0.record.label']);
    expect(second.body.error.fields[0].message).toMatch(/label 'C' is already used on this vehicle/);
  });

  it('a stale rename kept as a conflict keeps its label: a new point taking it is refused, not a 500', async () => {
    const f = await twoPhones();
    expect((await push(f.tester, change('gaugePoint', { ...f.point(0), label: 'C' }))).status).toBe(200);
    // The second phone renamed A to D from version 1 and added a new point C.
    const added = newGaugePoint({ vehicleId: f.vehicleId, label: 'C', yMm: 10, zMm: 600 });
    const res = await push(f.engineer, change('gaugePoint', { ...f.point(0), version: 1, label: 'D' }), change('gaugePoint', added));
    expect(res.status).toBe(400);
    expect(fields(res.body)).toEqual(['body.changes.1.record.label']);
  });
});

describe('reading slots', () => {
  it('a reading moved out of its slot while another takes it, in one batch, lands', async () => {
    const f = await twoPhones();
    const r1 = readingRecord(f.level.id, f.pointIds[0], 'lateral', 90);
    expect((await push(f.tester, change('reading', r1))).status).toBe(200);
    const r2 = readingRecord(f.level.id, f.pointIds[0], 'lateral', 91);
    const res = await push(f.tester, change('reading', { ...r1, axis: 'vertical' }), change('reading', r2));
    expect(res.status).toBe(200);
    expect((await ReadingModel.findByPk(r1.id))?.axis).toBe('vertical');
    expect((await ReadingModel.findByPk(r2.id))?.axis).toBe('lateral');
  });

  it('a slot cleared on one phone takes a new reading from another', async () => {
    const f = await twoPhones();
    const r1 = readingRecord(f.level.id, f.pointIds[0], 'lateral', 90);
    await push(f.tester, change('reading', r1));
    expect((await push(f.tester, change('reading', { ...r1, deletedAt: new Date().toISOString() }))).status).toBe(200);
    const r2 = readingRecord(f.level.id, f.pointIds[0], 'lateral', 93);
    const res = await push(f.engineer, change('reading', r2));
    expect(res.status).toBe(200);
    expect(res.body.conflicts).toEqual([]);
  });

  it('a reading two phones typed into the same slot is kept as one conflict with the first, and "keep this phone\'s" lands once', async () => {
    const f = await twoPhones();
    const mine = readingRecord(f.level.id, f.pointIds[0], 'lateral', 90);
    await push(f.tester, change('reading', mine));
    const theirs = readingRecord(f.level.id, f.pointIds[0], 'lateral', 97);
    const res = await push(f.engineer, change('reading', theirs));
    expect(res.status).toBe(200);
    expect(res.body.accepted).toEqual([]);
    expect(res.body.conflicts).toEqual([
      expect.objectContaining({
        entity: 'reading',
        entityId: mine.id,
        clientRecord: expect.objectContaining({ id: theirs.id, valueMm: 97 }),
        serverRecord: expect.objectContaining({ valueMm: 90 }),
      }),
    ]);
    // Typed again on top, still not knowing: the same conflict, with the latest value.
    const again = await push(f.engineer, change('reading', { ...theirs, valueMm: 98 }));
    expect(again.body.conflicts[0].id).toBe(res.body.conflicts[0].id);
    expect(await SyncConflictModel.count({ where: { entityId: mine.id, resolvedAt: null } })).toBe(1);

    const id = res.body.conflicts[0].id;
    const keep = await f.engineer.post(`/api/sync/conflicts/${id}/resolve`).send({ keep: 'client' });
    expect(keep.status).toBe(200);
    const twice = await f.engineer.post(`/api/sync/conflicts/${id}/resolve`).send({ keep: 'client' });
    expect(twice.status).toBe(200);
    expect(twice.body).toEqual(keep.body);
    const row = await ReadingModel.findByPk(mine.id);
    expect([row?.valueMm, row?.version]).toEqual([98, 2]);
    expect(await ReadingModel.count({ where: { poseId: f.level.id } })).toBe(1);
    const other = await f.engineer.post(`/api/sync/conflicts/${id}/resolve`).send({ keep: 'server' });
    expect(other.status).toBe(409);
  });
});

describe('resolving a conflict with "keep this phone\'s"', () => {
  it('into a label taken since is refused naming the field, and the conflict stays open', async () => {
    const f = await twoPhones();
    expect((await push(f.tester, change('gaugePoint', { ...f.point(0), yMm: 301 }))).status).toBe(200);
    const stale = await push(f.engineer, change('gaugePoint', { ...f.point(0), version: 1, label: 'E' }));
    const conflictId = stale.body.conflicts[0].id;
    const added = newGaugePoint({ vehicleId: f.vehicleId, label: 'E', yMm: 0, zMm: 600 });
    expect((await push(f.tester, change('gaugePoint', added))).status).toBe(200);
    const res = await f.engineer.post(`/api/sync/conflicts/${conflictId}/resolve`).send({ keep: 'client' });
    expect(res.status).toBe(400);
    expect(fields(res.body)).toEqual(['clientRecord.label']);
    expect((await SyncConflictModel.findByPk(conflictId))?.resolvedAt).toBeNull();
    expect((await f.engineer.post(`/api/sync/conflicts/${conflictId}/resolve`).send({ keep: 'server' })).status).toBe(200);
  });

  it('into a reading slot taken since is refused naming the field', async () => {
    const f = await twoPhones();
    const r1 = readingRecord(f.level.id, f.pointIds[0], 'lateral', 90);
    await push(f.tester, change('reading', r1));
    expect((await push(f.tester, change('reading', { ...r1, valueMm: 91 }))).status).toBe(200);
    // A stale edit that also moves it to the vertical slot; then a vertical reading is typed there.
    const stale = await push(f.engineer, change('reading', { ...r1, version: 1, axis: 'vertical', valueMm: 95 }));
    expect(stale.body.conflicts).toHaveLength(1);
    expect((await push(f.tester, change('reading', readingRecord(f.level.id, f.pointIds[0], 'vertical', 40)))).status).toBe(200);
    const res = await f.engineer.post(`/api/sync/conflicts/${stale.body.conflicts[0].id}/resolve`).send({ keep: 'client' });
    expect(res.status).toBe(400);
    expect(fields(res.body)).toEqual(['clientRecord.axis']);
  });

  it('writes only what this phone changed onto the row as it is now', async () => {
    const f = await twoPhones();
    await push(f.tester, change('pose', { ...f.level, label: 'Level, tyres cold' }));
    const stale = await push(f.engineer, change('pose', { ...f.level, version: 1, liftFrMm: 410 }));
    expect(stale.body.conflicts).toHaveLength(1);
    await push(f.tester, change('pose', { ...f.level, version: 2, label: 'Level, tyres cold', notes: 'chocks in' }));
    const res = await f.engineer.post(`/api/sync/conflicts/${stale.body.conflicts[0].id}/resolve`).send({ keep: 'client' });
    expect(res.status).toBe(200);
    // The conflict kept label 'Level' on the phone vs 'Level, tyres cold' on the server, so the
    // phone's label is kept too; the note written after the conflict stays.
    expect(await PoseModel.findByPk(f.level.id)).toMatchObject({ liftFrMm: 410, label: 'Level', notes: 'chocks in', version: 4 });
    expect(await TestSessionModel.count({ where: { id: f.session.id } })).toBe(1);
  });
});

describe('a constraint PostgreSQL checks that the checks above missed', () => {
  it('is named from its key, never a 500', async () => {
    const { constraintKey, translateDbError } = await import('../../server/services/sync-db-errors');
    const detail =
      'Key (vehicle_id, label)=(8d9c3a52-0000-4000-8000-000000000000, A, B) conflicts with existing key (vehicle_id, label)=(8d9c3a52-0000-4000-8000-000000000000, A, B).';
    expect(constraintKey(detail)).toEqual({ vehicle_id: '8d9c3a52-0000-4000-8000-000000000000', label: 'A, B' });
    const pgError = { parent: { code: '23P01', constraint: 'gauge_points_label', detail } };
    expect(() =>
      translateDbError(pgError, (c, key) => (c === 'gauge_points_label' ? { field: 'body.changes.4.record.label', message: `'${key.label}' taken` } : null)),
    ).toThrow(expect.objectContaining({ status: 400, fields: [{ field: 'body.changes.4.record.label', message: "'A, B' taken" }] }));
    // Not pointing at any change: still a 400 saying what the database refused.
    expect(() => translateDbError({ parent: { code: '23505', detail: 'Key (id)=(x) already exists.' } }, () => null)).toThrow(
      expect.objectContaining({ status: 400, message: expect.stringMatching(/already exists/) }),
    );
    // The database gone: a 503, so the phone keeps the batch and tries again.
    expect(() => translateDbError({ parent: { message: 'Connection terminated unexpectedly' } }, () => null)).toThrow(expect.objectContaining({ status: 503 }));
  });

  it('the desk giving two gauge points one label is refused naming the point', async () => {
    const f = await twoPhones();
    const res = await push(
      f.engineer,
      change('gaugePoint', { ...f.point(0), label: 'A', yMm: 1, zMm: 2 }),
      change('gaugePoint', { ...f.point(1), label: 'A', yMm: 3, zMm: 4 }),
    );
    expect(res.status).toBe(400);
    expect(fields(res.body)).toEqual(['body.changes.1.record.label']);
  });
});
