/**
 * Design envelope of a session: per axis, the movement the boot or seals must absorb (brief steps 1–7).
 *
 * Steps, per pose: displacements (pose − baseline in 'gap' mode, or as entered in 'displacement'
 * mode) → cross-axle twist from the lifts → relative-motion fit → worst perimeter displacement.
 * Then per axis (foreAft, lateral, vertical):
 * - measured worst = the largest |worst perimeter displacement| over the poses (sign kept);
 * - 'prediction' method: least-squares line of |worst| against |twist| (through the origin by default),
 *   projected to the design twist D, with the one-sided upper prediction bound
 *   ŷ(D) + t(confidence, df)·s·√(1 + h(D)) (see linearFit);
 * - 'tolerance' method, for repeated runs of one pose: each run's |worst| scaled to the design twist
 *   in proportion (|worst| × D / |twist|, the same no-twist-no-motion model), then the one-sided
 *   normal tolerance bound mean + k1·s (coverage p, confidence gamma; see oneSidedToleranceFactor);
 * - envelope = max(measured worst, upper bound) × (1 + margin) + allowance, rounded up to the
 *   fabrication increment; `governing` and `reasons` say which term decided and why.
 * The baseline pose is never a data point of the fit. Outlier flags are reported, never acted on:
 * the engineer decides and re-runs without the readings rejected.
 * Source: brief "The computation" steps 1–7; Draper & Smith §3.1 (prediction interval);
 * NIST/SEMATECH e-Handbook §7.2.6.3 (tolerance bound). Complexity O(poses × readings).
 *
 * Example: designEnvelope({ ...session, parameters: { designTwistDeg: 12 } }).axes.lateral.envelopeMm
 */
import { FlexInputError, requireFinite, requireLength, requireNonNegative, requirePositiveLength, requireProbability } from './errors';
import { computeDisplacements } from './displacements';
import { linearFit, type LinearFitSummary } from './linear-fit';
import { perimeterWorst, validateOutline, type AxisWorst, type OpeningOutline, type PerimeterWorst } from './perimeter';
import { fitRelativeMotion, type RelativeMotionFit } from './relative-motion';
import { roundUpToIncrement } from './round-up';
import { oneSidedToleranceFactor } from './tolerance-factor';
import { crossAxleTwistDeg } from './twist';
import { AXES, type Axis, type GaugePoint, type Reading, type WheelLifts } from './types';

export type EnvelopeMethod = 'prediction' | 'tolerance';
export type ReadingMode = 'gap' | 'displacement';

export interface EnvelopeParameters {
  /** The most twist the vehicle is expected to see in service, degrees (> 0). */
  designTwistDeg: number;
  method: EnvelopeMethod;
  /** One-sided confidence of the bound, e.g. 0.95. */
  confidence: number;
  /** Tolerance method only: fraction of the population the bound covers, e.g. 0.90. */
  coverage: number;
  /** Fraction added on top of the bound, e.g. 0.15 for 15 %. */
  margin: number;
  /** Fixed mm added after the margin (fitting slack, seal lip). */
  allowanceMm: number;
  /** Fabrication increment the envelope is rounded up to, e.g. 5 mm or 6.35 mm (1/4 in). */
  incrementMm: number;
  /** Prediction method: fit the line through (0, 0), since no twist means no motion. */
  throughOrigin: boolean;
}

/** Defaults are common practice for a first envelope; the engineer sets the design twist. */
export const DEFAULT_ENVELOPE_PARAMETERS: Omit<EnvelopeParameters, 'designTwistDeg'> = {
  method: 'prediction',
  confidence: 0.95,
  coverage: 0.9,
  margin: 0.15,
  allowanceMm: 10,
  incrementMm: 5,
  throughOrigin: true,
};

export interface EnvelopePose {
  id: string;
  lifts: WheelLifts;
  readings: Reading[];
}

