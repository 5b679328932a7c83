// Model rows → the API's records (the shapes of shared/schemas). One place per record.
import type { GaugePoint, Pose, Reading, TestSession, Vehicle } from '../../shared/schemas';
import type { GaugePointModel, PoseModel, ReadingModel, TestSessionModel, VehicleModel } from '../models';

const iso = (d: Date | null | undefined) => (d ? new Date(d).toISOString() : null);

export const vehicleOut = (v: VehicleModel): Vehicle & { changeSeq: number } => ({
  id: v.id,
  version: v.version,
  deletedAt: iso(v.deletedAt),
  name: v.name,
  chassis: v.chassis,
  body: v.body,
  wheelbaseMm: v.wheelbaseMm,
  trackFrontMm: v.trackFrontMm,
  trackRearMm: v.trackRearMm,
  opening: v.opening,
  nominalGapMm: v.nominalGapMm,
  notes: v.notes,
  changeSeq: v.changeSeq,
});

export const gaugePointOut = (g: GaugePointModel): GaugePoint & { changeSeq: number } => ({
  id: g.id,
  version: g.version,
  deletedAt: iso(g.deletedAt),
  vehicleId: g.vehicleId,
  label: g.label,
  yMm: g.yMm,
  zMm: g.zMm,
  changeSeq: g.changeSeq,
});

export const testSessionOut = (s: TestSessionModel): TestSession & { changeSeq: number } => ({
  id: s.id,
  version: s.version,
  deletedAt: iso(s.deletedAt),
  vehicleId: s.vehicleId,
  title: s.title,
  testedOn: s.testedOn,
  conditions: s.conditions,
  loadState: s.loadState,
  tyrePressures: s.tyrePressures,
  crew: s.crew,
  readingMode: s.readingMode,
  safetyAckAt: iso(s.safetyAckAt),
  notes: s.notes,
  changeSeq: s.changeSeq,
});

export const poseOut = (p: PoseModel): Pose & { changeSeq: number } => ({
  id: p.id,
  version: p.version,
  deletedAt: iso(p.deletedAt),
  sessionId: p.sessionId,
  seq: p.seq,
  label: p.label,
  kind: p.kind,
  liftFlMm: p.liftFlMm,
  liftFrMm: p.liftFrMm,
  liftRlMm: p.liftRlMm,
  liftRrMm: p.liftRrMm,
  rampAngleDeg: p.rampAngleDeg,
  rampDistanceMm: p.rampDistanceMm,
  rampWheel: p.rampWheel ?? null,
  notes: p.notes,
  recordedAt: iso(p.recordedAt)!,
  changeSeq: p.changeSeq,
});

export const readingOut = (r: ReadingModel): Reading & { changeSeq: number; enteredBy: string } => ({
  id: r.id,
  version: r.version,
  deletedAt: iso(r.deletedAt),
  poseId: r.poseId,
  gaugePointId: r.gaugePointId,
  axis: r.axis,
  valueMm: r.valueMm,
  excluded: r.excluded,
  excludeReason: r.excludeReason,
  flagNote: r.flagNote,
  enteredBy: r.enteredBy,
  changeSeq: r.changeSeq,
});
