// From a session's records to the flex computation and back: the browser runs it as the engineer
// types, the server runs the same code from the database at sign-off, so both see one result.
// Poses are named for the computation by their label and sequence number and gauge points by
// their label, so its reasons and notes read in the crew's words rather than in ids.
import {
  bootSpan,
  designEnvelope,
  passThroughOptions,
  scaleMotion,
  type BootSpanResult,
  type EnvelopeFlag,
  type EnvelopeInput,
  type EnvelopeResult,
  type OpeningOutline,
  type PassThroughResult,
  type RigidMotion,
} from './flex';
import { plural } from './plural';
import type { GaugePoint, Opening, Pose, Reading, TestSession, Vehicle } from './schemas';
import type { AcknowledgedFlag, EnvelopeParams, EnvelopeSnapshotV2, SnapshotPose } from './schemas/envelope';

export interface DeskSessionData {
  session: Pick<TestSession, 'id' | 'title' | 'testedOn' | 'readingMode'>;
  vehicle: Pick<Vehicle, 'id' | 'name' | 'wheelbaseMm' | 'trackFrontMm' | 'trackRearMm' | 'nominalGapMm' | 'opening'>;
  gaugePoints: Pick<GaugePoint, 'id' | 'label' | 'yMm' | 'zMm'>[];
  poses: Pick<Pose, 'id' | 'seq' | 'label' | 'kind' | 'liftFlMm' | 'liftFrMm' | 'liftRlMm' | 'liftRrMm'>[];
  readings: Pick<Reading, 'id' | 'poseId' | 'gaugePointId' | 'axis' | 'valueMm' | 'excluded' | 'excludeReason' | 'version' | 'deletedAt'>[];
}

/** Poses twisted less than this are not scaled to the design twist for the boot check. */
const MIN_TWIST_FOR_SCALING_DEG = 0.5;

export function outlineOf(opening: Opening): OpeningOutline {
  return {
    width: opening.widthMm,
    height: opening.heightMm,
    cornerRadius: opening.cornerRadiusMm,
    centreY: opening.centreYMm,
    bottomZ: opening.bottomZMm,
  };
}

/** Each pose's name in the computation: "Label (#seq)", unique within the session. */
export function poseKeys(poses: DeskSessionData['poses']): Map<string, string> {
  const keys = new Map<string, string>();
  const used = new Set<string>();
  for (const pose of [...poses].sort((a, b) => a.seq - b.seq)) {
    const base = `${pose.label || 'Pose'} (#${pose.seq})`;
    let key = base;
    for (let n = 2; used.has(key); n++) key = `${base} ${n}`;
    used.add(key);
    keys.set(pose.id, key);
  }
  return keys;
}

/** The baseline: the level pose with the lowest sequence number. */
export function baselinePose(poses: DeskSessionData['poses']) {
  return [...poses].sort((a, b) => a.seq - b.seq).find((p) => p.kind === 'level');
}

/** Readings the computation uses: neither excluded nor deleted. */
export function usedReadings(data: DeskSessionData) {
  return data.readings.filter((r) => !r.excluded && !r.deletedAt);
}

export function toEnvelopeInput(data: DeskSessionData, params: EnvelopeParams): EnvelopeInput {
  const keys = poseKeys(data.poses);
  const labels = new Map(data.gaugePoints.map((g) => [g.id, g.label]));
  const byPose = new Map<string, EnvelopeInput['poses'][number]['readings']>();
  for (const r of usedReadings(data)) {
    const pointId = labels.get(r.gaugePointId);
    if (pointId === undefined) continue;
    const list = byPose.get(r.poseId) ?? [];
    list.push({ pointId, axis: r.axis, value: r.valueMm });
    byPose.set(r.poseId, list);
  }
  const baseline = baselinePose(data.poses);
  const { seal: _seal, design: _design, ...flexParams } = params;
  return {
    tracks: { frontMm: data.vehicle.trackFrontMm, rearMm: data.vehicle.trackRearMm },
    gaugePoints: data.gaugePoints.map((g) => ({ id: g.label, y: g.yMm, z: g.zMm })),
    outline: outlineOf(data.vehicle.opening),
    readingMode: data.session.readingMode,
    baselinePoseId: baseline ? keys.get(baseline.id) : undefined,
    poses: [...data.poses]
      .sort((a, b) => a.seq - b.seq)
      .map((p) => ({
        id: keys.get(p.id)!,
        lifts: { fl: p.liftFlMm, fr: p.liftFrMm, rl: p.liftRlMm, rr: p.liftRrMm },
        readings: byPose.get(p.id) ?? [],
      })),
    parameters: flexParams,
  };
}