export interface EnvelopeInput {
  tracks: { frontMm: number; rearMm: number };
  gaugePoints: GaugePoint[];
  outline: OpeningOutline;
  readingMode: ReadingMode;
  /** The level pose; required in 'gap' mode. Never a data point of the fit. */
  baselinePoseId?: string;
  poses: EnvelopePose[];
  parameters: Partial<EnvelopeParameters> & { designTwistDeg: number };
}

export interface PoseResult {
  poseId: string;
  isBaseline: boolean;
  twistDeg: number;
  /** Displacements the fit used (mm). */
  displacements: Reading[];
  /** 'gap' mode: readings with no baseline reading at the same point and axis (not used). */
  missingBaseline: Reading[];
  /** null for the baseline and for a pose with no usable readings. */
  fit: RelativeMotionFit | null;
  worst: PerimeterWorst | null;
  note: string | null;
}

export interface ToleranceSummary {
  n: number;
  meanMm: number;
  sdMm: number;
  k1: number;
  coverage: number;
  confidence: number;
}

export interface AxisEnvelope {
  axis: Axis;
  /** Largest |worst perimeter displacement| over the poses, sign kept (mm). */
  measuredWorstMm: number;
  measuredWorstPoseId: string;
  measuredWorstAt: Omit<AxisWorst, 'valueMm'>;
  /** Prediction method: the line of |worst| on |twist|; null when too few poses. */
  fit: LinearFitSummary | null;
  /** Tolerance method: the statistics of the scaled runs; null otherwise or when too few runs. */
  tolerance: ToleranceSummary | null;
  /** Line value (prediction) or mean of scaled runs (tolerance) at the design twist; null if none. */
  projectedMm: number | null;
  upperBoundMm: number | null;
  governing: 'measured' | 'upperBound';
  baseMm: number;
  withMarginMm: number;
  withAllowanceMm: number;
  envelopeMm: number;
  reasons: string[];
}

export interface EnvelopeResult {
  parameters: EnvelopeParameters;
  poses: PoseResult[];
  axes: Record<Axis, AxisEnvelope>;
  /** Session-wide remarks for the engineer (extrapolation distance, flagged readings, skipped poses). */
  notes: string[];
}

const FN = 'designEnvelope';
/** Poses twisted less than this carry no usable ratio for the tolerance method's scaling. */
const MIN_TWIST_FOR_SCALING_DEG = 0.5;
/** Beyond this the small-angle model and the straight line are stretched too far to trust quietly. */
const FAR_EXTRAPOLATION = 1.5;

function mm(value: number): string {
  return `${value.toFixed(1)} mm`;
}

function resolveParameters(raw: EnvelopeInput['parameters']): EnvelopeParameters {
  if (raw === null || typeof raw !== 'object') throw new FlexInputError(FN, 'parameters', 'must be an object');
  const p: EnvelopeParameters = { ...DEFAULT_ENVELOPE_PARAMETERS, ...raw };
  requireFinite(FN, 'parameters.designTwistDeg', p.designTwistDeg);
  if (p.designTwistDeg <= 0 || p.designTwistDeg > 90) {
    throw new FlexInputError(FN, 'parameters.designTwistDeg', `must be greater than 0 and at most 90 degrees, got ${p.designTwistDeg}`);
  }
  if (p.method !== 'prediction' && p.method !== 'tolerance') {
    throw new FlexInputError(FN, 'parameters.method', `must be 'prediction' or 'tolerance', got '${String(p.method)}'`);
  }
  requireProbability(FN, 'parameters.confidence', p.confidence);
  requireProbability(FN, 'parameters.coverage', p.coverage);
  requireNonNegative(FN, 'parameters.margin', p.margin);
  if (p.margin > 10) throw new FlexInputError(FN, 'parameters.margin', `is a fraction (0.15 = 15 %), got ${p.margin}`);
  requireLength(FN, 'parameters.allowanceMm', p.allowanceMm);
  requireNonNegative(FN, 'parameters.allowanceMm', p.allowanceMm);
  requirePositiveLength(FN, 'parameters.incrementMm', p.incrementMm);
  if (typeof p.throughOrigin !== 'boolean') throw new FlexInputError(FN, 'parameters.throughOrigin', 'must be true or false');
  return p;
}

