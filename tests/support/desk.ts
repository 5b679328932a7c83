// Desk test data: a vehicle with gauge points and a flex session (level baseline + twisted poses)
// from synthetic-records.ts, written through the models.
import { GaugePointModel, PoseModel, ReadingModel, TestSessionModel, VehicleModel } from '../../server/models';
import { syntheticRecords } from './synthetic-records';
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
  const tester = team.members.tester.userId;
  const teamId = team.teamId;
  const made = syntheticRecords({
    name: opts.name ?? 'Test truck',
    seed: opts.seed ?? 7,
    testedOn: '2026-11-18',
    poses: opts.poses,
    shearPerDeg: opts.shearPerDeg,
  });
  await VehicleModel.create({ ...made.vehicle, teamId });
  await GaugePointModel.bulkCreate(made.points.map((g) => ({ ...g, teamId })));
  await TestSessionModel.create({ ...made.session, teamId, createdBy: tester });
  await PoseModel.bulkCreate(made.poses.map((p) => ({ ...p, teamId, createdBy: tester })));
  const readingIds = new Map<string, string>();
  const readingIdList: string[] = [];
  for (const [i, readings] of made.readingsByPose.entries()) {
    await ReadingModel.bulkCreate(readings.map(({ reading }) => ({ ...reading, teamId, enteredBy: tester })));
    for (const { pointLabel, reading } of readings) {
      readingIds.set(`${i}:${pointLabel}:${reading.axis}`, reading.id);
      readingIdList.push(reading.id);
    }
  }
  const vehicleId = made.vehicle.id;
  const sessionId = made.session.id;
  const poseIds = made.poses.map((p) => p.id);
  return { vehicleId, sessionId, poseIds, readingIds, readingIdList };
}