export interface DeskEnvelope {
  result: EnvelopeResult;
  boot: BootSpanResult | null;
  /** Why the boot check could not run, or which motions it covered. */
  bootNote: string;
  /** The ways to close the pass-through for this envelope; null without a nominal fore-aft gap. */
  passThrough: PassThroughResult | null;
}

/** The pass-through options for a computed envelope: its design movement on the vehicle's opening. */
export function passThroughOf(vehicle: DeskSessionData['vehicle'], params: EnvelopeParams, result: EnvelopeResult): PassThroughResult | null {
  if (!(vehicle.nominalGapMm > 0)) return null;
  const {
    option: _option,
    driverSide: _side,
    fastening: _f,
    material: _m,
    drain: _d,
    fabricToleranceMm: _ft,
    frameToleranceMm: _fr,
    ...allowances
  } = params.design;
  return passThroughOptions({
    opening: { widthMm: vehicle.opening.widthMm, heightMm: vehicle.opening.heightMm, cornerRadiusMm: vehicle.opening.cornerRadiusMm },
    nominalGapMm: vehicle.nominalGapMm,
    movement: {
      foreAftOpeningMm: result.measures.foreAftOpening.envelopeMm,
      foreAftClosingMm: result.measures.foreAftClosing.envelopeMm,
      lateralMm: result.measures.lateral.envelopeMm,
      verticalMm: result.measures.vertical.envelopeMm,
    },
    allowances,
    seal: params.seal,
  });
}

/**
 * The envelope and the boot and seal check of a session. The boot check covers every fitted pose
 * motion and the same motions scaled to the design twist (the proportional model of the
 * envelope's tolerance method), so the spans reach the twist the vehicle is designed for.
 * Throws FlexInputError for input the computation cannot use.
 */
export function computeDeskEnvelope(data: DeskSessionData, params: EnvelopeParams): DeskEnvelope {
  const result = designEnvelope(toEnvelopeInput(data, params));
  if (!(data.vehicle.nominalGapMm > 0)) {
    return { result, boot: null, bootNote: 'no boot check: the vehicle has no nominal fore-aft gap set', passThrough: null };
  }
  const motions: RigidMotion[] = [];
  for (const pose of result.poses) {
    if (pose.fit === null) continue;
    motions.push(pose.fit.motion);
    if (Math.abs(pose.twistDeg) >= MIN_TWIST_FOR_SCALING_DEG) {
      motions.push(scaleMotion(pose.fit.motion, params.designTwistDeg / Math.abs(pose.twistDeg)));
    }
  }
  const boot = bootSpan({
    outline: outlineOf(data.vehicle.opening),
    nominalGapMm: data.vehicle.nominalGapMm,
    motions,
    seal: params.seal ?? undefined,
  });
  return {
    result,
    boot,
    passThrough: passThroughOf(data.vehicle, params, result),
    bootNote: `cover the fitted motion of ${plural(result.poses.filter((p) => p.fit).length, 'pose')}, each also scaled to the design twist of ${params.designTwistDeg}°`,
  };
}

/** A reading the outlier rule flags, named as the desk shows it. */
export interface DeskFlag {
  readingId: string;
  poseLabel: string;
  pointLabel: string;
  /** The reading as entered (raw gap or displacement). */
  enteredMm: number;
  flag: EnvelopeFlag;
}