/** Re-raises an inner function's input error under designEnvelope and the pose's field path. */
function withinPose<T>(index: number, compute: () => T): T {
  try {
    return compute();
  } catch (error) {
    if (error instanceof FlexInputError) throw new FlexInputError(FN, `poses[${index}] (${error.fn} ${error.field})`, error.problem);
    throw error;
  }
}

function evaluatePoses(input: EnvelopeInput): PoseResult[] {
  const { poses, readingMode, baselinePoseId } = input;
  if (!Array.isArray(poses) || poses.length === 0) throw new FlexInputError(FN, 'poses', 'must be a non-empty array');
  const ids = new Set<string>();
  poses.forEach((pose, i) => {
    if (pose === null || typeof pose !== 'object' || typeof pose.id !== 'string') throw new FlexInputError(FN, `poses[${i}].id`, 'must be a string');
    if (ids.has(pose.id)) throw new FlexInputError(FN, `poses[${i}].id`, `repeats pose id '${pose.id}'`);
    if (!Array.isArray(pose.readings)) throw new FlexInputError(FN, `poses[${i}].readings`, 'must be an array');
    ids.add(pose.id);
  });
  if (readingMode !== 'gap' && readingMode !== 'displacement') {
    throw new FlexInputError(FN, 'readingMode', `must be 'gap' or 'displacement', got '${String(readingMode)}'`);
  }
  if (baselinePoseId !== undefined && !ids.has(baselinePoseId)) {
    throw new FlexInputError(FN, 'baselinePoseId', `names no pose of the session: '${String(baselinePoseId)}'`);
  }
  if (readingMode === 'gap' && baselinePoseId === undefined) {
    throw new FlexInputError(FN, 'baselinePoseId', "is required when readings are raw gaps (readingMode 'gap')");
  }
  const baseline = poses.find((pose) => pose.id === baselinePoseId);

  return poses.map((pose, i): PoseResult => {
    const twistDeg = withinPose(i, () => crossAxleTwistDeg(pose.lifts, input.tracks.frontMm, input.tracks.rearMm));
    const isBaseline = pose.id === baselinePoseId;
    const { displacements, missingBaseline } =
      readingMode === 'gap' && baseline !== undefined
        ? withinPose(i, () => computeDisplacements(baseline.readings, pose.readings))
        : { displacements: pose.readings, missingBaseline: [] };
    const empty = { poseId: pose.id, isBaseline, twistDeg, displacements, missingBaseline, fit: null, worst: null };
    if (isBaseline) return { ...empty, note: 'baseline (level pose)' };
    if (displacements.length === 0) return { ...empty, note: 'no usable readings: left out of the envelope' };
    const fit = withinPose(i, () => fitRelativeMotion(input.gaugePoints, displacements));
    return { ...empty, fit, worst: perimeterWorst(fit.motion, input.outline), note: null };
  });
}

function measuredCount(poses: readonly PoseResult[]): number {
  return poses.filter((pose) => pose.fit !== null).length;
}

interface AxisBound {
  fit: LinearFitSummary | null;
  tolerance: ToleranceSummary | null;
  projectedMm: number | null;
  upperBoundMm: number | null;
  label: string;
  unavailable: string | null;
}

