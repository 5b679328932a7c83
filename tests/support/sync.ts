// Records for sync tests, made by the registry's factories (shared/records) with a test outing's
// values: a vehicle with gauge points, a session, poses and readings as the field client would push
// them (client UUIDs, version 1).
import { randomUUID } from 'node:crypto';
import { newGaugePoint, newPose, newReading, newTestSession, newVehicle } from '../../shared/records';
import type { Agent } from './test-app';

/** A vehicle as a test workshop sets one up (a medium 4×4 with a box body). */
export function vehicleRecord(overrides: Record<string, unknown> = {}) {
  return { ...newVehicle({ name: 'Test truck', chassis: 'Medium 4×4', body: 'Box body', trackRearMm: 1880 }), ...overrides };
}

export function sessionRecord(vehicleId: string, overrides: Record<string, unknown> = {}) {
  return {
    ...newTestSession({
      vehicleId,
      title: 'Yard flex test',
      testedOn: '2026-03-14',
      conditions: 'dry gravel',
      loadState: 'water full, camper empty',
      tyrePressures: '4.5 bar all round',
      crew: 'tester and spotter',
      safetyAckAt: new Date().toISOString(),
    }),
    ...overrides,
  };
}

/** Pose `seq` of a session: the level baseline at 0, then the front left wheel on a 300 mm block. */
export function poseRecord(sessionId: string, seq: number, overrides: Record<string, unknown> = {}) {
  return {
    ...newPose({ sessionId, seq, label: seq === 0 ? 'Level' : `Pose ${seq}`, kind: seq === 0 ? 'level' : 'wheels', liftFlMm: seq === 0 ? 0 : 300 }),
    ...overrides,
  };
}

export function readingRecord(poseId: string, gaugePointId: string, axis: 'foreAft' | 'lateral' | 'vertical', valueMm: number) {
  return newReading({ poseId, gaugePointId, axis, valueMm });
}

const POINT_LAYOUT = [
  [300, 800],
  [-300, 800],
  [-300, 400],
  [300, 400],
  [0, 850],
  [0, 380],
];

/** Gauge points of a vehicle, labelled as given, placed around a common opening. */
export function gaugePointRecords(vehicleId: string, labels: string[]) {
  return labels.map((label, i) =>
    newGaugePoint({
      vehicleId,
      label,
      yMm: POINT_LAYOUT[i % POINT_LAYOUT.length][0],
      zMm: POINT_LAYOUT[i % POINT_LAYOUT.length][1] + Math.floor(i / POINT_LAYOUT.length),
    }),
  );
}

/** Pushes one batch of changes and fails loudly unless every one was accepted. */
export async function pushAccepted(agent: Agent, changes: { entity: string; record: Record<string, unknown> }[]) {
  const res = await agent.post('/api/sync/push').send({ idempotencyKey: batchKey(), changes });
  if (res.status !== 200 || res.body.accepted?.length !== changes.length) throw new Error(`push: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body as { accepted: { entity: string; id: string; version: number }[] };
}

/** A vehicle with gauge points, set up through sync push as the setup screen's phone store sends them. */
export async function vehicleWithPoints(agent: Agent, labels = ['A', 'B', 'C', 'D']) {
  const v = vehicleRecord();
  const points = gaugePointRecords(v.id, labels);
  await pushAccepted(agent, [change('vehicle', v), ...points.map((p) => change('gaugePoint', p))]);
  return { vehicleId: v.id, pointIds: points.map((p) => p.id) };
}

export const change = (entity: string, record: Record<string, unknown>) => ({ entity, record });
export const batchKey = () => `batch-${randomUUID()}`;
