// Records for sync tests: a vehicle with gauge points, a session, poses and readings as the field
// client would push them (client UUIDs, version 1).
import { randomUUID } from 'node:crypto';
import type { Agent } from './test-app';
import { vehicleBody } from './test-app';

export function sessionRecord(vehicleId: string, overrides: Record<string, unknown> = {}) {
  return {
    id: randomUUID(),
    version: 1,
    vehicleId,
    title: 'Yard flex test',
    testedOn: '2026-03-14',
    conditions: 'dry gravel',
    loadState: 'water full, camper empty',
    tyrePressures: '4.5 bar all round',
    crew: 'tester and spotter',
    readingMode: 'gap',
    safetyAckAt: new Date().toISOString(),
    notes: '',
    ...overrides,
  };
}

export function poseRecord(sessionId: string, seq: number, overrides: Record<string, unknown> = {}) {
  return {
    id: randomUUID(),
    version: 1,
    sessionId,
    seq,
    label: seq === 0 ? 'Level' : `Pose ${seq}`,
    kind: seq === 0 ? 'level' : 'wheels',
    liftFlMm: seq === 0 ? 0 : 300,
    liftFrMm: 0,
    liftRlMm: 0,
    liftRrMm: 0,
    rampAngleDeg: null,
    rampDistanceMm: null,
    notes: '',
    recordedAt: new Date().toISOString(),
    ...overrides,
  };
}

export function readingRecord(poseId: string, gaugePointId: string, axis: 'foreAft' | 'lateral' | 'vertical', valueMm: number) {
  return { id: randomUUID(), version: 1, poseId, gaugePointId, axis, valueMm, excluded: false, excludeReason: null, flagNote: null };
}

/** A vehicle with gauge points, created through the REST routes the desk uses. */
export async function vehicleWithPoints(agent: Agent, labels = ['A', 'B', 'C', 'D']) {
  const v = vehicleBody();
  const created = await agent.post('/api/vehicles').send(v);
  if (created.status !== 201) throw new Error(`vehicle: ${created.status} ${JSON.stringify(created.body)}`);
  const layout = [[300, 800], [-300, 800], [-300, 400], [300, 400], [0, 850], [0, 380]];
  const points = labels.map((label, i) => ({ id: randomUUID(), label, yMm: layout[i % layout.length][0], zMm: layout[i % layout.length][1] + Math.floor(i / layout.length) }));
  const res = await agent.put(`/api/vehicles/${v.id}/gauge-points`).send({ gaugePoints: points });
  if (res.status !== 200) throw new Error(`gauge points: ${res.status} ${JSON.stringify(res.body)}`);
  return { vehicleId: v.id, pointIds: points.map((p) => p.id) };
}

export const change = (entity: string, record: Record<string, unknown>) => ({ entity, record });
export const batchKey = () => `batch-${randomUUID()}`;
