// The registry's own promises: every field of a record has a column, every factory makes a record
// its schema accepts, and a field added after the first release has a default, so the records
// already on a phone and the batches already waiting in an outbox stay valid.
import { describe, expect, it } from 'vitest';
import { newGaugePoint, newPose, newReading, newRetestRequest, newTestSession, newVehicle, records, syncEntities, type SyncEntity } from './index';
import { pushRequest } from '../schemas/sync';

const VEHICLE_ID = '0d3c5a10-0000-4000-8000-000000000001';

describe('the record registry', () => {
  it('gives every field of every record a column (and only those)', () => {
    for (const entity of syncEntities) {
      const def = records[entity];
      expect([...Object.keys(def.columns), 'id', 'version', 'deletedAt'].sort(), entity).toEqual(Object.keys(def.schema.shape).sort());
    }
  });

  it('refers only to synced records', () => {
    for (const entity of syncEntities) {
      for (const target of Object.values(records[entity].references)) expect(syncEntities, `${entity} → ${target}`).toContain(target);
    }
  });

  it('lists parents before children, so a batch inserts in this order', () => {
    for (const [i, entity] of syncEntities.entries()) {
      for (const target of Object.values(records[entity].references))
        expect(syncEntities.indexOf(target as SyncEntity), `${entity} → ${target}`).toBeLessThan(i);
    }
  });

  it('makes records their schemas accept', () => {
    const made = {
      vehicle: newVehicle({ name: 'TC-01' }),
      gaugePoint: newGaugePoint({ vehicleId: VEHICLE_ID }),
      testSession: newTestSession({ vehicleId: VEHICLE_ID }),
      pose: newPose({ sessionId: VEHICLE_ID, seq: 0 }),
      reading: newReading({ poseId: VEHICLE_ID, gaugePointId: VEHICLE_ID, axis: 'lateral', valueMm: 12 }),
      retestRequest: newRetestRequest({ sessionId: VEHICLE_ID, comment: 'Read point A again' }),
    } satisfies Record<SyncEntity, unknown>;
    for (const entity of syncEntities) expect(records[entity].schema.safeParse(made[entity]).error, entity).toBeUndefined();
  });
});

// The fields each record had in the first release (migration 0001): whatever was added since must
// read back from a phone and arrive in a waiting batch without it.
const FIRST_RELEASE: Record<SyncEntity, string[]> = {
  vehicle: ['id', 'version', 'deletedAt', 'name', 'chassis', 'body', 'wheelbaseMm', 'trackFrontMm', 'trackRearMm', 'opening', 'nominalGapMm', 'notes'],
  gaugePoint: ['id', 'version', 'deletedAt', 'vehicleId', 'label', 'yMm', 'zMm'],
  testSession: [
    'id',
    'version',
    'deletedAt',
    'vehicleId',
    'title',
    'testedOn',
    'conditions',
    'loadState',
    'tyrePressures',
    'crew',
    'readingMode',
    'safetyAckAt',
    'notes',
  ],
  pose: [
    'id',
    'version',
    'deletedAt',
    'sessionId',
    'seq',
    'label',
    'kind',
    'liftFlMm',
    'liftFrMm',
    'liftRlMm',
    'liftRrMm',
    'rampAngleDeg',
    'rampDistanceMm',
    'notes',
    'recordedAt',
  ],
  reading: ['id', 'version', 'deletedAt', 'poseId', 'gaugePointId', 'axis', 'valueMm', 'excluded', 'excludeReason', 'flagNote'],
  // Added with migration 0006, whole.
  retestRequest: Object.keys(records.retestRequest.schema.shape),
};

const oldShaped = <T extends object>(record: T, entity: SyncEntity) =>
  Object.fromEntries(Object.entries(record).filter(([k]) => FIRST_RELEASE[entity].includes(k)));