/**
 * The flagged readings of a computed envelope, by reading id (the computation names poses by key and
 * gauge points by label). Excluded and deleted readings are not in the computation, so never here.
 */
export function deskFlags(data: DeskSessionData, result: EnvelopeResult): DeskFlag[] {
  const keyToPose = new Map([...poseKeys(data.poses)].map(([id, key]) => [key, id]));
  const labelToPoint = new Map(data.gaugePoints.map((g) => [g.label, g.id]));
  const readingAt = new Map(usedReadings(data).map((r) => [`${r.poseId}|${r.gaugePointId}|${r.axis}`, r]));
  const poseLabel = new Map(data.poses.map((p) => [p.id, p.label || `Pose ${p.seq}`]));
  const flags: DeskFlag[] = [];
  for (const flag of result.flags) {
    const poseId = keyToPose.get(flag.poseId);
    const reading = readingAt.get(`${poseId}|${labelToPoint.get(flag.pointId)}|${flag.axis}`);
    if (poseId === undefined || reading === undefined) continue;
    flags.push({ readingId: reading.id, poseLabel: poseLabel.get(poseId) ?? '', pointLabel: flag.pointId, enteredMm: reading.valueMm, flag });
  }
  return flags;
}

/**
 * The frozen record of a sign-off (hashed by the server): inputs, parameters, the computed envelope
 * and boot check, and the flagged readings kept in it with the engineer's acknowledgement of each.
 * Throws when a flagged reading has no acknowledgement: the caller asks for them first.
 */
export function buildSnapshot(
  data: DeskSessionData,
  params: EnvelopeParams,
  signature: { signedBy: { id: string; name: string }; signedAt: string; revision: number },
  envelope: DeskEnvelope,
  acknowledgements: ReadonlyMap<string, string>,
): EnvelopeSnapshotV2 {
  const { result, boot, bootNote, passThrough } = envelope;
  const acknowledgedFlags: AcknowledgedFlag[] = deskFlags(data, result).map((f) => {
    const note = acknowledgements.get(f.readingId);
    if (note === undefined) throw new Error(`buildSnapshot: flagged reading ${f.readingId} has no acknowledgement`);
    const { poseId: _pose, pointId: _point, ...flag } = f.flag;
    return { ...flag, readingId: f.readingId, poseLabel: f.poseLabel, pointLabel: f.pointLabel, enteredMm: f.enteredMm, note };
  });
  const keys = poseKeys(data.poses);
  const poses: SnapshotPose[] = [...data.poses]
    .sort((a, b) => a.seq - b.seq)
    .map((p) => ({
      id: p.id,
      key: keys.get(p.id)!,
      seq: p.seq,
      label: p.label,
      kind: p.kind,
      liftsMm: { fl: p.liftFlMm, fr: p.liftFrMm, rl: p.liftRlMm, rr: p.liftRrMm },
    }));
  const { vehicle, session } = data;
  return {
    format: 2,
    ...signature,
    vehicle: {
      id: vehicle.id,
      name: vehicle.name,
      wheelbaseMm: vehicle.wheelbaseMm,
      trackFrontMm: vehicle.trackFrontMm,
      trackRearMm: vehicle.trackRearMm,
      nominalGapMm: vehicle.nominalGapMm,
      opening: { ...vehicle.opening },
    },
    session: { id: session.id, title: session.title, testedOn: session.testedOn, readingMode: session.readingMode },
    gaugePoints: data.gaugePoints.map((g) => ({ id: g.id, label: g.label, yMm: g.yMm, zMm: g.zMm })),
    poses,
    readings: usedReadings(data).map((r) => ({
      id: r.id,
      poseId: r.poseId,
      gaugePointId: r.gaugePointId,
      axis: r.axis,
      valueMm: r.valueMm,
      version: r.version,
    })),
    excludedReadings: data.readings.filter((r) => r.excluded && !r.deletedAt).map((r) => ({ id: r.id, reason: r.excludeReason ?? '' })),
    params,
    result,
    acknowledgedFlags,
    boot,
    bootNote,
    passThrough,
  };
}
