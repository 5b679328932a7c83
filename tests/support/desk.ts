// Desk test data: a vehicle with gauge points and a flex session (level baseline + twisted poses)
// written through the models, readings from shared/flex's synthetic session (a rigid motion that
// grows with twist, plus seeded noise), entered as raw gaps like the field does.
import { randomUUID } from 'node:crypto';
import { GaugePointModel, PoseModel, ReadingModel, TestSessionModel, VehicleModel } from '../../server/models';
import { buildSyntheticSession } from '../../shared/flex';
import { newGaugePoint, newPose, newReading, newTestSession, newVehicle } from '../../shared/records';
import type { TestTeam } from './test-app';

export interface DeskSession {
  vehicleId: string;
  sessionId: string;
  poseIds: string[];
  /** Reading ids by `${poseIndex}:${pointLabel}:${axis}`. */
  readingIds: Map<string, string>;
  readingIdList: string[];
}

export async function createDeskSession(
  team: TestTeam,
  opts: { name?: string; seed?: number; poses?: number; shearPerDeg?: number } = {},
): Promise<DeskSession> {
  const synthetic = buildSyntheticSession({
    poses: opts.poses ?? 6,
    gaugePoints: 6,
    seed: opts.seed ?? 7,
    mode: 'gap',
    nominalGapMm: 90,
    motionPerDeg: {
      t: { x: 0.6, y: opts.shearPerDeg ?? 9, z: 1.2 },
      omega: { x: 0.0012, y: 0.0002, z: -0.0004 },
    },
  });
  const tester = team.members.tester.userId;
  const vehicleId = randomUUID();
  const o = synthetic.outline;
  await VehicleModel.create({
    ...newVehicle({
      id: vehicleId,
      name: opts.name ?? 'Test truck',
      wheelbaseMm: 3800,
      trackFrontMm: synthetic.tracks.frontMm,
      trackRearMm: synthetic.tracks.rearMm,
      opening: { widthMm: o.width, heightMm: o.height, cornerRadiusMm: o.cornerRadius, centreYMm: o.centreY ?? 0, bottomZMm: o.bottomZ ?? 0 },
      nominalGapMm: 90,
    }),
    teamId: team.teamId,
  });
  const pointIds = new Map<string, string>();
  for (const g of synthetic.gaugePoints) {
    const gid = randomUUID();
    pointIds.set(g.id, gid);
    await GaugePointModel.create({ ...newGaugePoint({ id: gid, vehicleId, label: g.id, yMm: g.y, zMm: g.z }), teamId: team.teamId });
  }
  const sessionId = randomUUID();
  await TestSessionModel.create({
    ...newTestSession({ id: sessionId, vehicleId, title: `Flex test ${opts.seed ?? 7}`, testedOn: '2026-11-18', readingMode: 'gap' }),
    teamId: team.teamId,
    createdBy: tester,
  });
  const poseIds: string[] = [];
  const readingIds = new Map<string, string>();
  const readingIdList: string[] = [];
  for (const [i, pose] of synthetic.poses.entries()) {
    const poseId = randomUUID();
    poseIds.push(poseId);
    await PoseModel.create({
      ...newPose({
        id: poseId,
        sessionId,
        seq: i,
        label: i === 0 ? 'Level' : `Diagonal ${i}`,
        kind: i === 0 ? 'level' : 'wheels',
        liftFlMm: pose.lifts.fl,
        liftFrMm: pose.lifts.fr,
        liftRlMm: pose.lifts.rl,
        liftRrMm: pose.lifts.rr,
        recordedAt: new Date(Date.parse('2026-11-18T09:00:00Z') + i * 600_000).toISOString(),
      }),
      teamId: team.teamId,
      createdBy: tester,
    });
    const rows = pose.readings.map((r) => ({
      ...newReading({ poseId, gaugePointId: pointIds.get(r.pointId)!, axis: r.axis, valueMm: Math.round(r.value * 2) / 2 }),
      teamId: team.teamId,
      enteredBy: tester,
    }));
    await ReadingModel.bulkCreate(rows);
    for (const [k, r] of rows.entries()) {
      readingIds.set(`${i}:${pose.readings[k].pointId}:${r.axis}`, r.id);
      readingIdList.push(r.id);
    }
  }
  return { vehicleId, sessionId, poseIds, readingIds, readingIdList };
}