describe('records made before a field existed', () => {
  const current = {
    vehicle: newVehicle({ name: 'TC-01' }),
    gaugePoint: newGaugePoint({ vehicleId: VEHICLE_ID }),
    testSession: newTestSession({ vehicleId: VEHICLE_ID }),
    // A ramp pose with its wheel (migration 0004 added the wheel on the ramp).
    pose: newPose({ sessionId: VEHICLE_ID, seq: 1, kind: 'ramp', rampAngleDeg: 20, rampDistanceMm: 1500, rampWheel: 'fl', liftFlMm: 513 }),
    reading: newReading({ poseId: VEHICLE_ID, gaugePointId: VEHICLE_ID, axis: 'lateral', valueMm: 12 }),
    retestRequest: newRetestRequest({ sessionId: VEHICLE_ID, poseId: VEHICLE_ID, gaugePointId: VEHICLE_ID, axis: 'vertical', comment: 'Tape slipped?' }),
  } satisfies Record<SyncEntity, unknown>;

  it.each(syncEntities)('a %s stored on a phone without the later fields still reads back, the new fields at their defaults', (entity) => {
    const parsed = records[entity].schema.safeParse(oldShaped(current[entity], entity));
    expect(parsed.error).toBeUndefined();
    for (const key of Object.keys(records[entity].schema.shape)) {
      if (!FIRST_RELEASE[entity].includes(key)) expect(parsed.data, `${entity}.${key} has a default`).toHaveProperty(key);
    }
  });

  it('a batch formed before the ramp wheel existed is still a valid push', () => {
    const parsed = pushRequest.safeParse({
      idempotencyKey: 'batch-formed-before-0004',
      changes: syncEntities.map((entity) => ({ entity, record: oldShaped(current[entity], entity) })),
    });
    expect(parsed.error).toBeUndefined();
    const pose = parsed.data!.changes.find((c) => c.entity === 'pose')!.record;
    expect(pose).toMatchObject({ kind: 'ramp', rampWheel: null, liftFlMm: 513 });
  });

  it('a field added without a default would fail here (the trap this test guards)', () => {
    const withoutDefault = records.pose.schema.extend({ addedWithoutDefault: records.pose.schema.shape.label });
    expect(withoutDefault.safeParse(oldShaped(current.pose, 'pose')).success).toBe(false);
  });
});

describe('a re-test request', () => {
  const base = newRetestRequest({ sessionId: VEHICLE_ID, poseId: VEHICLE_ID, comment: 'Pose 3 again, the rear left was off the boulder' });
  const problems = (r: object) => records.retestRequest.schema.safeParse(r).error?.issues.map((i) => `${i.path.join('.')}: ${i.message}`) ?? [];

  it('names a reading by its gauge point and axis together, in a pose', () => {
    expect(problems({ ...base, gaugePointId: VEHICLE_ID })).toEqual(['axis: a reading is named by its gauge point and its axis together']);
    expect(problems({ ...base, poseId: null, gaugePointId: VEHICLE_ID, axis: 'lateral' })).toEqual(['poseId: a reading is named in a pose: give the pose']);
  });

  it('is answered only with an answer, who and when; closed only with who and when', () => {
    expect(problems({ ...base, comment: '  ' })).toEqual(['comment: say what to measure again and why']);
    expect(problems({ ...base, state: 'answered' })).toEqual(['answer: an answered request needs the answer']);
    expect(problems({ ...base, state: 'answered', answer: 'Read again: 41 mm', answeredAt: '2026-05-02T10:00:00Z' })).toEqual([
      'answeredBy: an answer carries who answered and when, together',
    ]);
    expect(problems({ ...base, state: 'answered', answer: 'Read again: 41 mm', answeredAt: '2026-05-02T10:00:00Z', answeredBy: VEHICLE_ID })).toEqual([]);
    expect(problems({ ...base, state: 'closed' })).toEqual(['closedAt: a closed request needs when it was closed']);
    expect(problems({ ...base, closedAt: '2026-05-02T10:00:00Z', closedBy: VEHICLE_ID })).toEqual(['closedAt: only a closed request has a closing time']);
  });
});