function predictionBound(twists: number[], worsts: number[], p: EnvelopeParameters): AxisBound {
  const confidencePct = `${(p.confidence * 100).toFixed(0)} %`;
  const label = `upper ${confidencePct} prediction bound at ${p.designTwistDeg}°`;
  const needed = p.throughOrigin ? 2 : 3;
  const usable = p.throughOrigin ? twists.some((x) => x !== 0) : new Set(twists).size >= 2;
  if (twists.length < needed || !usable) {
    return {
      fit: null,
      tolerance: null,
      projectedMm: null,
      upperBoundMm: null,
      label,
      unavailable: `no prediction bound: needs at least ${needed} poses with ${p.throughOrigin ? 'some twist' : 'two different twists'}`,
    };
  }
  const line = linearFit(twists, worsts, { throughOrigin: p.throughOrigin });
  const { slope, intercept, throughOrigin, n, df, residualSd, rSquared } = line;
  return {
    fit: { slope, intercept, throughOrigin, n, df, residualSd, rSquared },
    tolerance: null,
    projectedMm: line.predict(p.designTwistDeg),
    upperBoundMm: line.upperPredictionBound(p.designTwistDeg, p.confidence),
    label,
    unavailable: null,
  };
}

function toleranceBound(twists: number[], worsts: number[], p: EnvelopeParameters, k1For: (n: number) => number): AxisBound {
  const label = `one-sided tolerance bound (coverage ${(p.coverage * 100).toFixed(0)} %, confidence ${(p.confidence * 100).toFixed(0)} %) at ${p.designTwistDeg}°`;
  const scaled: number[] = [];
  twists.forEach((twist, i) => {
    if (twist >= MIN_TWIST_FOR_SCALING_DEG) scaled.push((worsts[i] * p.designTwistDeg) / twist);
  });
  if (scaled.length < 2) {
    return {
      fit: null,
      tolerance: null,
      projectedMm: null,
      upperBoundMm: null,
      label,
      unavailable: `no tolerance bound: needs at least 2 runs twisted ${MIN_TWIST_FOR_SCALING_DEG}° or more`,
    };
  }
  const n = scaled.length;
  const meanMm = scaled.reduce((a, b) => a + b, 0) / n;
  const sdMm = Math.sqrt(scaled.reduce((sum, v) => sum + (v - meanMm) ** 2, 0) / (n - 1));
  const k1 = k1For(n);
  return {
    fit: null,
    tolerance: { n, meanMm, sdMm, k1, coverage: p.coverage, confidence: p.confidence },
    projectedMm: meanMm,
    upperBoundMm: meanMm + k1 * sdMm,
    label,
    unavailable: null,
  };
}

