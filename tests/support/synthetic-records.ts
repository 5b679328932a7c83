// A flex session as records, built with the registry's factories from shared/flex's synthetic
// session (a rigid motion that grows with twist, plus seeded noise), read as raw gaps like the
// field does: the phone stores these as they are, and the desk fixtures write them through the models.
import { buildSyntheticSession } from '../../shared/flex';
import { newGaugePoint, newPose, newReading, newTestSession, newVehicle } from '../../shared/records';
import type { Reading, TestSession } from '../../shared/schemas';

export interface SyntheticRecordOptions {
  name: string;
  seed: number;
  testedOn: string;
  poses?: number;
  shearPerDeg?: number;
  session?: Partial<TestSession>;
}

export function syntheticRecords(opts: SyntheticRecordOptions) {
  const synthetic = buildSyntheticSession({
    poses: opts.poses ?? 6,
    gaugePoints: 6,
    seed: opts.seed,
    mode: 'gap',
    nominalGapMm: 90,
    motionPerDeg: { t: { x: 0.6, y: opts.shearPerDeg ?? 9, z: 1.2 }, omega: { x: 0.0012, y: 0.0002, z: -0.0004 } },
  });
  const o = synthetic.outline;
  const vehicle = newVehicle({
    name: opts.name,
    wheelbaseMm: 3800,
    trackFrontMm: synthetic.tracks.frontMm,
    trackRearMm: synthetic.tracks.rearMm,
    opening: { widthMm: o.width, heightMm: o.height, cornerRadiusMm: o.cornerRadius, centreYMm: o.centreY ?? 0, bottomZMm: o.bottomZ ?? 0 },
    nominalGapMm: 90,
  });
  const pointIds = new Map(synthetic.gaugePoints.map((g) => [g.id, crypto.randomUUID()]));
  const points = synthetic.gaugePoints.map((g) => newGaugePoint({ id: pointIds.get(g.id)!, vehicleId: vehicle.id, label: g.id, yMm: g.y, zMm: g.z }));
  const session = newTestSession({ vehicleId: vehicle.id, title: `Flex test ${opts.seed}`, testedOn: opts.testedOn, readingMode: 'gap', ...opts.session });
  const poses = synthetic.poses.map((p, i) =>
    newPose({
      sessionId: session.id,
      seq: i,
      label: i === 0 ? 'Level' : `Diagonal ${i}`,
      kind: i === 0 ? 'level' : 'wheels',
      liftFlMm: p.lifts.fl,
      liftFrMm: p.lifts.fr,
      liftRlMm: p.lifts.rl,
      liftRrMm: p.lifts.rr,
      recordedAt: new Date(Date.parse(`${opts.testedOn}T09:00:00Z`) + i * 600_000).toISOString(),
    }),
  );
  /** Each pose's readings, with the synthetic gauge point's label they were read at. */
  const readingsByPose: { pointLabel: string; reading: Reading }[][] = synthetic.poses.map((p, i) =>
    p.readings.map((r) => ({
      pointLabel: r.pointId,
      reading: newReading({ poseId: poses[i].id, gaugePointId: pointIds.get(r.pointId)!, axis: r.axis, valueMm: Math.round(r.value * 2) / 2 }),
    })),
  );
  return { vehicle, points, session, poses, readingsByPose };
}