export function designEnvelope(input: EnvelopeInput): EnvelopeResult {
  if (input === null || typeof input !== 'object') throw new FlexInputError(FN, 'input', 'must be an object');
  const p = resolveParameters(input.parameters);
  if (input.tracks === null || typeof input.tracks !== 'object') throw new FlexInputError(FN, 'tracks', 'must be an object');
  requirePositiveLength(FN, 'tracks.frontMm', input.tracks.frontMm);
  requirePositiveLength(FN, 'tracks.rearMm', input.tracks.rearMm);
  validateOutline(FN, input.outline);
  if (!Array.isArray(input.gaugePoints) || input.gaugePoints.length === 0) {
    throw new FlexInputError(FN, 'gaugePoints', 'must be a non-empty array');
  }

  const poses = evaluatePoses(input);
  const measured = poses.filter((pose): pose is PoseResult & { worst: PerimeterWorst; fit: RelativeMotionFit } => pose.worst !== null);
  if (measured.length === 0) throw new FlexInputError(FN, 'poses', 'need at least one pose with readings besides the baseline');

  const notes: string[] = [];
  // A fit limitation usually repeats in every pose (the same gauge points each time): say it once.
  const limitations = new Map<string, string[]>();
  for (const pose of poses) {
    if (pose.note !== null && !pose.isBaseline) notes.push(`${pose.poseId}: ${pose.note}`);
    if (pose.missingBaseline.length > 0) notes.push(`${pose.poseId}: ${pose.missingBaseline.length} reading(s) without a baseline reading, not used`);
    for (const outlier of pose.fit?.outliers ?? []) {
      notes.push(`${pose.poseId}: reading at ${outlier.pointId} (${outlier.axis}) is far from the fit (residual ${mm(outlier.residual)}); review it`);
    }
    for (const part of [pose.fit?.outOfPlane, pose.fit?.inPlane]) {
      if (part === undefined || part.reason === null) continue;
      limitations.set(part.reason, [...(limitations.get(part.reason) ?? []), pose.poseId]);
    }
  }
  for (const [reason, poseIds] of limitations) notes.push(`${reason} (${poseIds.length === measuredCount(poses) ? 'all poses' : poseIds.join(', ')})`);
  const twists = measured.map((pose) => Math.abs(pose.twistDeg));
  const maxTwist = Math.max(...twists);
  if (p.designTwistDeg < maxTwist) {
    notes.push(`the design twist (${p.designTwistDeg}°) is below the largest twist reached (${maxTwist.toFixed(1)}°)`);
  } else if (maxTwist > 0 && p.designTwistDeg > FAR_EXTRAPOLATION * maxTwist) {
    notes.push(`the design twist (${p.designTwistDeg}°) is ${(p.designTwistDeg / maxTwist).toFixed(1)} × the largest twist reached (${maxTwist.toFixed(1)}°): a long extrapolation`);
  }

  const k1Cache = new Map<number, number>();
  const k1For = (n: number): number => {
    if (!k1Cache.has(n)) k1Cache.set(n, oneSidedToleranceFactor(n, p.coverage, p.confidence));
    return k1Cache.get(n) as number;
  };

  const axes = {} as Record<Axis, AxisEnvelope>;
  for (const axis of AXES) {
    const worsts = measured.map((pose) => Math.abs(pose.worst[axis].valueMm));
    let worstIndex = 0;
    worsts.forEach((w, i) => {
      if (w > worsts[worstIndex]) worstIndex = i;
    });
    const worstPose = measured[worstIndex];
    const { valueMm: measuredWorstMm, ...measuredWorstAt } = worstPose.worst[axis];
    const bound = p.method === 'prediction' ? predictionBound(twists, worsts, p) : toleranceBound(twists, worsts, p, k1For);

    const reasons: string[] = [];
    const measuredAbs = Math.abs(measuredWorstMm);
    const governing = bound.upperBoundMm !== null && bound.upperBoundMm > measuredAbs ? 'upperBound' : 'measured';
    const baseMm = governing === 'upperBound' ? (bound.upperBoundMm as number) : measuredAbs;
    if (bound.upperBoundMm === null) {
      reasons.push(`measured worst ${mm(measuredAbs)} (${worstPose.poseId}) governs; ${bound.unavailable}`);
    } else if (governing === 'upperBound') {
      reasons.push(`${bound.label} (${mm(bound.upperBoundMm)}) is above the measured worst (${mm(measuredAbs)}, ${worstPose.poseId})`);
    } else {
      reasons.push(`measured worst ${mm(measuredAbs)} (${worstPose.poseId}) is at or above the ${bound.label} (${mm(bound.upperBoundMm)})`);
    }
    const withMarginMm = baseMm * (1 + p.margin);
    const withAllowanceMm = withMarginMm + p.allowanceMm;
    const envelopeMm = roundUpToIncrement(withAllowanceMm, p.incrementMm);
    reasons.push(`× (1 + margin ${p.margin}) = ${mm(withMarginMm)}`);
    reasons.push(`+ allowance ${mm(p.allowanceMm)} = ${mm(withAllowanceMm)}`);
    reasons.push(`rounded up to the ${p.incrementMm} mm increment: ${envelopeMm} mm`);

    axes[axis] = {
      axis,
      measuredWorstMm,
      measuredWorstPoseId: worstPose.poseId,
      measuredWorstAt,
      fit: bound.fit,
      tolerance: bound.tolerance,
      projectedMm: bound.projectedMm,
      upperBoundMm: bound.upperBoundMm,
      governing,
      baseMm,
      withMarginMm,
      withAllowanceMm,
      envelopeMm,
      reasons,
    };
  }
  return { parameters: p, poses, axes, notes };
}
