/**
 * Design envelope of a session: the movement the boot or seals must absorb, per measure — the
 * fore-aft gap's opening and its closing apart, lateral shear and vertical movement — each with its
 * own envelope (see docs/method.md for the model, the fit, the outlier rule and the bound).
 *
 * Steps:
 * 1. Every input is checked first, and an error names the field as the caller gave it
 *    (gaugePoints[2].y, poses[3].readings[7].value); a pose may hold one reading per point and axis.
 * 2. Per pose: displacements (pose − baseline in 'gap' mode, as entered in 'displacement' mode);
 *    cross-axle twist from the lifts, taken relative to the baseline pose's own twist (its readings
 *    are the reference); the relative-motion fit (poseLayout once per layout, fitPoseValues per
 *    pose: only numbers are kept until step 3), identifiability judged against the
 *    opening; the extremes of each displacement on the opening's outline (outlineExtremesOn, as
 *    perimeterWorst gives them) with the fit's 1-SD uncertainty there, σ·√(gᵀ(XᵀX)⁻¹g).
 * 3. Outliers: the session's robust residual scatter per fit part (1.4826·median |eᵢ/√(1 − hᵢ)|)
 *    raises the reading SD the outlier rule judges against when the readings scatter more than a
 *    tape is read to (then with a t limit on the scale's effective degrees of freedom, 0.37·Σν);
 *    each pose is judged with judgeOutliers, its measures go into columns as numbers, and its
 *    result (PoseResultView) builds its fit, extremes and measures from kept numbers when first
 *    read. Flags are reported, never acted on.
 * 4. Per measure and twist direction (FL–RR +, FR–RL −), the bound at the design twist
 *    (predictionDirectionBound or toleranceDirectionBound); the larger governs, and the reasons say
 *    which. Poses twisted less than MIN_FIT_TWIST_DEG are measured but carry no slope.
 * 5. Envelope = max(measured worst, governing upper bound) × (1 + margin) + allowance, rounded up
 *    to the fabrication increment; `governing` and `reasons` say which term decided and why.
 * Source: docs/method.md; Montgomery, Peck & Vining (5th ed.) §4.2.1 and ch. 5; NIST/SEMATECH
 * e-Handbook §4.4.5.2 and §7.2.6.3. Complexity O(poses × readings), on flat arrays.
 */
import {
  FlexInputError,
  MAX_ROTATION_RAD,
  isLength,
  requireDesignProbability,
  requireFinite,
  requireLength,
  requireNonNegative,
  requirePositiveLength,
} from './errors';
import {
  MIN_FIT_TWIST_DEG,
  predictionDirectionBound,
  toleranceDirectionBound,
  type BoundSettings,
  type DirectionBound,
  type TwistDirection,
} from './direction-bound';
import { buildFit, flaggedReadings, partRemarks, residualSd, uncheckedPoints, type FlaggedReading, type RelativeMotionFit } from './fit-summary';
import { indexGaugeLocations } from './gauge-index';
import { normalQuantile } from './normal';
import { OUTLIER_FALSE_ALARM_RATE, judgeOutliers, type FitPartName, type OutlierCheck, type PartJudgement, type PoseJudgement } from './outlier-rule';
import {
  EXTREME_STRIDE,
  lowestIsWorst,
  outlineCorners,
  outlineExtremesOn,
  perimeterWorstOn,
  validateOutline,
  type OpeningOutline,
  type OutlineSide,
  type PerimeterWorst,
} from './perimeter';
import {
  fitPoseValues,
  loadPartCore,
  poseBuffer,
  poseLayout,
  scratchPoseFitCore,
  type PartCore,
  type PoseBuffer,
  type PoseFitCore,
  type PoseLayout,
} from './pose-fit';
import { READING_SD_MM } from './relative-motion';
import { MAD_EFFICIENCY, residualScaleInPlace } from './robust-scale';
import { roundUpToIncrement } from './round-up';
import { studentTQuantile } from './student-t';
import { oneSidedToleranceFactor } from './tolerance-factor';
import { crossAxleTwistDeg } from './twist';
import { TWIST_DIRECTION_NAMES, measureReasons } from './measure-reasons';
import { readingRemarks, type RemarkPart, type RemarkPose } from './reading-remarks';
import { isAxis, type Axis, type FitPartStatus, type GaugeLocation, type GaugeValue, type RigidMotion, type WheelLifts } from './types';

export type EnvelopeMethod = 'prediction' | 'tolerance';
export type ReadingMode = 'gap' | 'displacement';
export type EnvelopeMeasure = 'foreAftOpening' | 'foreAftClosing' | 'lateral' | 'vertical';

export const ENVELOPE_MEASURES: readonly EnvelopeMeasure[] = ['foreAftOpening', 'foreAftClosing', 'lateral', 'vertical'];
export const MEASURE_AXIS: Record<EnvelopeMeasure, Axis> = { foreAftOpening: 'foreAft', foreAftClosing: 'foreAft', lateral: 'lateral', vertical: 'vertical' };
export const TWIST_DIRECTIONS: readonly TwistDirection[] = ['positive', 'negative'];
export { TWIST_DIRECTION_NAMES };

export interface EnvelopeParameters {
  /** The most twist the vehicle is expected to see in service, degrees (> 0), either way. */
  designTwistDeg: number;
  method: EnvelopeMethod;
  /** One-sided confidence of the bound, 0.5 ≤ confidence < 1, e.g. 0.95. */
  confidence: number;
  /** Tolerance method only: fraction of the population the bound covers, 0.5 ≤ p < 1, e.g. 0.90. */
  coverage: number;
  /** Fraction added on top of the bound, e.g. 0.15 for 15 %. */
  margin: number;
  /** Fixed mm added after the margin (fitting slack, seal lip). */
  allowanceMm: number;
  /** Fabrication increment the envelope is rounded up to, e.g. 5 mm or 6.35 mm (1/4 in). */
  incrementMm: number;
  /** Prediction method: fit the line through (0, 0), since no twist means no motion. */
  throughOrigin: boolean;
  /** Tolerance method: runs count as repeats of one pose within ± this many degrees of their median twist. */
  repeatBandDeg: number;
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
  repeatBandDeg: 1,
};

export interface EnvelopePose {
  id: string;
  lifts: WheelLifts;
  readings: GaugeValue[];
}

export interface EnvelopeInput {
  tracks: { frontMm: number; rearMm: number };
  gaugePoints: GaugeLocation[];
  outline: OpeningOutline;
  readingMode: ReadingMode;
  /** The reference pose (usually level); required in 'gap' mode. Never a data point of the fit. */
  baselinePoseId?: string;
  poses: EnvelopePose[];
  /** designTwistDeg is required; an absent or undefined field takes its default. */
  parameters: Partial<EnvelopeParameters> & { designTwistDeg: number };
}

/** One measure of one pose: its size (mm, ≥ 0), where on the outline, and the fit's 1-SD uncertainty there. */
export interface PoseMeasure {
  valueMm: number;
  y: number;
  z: number;
  side: OutlineSide;
  /** null where the fit part behind it had no readings. */
  uncertaintyMm: number | null;
}

export interface PoseResult {
  poseId: string;
  isBaseline: boolean;
  /** Cross-axle twist from the pose's own lifts (degrees). */
  liftTwistDeg: number;
  /** Twist relative to the baseline pose (degrees): the explanatory variable of the bound. */
  twistDeg: number;
  /** 'gap' mode: readings with no baseline reading at the same point and axis (not used). */
  missingBaselineCount: number;
  /** null for the baseline and for a pose with no usable readings. */
  fit: RelativeMotionFit | null;
  worst: PerimeterWorst | null;
  measures: Record<EnvelopeMeasure, PoseMeasure> | null;
  note: string | null;
}

export interface MeasureEnvelope {
  measure: EnvelopeMeasure;
  axis: Axis;
  /** Largest value of the measure over the poses (mm, ≥ 0). */
  measuredWorstMm: number;
  measuredWorstPoseId: string;
  measuredWorstAt: { y: number; z: number; side: OutlineSide };
  directions: Record<TwistDirection, DirectionBound>;
  /** The direction whose upper bound is larger; null when neither has a bound. */
  governingDirection: TwistDirection | null;
  projectedMm: number | null;
  upperBoundMm: number | null;
  governing: 'measured' | 'upperBound';
  /** Largest 1-SD uncertainty of a pose's fit at its extreme point; null when unknown. */
  fitUncertaintyMm: number | null;
  baseMm: number;
  withMarginMm: number;
  withAllowanceMm: number;
  envelopeMm: number;
  reasons: string[];
}

/** A reading the outlier rule flagged (or one of a set that does not fit, with `kind` 'misfit'). */
export interface EnvelopeFlag {
  poseId: string;
  pointId: string;
  axis: Axis;
  /** The displacement the fit used (mm). */
  valueMm: number;
  residualMm: number;
  /** The outlier rule's score (deleted residual / its SE); null for 'misfit'. */
  score: number | null;
  kind: 'outlier' | 'misfit';
}

export interface EnvelopeResult {
  parameters: EnvelopeParameters;
  /** The baseline pose's own twist from its lifts (degrees); 0 without a baseline. */
  baselineTwistDeg: number;
  /** The reading SD the outlier rule judged each fit part against (mm). */
  scatterMm: Record<FitPartName, number>;
  poses: PoseResult[];
  measures: Record<EnvelopeMeasure, MeasureEnvelope>;
  flags: EnvelopeFlag[];
  /** Remarks on the readings and the fit (flags, limits of the fit and of the outlier check); they do not depend on the design parameters. */
  readingNotes: string[];
  /** Remarks on the bound (twist directions tested, extrapolation to the design twist). */
  notes: string[];
}

const FN = 'designEnvelope';
/** Vehicle tracks outside this range are typing errors (common practice: trucks 1.4–2.5 m). */
const MIN_TRACK_MM = 500;
const MAX_TRACK_MM = 4000;
/** A vehicle on its wheels cannot twist further; beyond it the lifts or tracks are wrong. */
const MAX_TWIST_DEG = 90;
/** Beyond this the straight line is stretched too far to trust quietly. */
const FAR_EXTRAPOLATION = 1.5;
/** Fewest standardized residuals for a session scatter estimate (fewer: the reading SD alone). */
const MIN_SCALE_RESIDUALS = 10;
const AXIS_OF_CODE: readonly Axis[] = ['foreAft', 'lateral', 'vertical'];
/** Shared empty lists (read, never written): most poses have no unchecked points and no flags. */
const NO_POINTS: readonly string[] = [];
const NO_OUTLIERS: readonly FlaggedReading[] = [];
const NO_COVARIANCE: number[] = [];

function resolveParameters(raw: EnvelopeInput['parameters']): EnvelopeParameters {
  if (raw === null || typeof raw !== 'object') throw new FlexInputError(FN, 'parameters', 'must be an object');
  const p = { ...DEFAULT_ENVELOPE_PARAMETERS } as EnvelopeParameters;
  for (const [key, value] of Object.entries(raw)) {
    if (value !== undefined) (p as unknown as Record<string, unknown>)[key] = value;
  }
  requireFinite(FN, 'parameters.designTwistDeg', p.designTwistDeg);
  if (p.designTwistDeg <= 0 || p.designTwistDeg > MAX_TWIST_DEG) {
    throw new FlexInputError(FN, 'parameters.designTwistDeg', `must be greater than 0 and at most ${MAX_TWIST_DEG} degrees, got ${p.designTwistDeg}`);
  }
  if (p.method !== 'prediction' && p.method !== 'tolerance') {
    throw new FlexInputError(FN, 'parameters.method', `must be 'prediction' or 'tolerance', got '${String(p.method)}'`);
  }
  requireDesignProbability(FN, 'parameters.confidence', p.confidence);
  requireDesignProbability(FN, 'parameters.coverage', p.coverage);
  requireNonNegative(FN, 'parameters.margin', p.margin);
  if (p.margin > 10) throw new FlexInputError(FN, 'parameters.margin', `is a fraction (0.15 = 15 %), got ${p.margin}`);
  requireLength(FN, 'parameters.allowanceMm', p.allowanceMm);
  requireNonNegative(FN, 'parameters.allowanceMm', p.allowanceMm);
  requirePositiveLength(FN, 'parameters.incrementMm', p.incrementMm);
  if (typeof p.throughOrigin !== 'boolean') throw new FlexInputError(FN, 'parameters.throughOrigin', 'must be true or false');
  requireFinite(FN, 'parameters.repeatBandDeg', p.repeatBandDeg);
  if (p.repeatBandDeg <= 0 || p.repeatBandDeg > 10) {
    throw new FlexInputError(FN, 'parameters.repeatBandDeg', `must be greater than 0 and at most 10 degrees, got ${p.repeatBandDeg}`);
  }
  return p;
}

function requireTrack(field: string, value: number): void {
  requireFinite(FN, field, value);
  if (value < MIN_TRACK_MM || value > MAX_TRACK_MM) {
    throw new FlexInputError(FN, field, `must be a vehicle's track, ${MIN_TRACK_MM}–${MAX_TRACK_MM} mm, got ${value}`);
  }
}

/** The first bad field of one reading, named as the caller gave it (only called once a reading fails the fast check). */
function readingProblem(i: number, j: number, reading: GaugeValue, points: Map<string, number>): never {
  const field = `poses[${i}].readings[${j}]`;
  if (reading === null || typeof reading !== 'object') throw new FlexInputError(FN, field, 'must be an object');
  if (!points.has(reading.pointId)) throw new FlexInputError(FN, `${field}.pointId`, `names no gauge point of the vehicle: '${String(reading.pointId)}'`);
  if (!isAxis(reading.axis)) throw new FlexInputError(FN, `${field}.axis`, `must be 'foreAft', 'lateral' or 'vertical', got '${String(reading.axis)}'`);
  requireLength(FN, `${field}.value`, reading.value);
  throw new FlexInputError(FN, field, `repeats the reading of point '${reading.pointId}' on axis ${reading.axis} in this pose`);
}

/**
 * Checks every pose and reading, naming each field as the caller gave it. Returns each pose's lift
 * twist and, per reading in input order, its point × 3 + axis code and its value (so no reading
 * object is read twice).
 */
function checkPoses(input: EnvelopeInput, points: Map<string, number>): { liftTwists: Float64Array; scratch: Scratch; codeStart: Int32Array } {
  const { poses } = input;
  if (!Array.isArray(poses) || poses.length === 0) throw new FlexInputError(FN, 'poses', 'must be a non-empty array');
  const ids = new Set<string>();
  const stamp = new Int32Array(points.size * 3);
  let total = 0;
  for (const pose of poses) if (pose !== null && typeof pose === 'object' && Array.isArray(pose.readings)) total += pose.readings.length;
  const scratch = scratchFor(total);
  const codes = scratch.inputCode;
  const values = scratch.inputValue;
  const codeStart = new Int32Array(poses.length);
  // Built by a plain loop (so are the twists below): an array Array.prototype.map returns can change
  // its elements kind once V8 optimises the call, and the code reading it would be thrown away then.
  const pointIds: string[] = [];
  for (const point of input.gaugePoints) pointIds.push(point.id);
  let next = 0;
  const liftTwists = new Float64Array(poses.length);
  for (let i = 0; i < poses.length; i++) {
    const pose = poses[i];
    if (pose === null || typeof pose !== 'object' || typeof pose.id !== 'string') throw new FlexInputError(FN, `poses[${i}].id`, 'must be a string');
    if (ids.has(pose.id)) throw new FlexInputError(FN, `poses[${i}].id`, `repeats pose id '${pose.id}'`);
    ids.add(pose.id);
    let twist: number;
    try {
      twist = crossAxleTwistDeg(pose.lifts, input.tracks.frontMm, input.tracks.rearMm);
    } catch (error) {
      if (error instanceof FlexInputError) throw new FlexInputError(FN, `poses[${i}].${error.field}`, error.problem);
      throw error;
    }
    if (Math.abs(twist) > MAX_TWIST_DEG) {
      throw new FlexInputError(
        FN,
        `poses[${i}].lifts`,
        `give a cross-axle twist of ${twist.toFixed(1)}°, beyond the ±${MAX_TWIST_DEG}° a vehicle on its wheels can reach: check the lifts and the tracks`,
      );
    }
    const readings = pose.readings;
    if (!Array.isArray(readings)) throw new FlexInputError(FN, `poses[${i}].readings`, 'must be an array');
    codeStart[i] = next;
    // Poses are usually read in the same order: the reading at the same place in the previous pose
    // names the point to try first; else a point's readings usually come together (one per axis),
    // so its id is looked up once for the run.
    const previousStart = i === 0 ? 0 : codeStart[i - 1];
    const previousCount = next - previousStart;
    let lastId: unknown = undefined;
    let lastAt: number | undefined = undefined;
    for (let j = 0; j < readings.length; j++) {
      const reading = readings[j];
      let at: number | undefined = undefined;
      if (reading !== null && typeof reading === 'object') {
        const guess = j < previousCount ? (codes[previousStart + j] / 3) | 0 : -1;
        if (guess >= 0 && reading.pointId === pointIds[guess]) at = guess;
        else {
          if (reading.pointId !== lastId) {
            lastId = reading.pointId;
            lastAt = points.get(reading.pointId);
          }
          at = lastAt;
        }
      }
      const axis = at === undefined ? -1 : reading.axis === 'foreAft' ? 0 : reading.axis === 'lateral' ? 1 : reading.axis === 'vertical' ? 2 : -1;
      if (at === undefined || axis < 0) readingProblem(i, j, reading, points);
      // Read apart from the checks above so the number stays unboxed (a value that may be undefined would be boxed).
      const value = reading.value;
      if (!isLength(value)) readingProblem(i, j, reading, points);
      const key = at * 3 + axis;
      if (stamp[key] === i + 1) readingProblem(i, j, reading, points);
      stamp[key] = i + 1;
      values[next] = value;
      codes[next++] = key;
    }
    liftTwists[i] = twist;
  }
  return { liftTwists, scratch, codeStart };
}

interface Session {
  points: GaugeLocation[];
  /** Where the readings are flattened; inputCode and inputValue hold, per reading in input order, pose after pose from codeStart[pose], its point index × 3 + axis code and its value. */
  scratch: Scratch;
  codeStart: Int32Array;
  baselineIndex: number;
  liftTwists: Float64Array;
  relativeTwists: Float64Array;
}

/** All non-baseline readings of the session as flat arrays, one pose after another. */
interface Flat {
  buffer: PoseBuffer;
  /** The reading's index in its pose's input array, per flat position. */
  inputIndex: Int32Array;
  /** The reading's point index × 3 + axis code, per flat position: poses with the same run of codes share a layout. */
  code: Int32Array;
  /** Room for the standardized residuals the session scatter is taken from. */
  scatter: Float64Array;
  /** Per pose: first flat position and count (−1 for the baseline). */
  start: Int32Array;
  count: Int32Array;
  missingBaseline: Int32Array;
  /** How many flat positions the poses fill. */
  total: number;
}

/**
 * Scratch arrays for the flat readings, kept between calls and grown when a session needs more:
 * allocating ten large typed arrays per call cost more than the arithmetic. Safe because
 * designEnvelope runs to completion synchronously, and nothing in its result points into them.
 * Sessions beyond KEPT_SCRATCH readings get arrays of their own, so one huge session does not keep
 * tens of megabytes alive in a long-running server or tab.
 */
type Scratch = {
  buffer: PoseBuffer;
  inputIndex: Int32Array;
  code: Int32Array;
  scatter: Float64Array;
  /** Per reading in input order (every pose, the baseline too): its code and its value. */
  inputCode: Int32Array;
  inputValue: Float64Array;
};
let scratch: Scratch | null = null;
const KEPT_SCRATCH = 1 << 16;

/** Scratch arrays for a session of `total` readings (every pose's, the baseline's too). */
function scratchFor(total: number): Scratch {
  if (scratch !== null && scratch.inputIndex.length >= total) return scratch;
  const size = Math.max(total, 1024);
  const fresh = {
    buffer: poseBuffer(size),
    inputIndex: new Int32Array(size),
    code: new Int32Array(size),
    scatter: new Float64Array(size),
    inputCode: new Int32Array(size),
    inputValue: new Float64Array(size),
  };
  if (size <= KEPT_SCRATCH) scratch = fresh;
  return fresh;
}

function flatten(input: EnvelopeInput, s: Session): Flat {
  const { poses } = input;
  const { buffer, inputIndex, code: codeAt, scatter, inputCode, inputValue } = s.scratch;
  const start = new Int32Array(poses.length).fill(-1);
  const count = new Int32Array(poses.length);
  const missingBaseline = new Int32Array(poses.length);
  const reference = new Float64Array(s.points.length * 3).fill(Number.NaN);
  const gap = input.readingMode === 'gap';
  if (gap) {
    const from = s.codeStart[s.baselineIndex];
    const end = from + poses[s.baselineIndex].readings.length;
    for (let j = from; j < end; j++) reference[inputCode[j]] = inputValue[j];
  }
  const ys = new Float64Array(s.points.length);
  const zs = new Float64Array(s.points.length);
  s.points.forEach((point, i) => {
    ys[i] = point.y;
    zs[i] = point.z;
  });
  let k = 0;
  for (let i = 0; i < poses.length; i++) {
    if (i === s.baselineIndex) continue;
    start[i] = k;
    const from = s.codeStart[i];
    const length = poses[i].readings.length;
    for (let j = 0; j < length; j++) {
      const code = inputCode[from + j];
      let value = inputValue[from + j];
      if (gap) {
        const base = reference[code];
        if (Number.isNaN(base)) {
          missingBaseline[i]++;
          continue;
        }
        value -= base;
      }
      const point = (code / 3) | 0;
      buffer.axis[k] = code - 3 * point;
      buffer.y[k] = ys[point];
      buffer.z[k] = zs[point];
      buffer.value[k] = value;
      inputIndex[k] = j;
      codeAt[k] = code;
      k++;
    }
    count[i] = k - start[i];
  }
  return { buffer, inputIndex, code: codeAt, scatter, start, count, missingBaseline, total: k };
}

/** Whether two runs of readings were taken at the same points on the same axes in the same order. */
function sameCodes(code: Int32Array, a: number, b: number, countA: number, countB: number): boolean {
  if (countA !== countB) return false;
  for (let k = 0; k < countA; k++) if (code[a + k] !== code[b + k]) return false;
  return true;
}

/**
 * The session's robust residual scatter of each fit part, and its effective degrees of freedom,
 * from one pass over the readings: fore-aft residuals gathered from the front of the scratch array,
 * lateral and vertical ones from its back (a median does not depend on the order).
 */
function sessionScatter(flat: Flat, layouts: (PoseLayout | null)[]): Record<FitPartName, { scaleMm: number | null; df: number }> {
  const values = flat.scatter;
  const { axis, standardized } = flat.buffer;
  let nOut = 0;
  let nIn = 0;
  let redundancyOut = 0;
  let redundancyIn = 0;
  for (let i = 0; i < layouts.length; i++) {
    const layout = layouts[i];
    if (layout === null) continue;
    const out = layout.outOfPlane.shape;
    const inPlane = layout.inPlane.shape;
    const spareOut = out.readingCount - out.parameterCount;
    const spareIn = inPlane.readingCount - inPlane.parameterCount;
    if (spareOut >= 1) redundancyOut += spareOut;
    if (spareIn >= 1) redundancyIn += spareIn;
    const end = flat.start[i] + flat.count[i];
    for (let k = flat.start[i]; k < end; k++) {
      const r = standardized[k];
      if (Number.isNaN(r)) continue;
      if (axis[k] === 0) {
        if (spareOut >= 1) values[nOut++] = r;
      } else if (spareIn >= 1) values[values.length - 1 - nIn++] = r;
    }
  }
  const scale = (n: number, from: number, redundancy: number) =>
    n < MIN_SCALE_RESIDUALS ? { scaleMm: null, df: 0 } : { scaleMm: residualScaleInPlace(values.subarray(from, from + n)), df: MAD_EFFICIENCY * redundancy };
  return { outOfPlane: scale(nOut, 0, redundancyOut), inPlane: scale(nIn, values.length - nIn, redundancyIn) };
}

/**
 * The reading SD behind a fit part's uncertainty: its judged scatter, or its own residual SD if
 * larger; NaN without readings. The one rule for the columns (from the core fit) and for a pose's
 * measures (from its FitPart, which holds the same numbers).
 */
function readingSd(status: FitPartStatus, scatterMm: number, residualSdMm: number | null): number {
  return status === 'none' ? Number.NaN : Math.max(scatterMm, residualSdMm ?? 0);
}

/** √(gᵀCg) for a symmetric 3×3 C (row-major). */
function spread(c: readonly number[], g0: number, g1: number, g2: number): number {
  return Math.sqrt(Math.max(0, g0 * g0 * c[0] + g1 * g1 * c[4] + g2 * g2 * c[8] + 2 * (g0 * g1 * c[1] + g0 * g2 * c[2] + g1 * g2 * c[5])));
}

/** A measure's size (mm, ≥ 0) from the extreme value behind it: the gap's opening and closing apart, the others either way. */
function measureSize(measure: EnvelopeMeasure, valueMm: number): number {
  if (measure === 'foreAftOpening') return Math.max(0, valueMm);
  if (measure === 'foreAftClosing') return Math.max(0, -valueMm);
  return Math.abs(valueMm);
}

/**
 * The fit's 1-SD uncertainty of a measure at its extreme (y, z), σ·√(gᵀ(XᵀX)⁻¹g); NaN where the
 * part behind it had no readings (σ NaN). The one place it is worked out, for the columns the
 * bounds read and for the measures a pose shows.
 */
function measureUncertainty(
  measure: EnvelopeMeasure,
  y: number,
  z: number,
  outSd: number,
  inSd: number,
  outCov: readonly number[],
  inCov: readonly number[],
): number {
  if (measure === 'foreAftOpening' || measure === 'foreAftClosing') return Number.isNaN(outSd) ? Number.NaN : outSd * spread(outCov, 1, z, -y);
  if (Number.isNaN(inSd)) return Number.NaN;
  return measure === 'lateral' ? inSd * spread(inCov, 1, 0, -z) : inSd * spread(inCov, 0, 1, y);
}

/** Where each measure's extreme is in outlineExtremesOn's numbers (its value, y and z follow). */
function extremeAt(measure: EnvelopeMeasure, extremes: Float64Array): number {
  if (measure === 'foreAftOpening') return 0;
  if (measure === 'foreAftClosing') return 3;
  // Lateral and vertical: the larger |value| of the component, as PerimeterWorst's own value.
  const at = measure === 'lateral' ? EXTREME_STRIDE : 2 * EXTREME_STRIDE;
  return lowestIsWorst(extremes[at], extremes[at + 3]) ? at + 3 : at;
}

/** The measures of one pose as objects, from its extremes on the outline (for PoseResultView.measures). */
function poseMeasures(worst: PerimeterWorst, fit: RelativeMotionFit): Record<EnvelopeMeasure, PoseMeasure> {
  const outSd = readingSd(fit.outOfPlane.status, fit.outOfPlane.scatterMm, fit.outOfPlane.residualSdMm);
  const inSd = readingSd(fit.inPlane.status, fit.inPlane.scatterMm, fit.inPlane.residualSdMm);
  const measure = (name: EnvelopeMeasure, at: PerimeterWorst['foreAft']['highest']): PoseMeasure => {
    const uncertainty = measureUncertainty(name, at.y, at.z, outSd, inSd, fit.outOfPlane.covariance, fit.inPlane.covariance);
    return { valueMm: measureSize(name, at.valueMm), y: at.y, z: at.z, side: at.side, uncertaintyMm: Number.isNaN(uncertainty) ? null : uncertainty };
  };
  return {
    foreAftOpening: measure('foreAftOpening', worst.foreAft.highest),
    foreAftClosing: measure('foreAftClosing', worst.foreAft.lowest),
    lateral: measure('lateral', worst.lateral),
    vertical: measure('vertical', worst.vertical),
  };
}

const OUTLIER_CHECKS: readonly OutlierCheck[] = ['checked', 'misfitOnly', 'skipped'];

/**
 * What a session's poses keep, as numbers in columns (per pose i, at i or 2i for the two fit parts),
 * to build each pose's fit when it is first read: the envelope itself needs none of the fit's
 * objects, and building them for every pose (about 1.6 KB each) was most of what a run allocated.
 * Nothing here points into the scratch arrays: the residuals and axes are copies, so a result stays
 * right after designEnvelope has run again.
 */
interface PoseStore {
  /** Per pose: its layout (null for the baseline and poses without usable readings). */
  layouts: (PoseLayout | null)[];
  /** Per pose: tx, ty, tz, wx, wy, wz. */
  motions: Float64Array;
  /** Per pose and part: the residuals' sum of squares, the covariance it shares, the outlier check (index in OUTLIER_CHECKS), its limit (NaN: none), misfit (0 or 1), the points nothing checks. */
  ssrs: Float64Array;
  covariances: number[][];
  checks: Uint8Array;
  limits: Float64Array;
  misfits: Uint8Array;
  unchecked: (readonly string[])[];
  /** Per pose: its flagged readings (null: none). */
  outliers: (FlaggedReading[] | null)[];
  /** The flat positions of each pose's readings, and copies of their residuals and axis codes. */
  start: Int32Array;
  count: Int32Array;
  residual: Float64Array;
  axis: Uint8Array;
  scatterMm: Record<FitPartName, number>;
  worstOf: (motion: RigidMotion) => PerimeterWorst;
  /** Scratch a pose's fit is loaded into before buildFit copies it out. */
  core: PoseFitCore | null;
  judgement: Pick<PoseJudgement, 'outOfPlane' | 'inPlane'>;
}

/** Keeps one part's judgement at `at` (2·pose + part) as numbers. */
function keepJudgement(store: PoseStore, at: number, part: PartJudgement): void {
  store.checks[at] = OUTLIER_CHECKS.indexOf(part.check);
  store.limits[at] = part.limit ?? Number.NaN;
  store.misfits[at] = part.misfit ? 1 : 0;
}

/** One part's judgement back from the numbers keepJudgement kept (misfitMm is not part of a fit). */
function loadJudgement(into: PartJudgement, store: PoseStore, at: number, scatterMm: number): void {
  const limit = store.limits[at];
  into.check = OUTLIER_CHECKS[store.checks[at]];
  into.scatterMm = scatterMm;
  into.limit = Number.isNaN(limit) ? null : limit;
  into.misfit = store.misfits[at] === 1;
}

/** Pose i's rigid motion (tx, ty, tz, wx, wy, wz) from the store's motion column into a fit core. */
function loadMotion(core: PoseFitCore, motions: Float64Array, i: number): void {
  core.tx = motions[6 * i];
  core.ty = motions[6 * i + 1];
  core.tz = motions[6 * i + 2];
  core.wx = motions[6 * i + 3];
  core.wy = motions[6 * i + 4];
  core.wz = motions[6 * i + 5];
}

/** Pose i's fit from the store: what packFit would have given from the pose's buffer (the same buildFit, the same numbers). */
function storedFit(store: PoseStore, i: number): RelativeMotionFit {
  const layout = store.layouts[i] as PoseLayout;
  const core = (store.core ??= scratchPoseFitCore(layout));
  loadMotion(core, store.motions, i);
  loadPartCore(core.outOfPlane, layout, 'outOfPlane', store.ssrs[2 * i], store.covariances[2 * i]);
  loadPartCore(core.inPlane, layout, 'inPlane', store.ssrs[2 * i + 1], store.covariances[2 * i + 1]);
  loadJudgement(store.judgement.outOfPlane, store, 2 * i, store.scatterMm.outOfPlane);
  loadJudgement(store.judgement.inPlane, store, 2 * i + 1, store.scatterMm.inPlane);
  return buildFit(
    core,
    store.judgement,
    store.residual,
    store.axis,
    store.start[i],
    store.count[i],
    store.unchecked[2 * i],
    store.unchecked[2 * i + 1],
    store.outliers[i] ?? [],
  );
}

/**
 * One pose's result. Its fit, its extremes on the outline (`worst`) and its measures are built on
 * first read, from the numbers the session keeps (PoseStore), and then kept: the envelope needs
 * only numbers, and those objects (about 40 per pose) were most of what a run allocated, for
 * results whose per-pose detail is often never read. They come through the same functions as the
 * columns the bounds read, so they hold the same bits. toJSON writes the fields in the order a
 * plain object had them, so an API answer or a signed snapshot is byte for byte the same.
 * fit, worst and measures are getters: a spread ({ ...pose }), Object.keys or structuredClone sees
 * only the other fields, so read them by name, or copy a result through JSON.
 */
class PoseResultView implements PoseResult {
  readonly poseId: string;
  readonly isBaseline: boolean;
  readonly liftTwistDeg: number;
  readonly twistDeg: number;
  readonly missingBaselineCount: number;
  readonly note: string | null;
  readonly #store: PoseStore;
  readonly #index: number;
  #fit: RelativeMotionFit | null | undefined;
  #worst: PerimeterWorst | null | undefined;
  #measures: Record<EnvelopeMeasure, PoseMeasure> | null | undefined;

  constructor(
    store: PoseStore,
    index: number,
    poseId: string,
    isBaseline: boolean,
    liftTwistDeg: number,
    twistDeg: number,
    missingBaselineCount: number,
    note: string | null,
  ) {
    this.poseId = poseId;
    this.isBaseline = isBaseline;
    this.liftTwistDeg = liftTwistDeg;
    this.twistDeg = twistDeg;
    this.missingBaselineCount = missingBaselineCount;
    this.note = note;
    this.#store = store;
    this.#index = index;
    this.#fit = undefined;
    this.#worst = undefined;
    this.#measures = undefined;
  }

  get fit(): RelativeMotionFit | null {
    if (this.#fit === undefined) this.#fit = this.#store.layouts[this.#index] === null ? null : storedFit(this.#store, this.#index);
    return this.#fit;
  }

  get worst(): PerimeterWorst | null {
    if (this.#worst === undefined) {
      const fit = this.fit;
      this.#worst = fit === null ? null : this.#store.worstOf(fit.motion);
    }
    return this.#worst;
  }

  get measures(): Record<EnvelopeMeasure, PoseMeasure> | null {
    if (this.#measures === undefined) {
      const worst = this.worst;
      this.#measures = worst === null || this.fit === null ? null : poseMeasures(worst, this.fit);
    }
    return this.#measures;
  }

  toJSON(): PoseResult {
    return {
      poseId: this.poseId,
      isBaseline: this.isBaseline,
      liftTwistDeg: this.liftTwistDeg,
      twistDeg: this.twistDeg,
      missingBaselineCount: this.missingBaselineCount,
      fit: this.fit,
      worst: this.worst,
      measures: this.measures,
      note: this.note,
    };
  }
}

/** The poses' results, the scatter the outlier rule judged against, the flags, the remarks' facts, and the measures as columns. */
interface Evaluation {
  poses: PoseResult[];
  /** Per pose: whether it has a fit (and so measures), known without building either. */
  fitted: Uint8Array;
  remarkPoses: RemarkPose[];
  scatterMm: Record<FitPartName, number>;
  flags: EnvelopeFlag[];
  columns: MeasureColumns;
}

/**
 * What the two passes over the poses share. Each pose is handled by a function of its own
 * (fitPose, judgePose): called once per pose, V8 optimises it within the first call or two, where
 * a loop body inside evaluatePoses (called once per envelope) would wait for on-stack replacement.
 */
interface PosePasses {
  input: EnvelopeInput;
  s: Session;
  flat: Flat;
  corners: number[];
  store: PoseStore;
  /** The layout of the last pose fitted, and where its codes are: the next pose read at the same points reuses it. */
  layout: PoseLayout | null;
  layoutStart: number;
  /** One core every pose is fitted into, and one judgement every pose is judged into. */
  core: PoseFitCore | null;
  judgement: PoseJudgement;
  scatterMm: Record<FitPartName, number>;
  limitFor: (tests: number, part: FitPartName) => number;
  /** A pose's extremes on the outline as numbers, into `extremes`. */
  extremesOf: (tx: number, ty: number, tz: number, wx: number, wy: number, wz: number, out: Float64Array) => void;
  extremes: Float64Array;
  /**
   * The layout the poses being judged share, its covariance copies, the points of its readings
   * nothing checks, and what the remarks say of its parts: all the same for every pose read at the
   * same points on the same axes in the same order.
   */
  sharedLayout: PoseLayout | null;
  covarianceOut: number[];
  covarianceIn: number[];
  uncheckedOut: readonly string[];
  uncheckedIn: readonly string[];
  remarkOut: RemarkPart;
  remarkIn: RemarkPart;
  /** The remarks' facts of a fitted pose with no flag of its own, shared by the poses of remarkLayout. */
  remarkFit: RemarkPose['fit'];
  remarkLayout: PoseLayout | null;
  /** The readings of the pose being judged, for labelOf. */
  readings: GaugeValue[];
  labelOf: (k: number) => { pointId: string; axis: Axis; index: number };
  columns: MeasureColumns;
  flags: EnvelopeFlag[];
  fitted: Uint8Array;
  remarkPoses: RemarkPose[];
}

function emptyPartJudgement(): PoseJudgement['outOfPlane'] {
  return { check: 'skipped', scatterMm: 0, limit: null, misfit: false, misfitMm: null };
}

function emptyRemarkPart(): RemarkPart {
  return { misfit: false, readingCount: 0, parameterCount: 0, reason: null, outlierNote: null };
}

function evaluatePoses(input: EnvelopeInput, s: Session): Evaluation {
  const flat = flatten(input, s);
  const count = input.poses.length;
  const scatterMm = { outOfPlane: READING_SD_MM, inPlane: READING_SD_MM };
  const store: PoseStore = {
    layouts: [],
    motions: new Float64Array(count * 6),
    ssrs: new Float64Array(count * 2),
    covariances: [],
    checks: new Uint8Array(count * 2),
    limits: new Float64Array(count * 2),
    misfits: new Uint8Array(count * 2),
    unchecked: [],
    outliers: [],
    start: flat.start,
    count: flat.count,
    residual: flat.buffer.residual,
    axis: flat.buffer.axis,
    scatterMm,
    worstOf: perimeterWorstOn(input.outline),
    core: null,
    judgement: { outOfPlane: emptyPartJudgement(), inPlane: emptyPartJudgement() },
  };
  const passes: PosePasses = {
    input,
    s,
    flat,
    corners: outlineCorners(input.outline),
    store,
    layout: null,
    layoutStart: 0,
    core: null,
    judgement: { outOfPlane: emptyPartJudgement(), inPlane: emptyPartJudgement(), flagged: [] },
    scatterMm,
    limitFor: () => Number.NaN,
    extremesOf: outlineExtremesOn(input.outline),
    extremes: new Float64Array(3 * EXTREME_STRIDE),
    sharedLayout: null,
    covarianceOut: [],
    covarianceIn: [],
    uncheckedOut: NO_POINTS,
    uncheckedIn: NO_POINTS,
    remarkOut: emptyRemarkPart(),
    remarkIn: emptyRemarkPart(),
    remarkFit: null,
    remarkLayout: null,
    readings: [],
    labelOf: (k) => {
      const index = flat.inputIndex[k];
      const reading = passes.readings[index];
      return { pointId: reading.pointId, axis: reading.axis, index };
    },
    columns: emptyMeasureColumns(count),
    flags: [],
    fitted: new Uint8Array(count),
    remarkPoses: [],
  };
  // First pass: every pose is fitted into one reused core, keeping only numbers: the session's
  // scatter must be known before any pose is judged, and no pose needs objects of its own until then.
  for (let i = 0; i < count; i++) fitPose(passes, i);
  // The residuals and axes the poses' fits are built from later: copied out of the scratch arrays,
  // which the next designEnvelope overwrites.
  store.residual = flat.buffer.residual.slice(0, flat.total);
  store.axis = flat.buffer.axis.slice(0, flat.total);

  const limits = {} as Record<FitPartName, (tests: number) => number>;
  const scatters = sessionScatter(flat, store.layouts);
  for (const part of ['outOfPlane', 'inPlane'] as const) {
    const { scaleMm, df } = scatters[part];
    const estimated = scaleMm !== null && scaleMm > READING_SD_MM;
    scatterMm[part] = estimated ? scaleMm : READING_SD_MM;
    const cache = new Map<number, number>();
    limits[part] = (tests) => {
      let limit = cache.get(tests);
      if (limit === undefined) {
        const p = 1 - OUTLIER_FALSE_ALARM_RATE / (2 * tests);
        limit = estimated ? studentTQuantile(p, Math.max(1, df)) : normalQuantile(p);
        cache.set(tests, limit);
      }
      return limit;
    };
  }
  passes.limitFor = (tests, part) => limits[part](tests);

  // Second pass: each pose judged and its result made once; its measures go straight into the
  // columns the bounds read.
  const poses: PoseResult[] = [];
  for (let i = 0; i < count; i++) poses.push(judgePose(passes, i));
  return { poses, fitted: passes.fitted, remarkPoses: passes.remarkPoses, scatterMm, flags: passes.flags, columns: passes.columns };
}

/** First pass, one pose: its fit into the shared core, kept as numbers. */
function fitPose(passes: PosePasses, i: number): void {
  const { flat } = passes;
  const store = passes.store;
  if (i === passes.s.baselineIndex || flat.count[i] === 0) {
    store.layouts.push(null);
    return;
  }
  flat.buffer.start = flat.start[i];
  flat.buffer.count = flat.count[i];
  let layout = passes.layout;
  if (layout === null || !sameCodes(flat.code, passes.layoutStart, flat.start[i], layout.count, flat.count[i])) {
    layout = poseLayout(flat.buffer, passes.corners);
    passes.layout = layout;
    passes.layoutStart = flat.start[i];
  }
  const core = (passes.core ??= scratchPoseFitCore(layout));
  fitPoseValues(flat.buffer, layout, core);
  store.layouts.push(layout);
  const m = store.motions;
  m[6 * i] = core.tx;
  m[6 * i + 1] = core.ty;
  m[6 * i + 2] = core.tz;
  m[6 * i + 3] = core.wx;
  m[6 * i + 4] = core.wy;
  m[6 * i + 5] = core.wz;
  store.ssrs[2 * i] = core.outOfPlane.ssr;
  store.ssrs[2 * i + 1] = core.inPlane.ssr;
}

/** A part's remark facts as the remarks read them (see RemarkPose). */
function remarkPart(
  kind: FitPartName,
  core: PartCore,
  check: OutlierCheck,
  counts: { lateral: number; vertical: number },
  unchecked: readonly string[],
): RemarkPart {
  const { reason, outlierNote } = partRemarks(kind, core, check, counts, unchecked);
  return { misfit: false, readingCount: core.readingCount, parameterCount: core.parameterCount, reason, outlierNote };
}

/** Second pass, one pose: judged against the session's scatter, its flags, its measures into the columns, and its result. */
function judgePose(passes: PosePasses, i: number): PoseResult {
  const { input, s, flat, store } = passes;
  const pose = input.poses[i];
  const layout = store.layouts[i];
  const core = passes.core;
  const isBaseline = i === s.baselineIndex;
  if (layout === null || core === null) {
    const note = isBaseline ? 'baseline (reference pose)' : 'no usable readings: left out of the envelope';
    store.covariances.push(NO_COVARIANCE, NO_COVARIANCE);
    store.unchecked.push(NO_POINTS, NO_POINTS);
    store.outliers.push(null);
    return poseResult(passes, i, isBaseline, note, null);
  }
  loadMotion(core, store.motions, i);
  flat.buffer.start = flat.start[i];
  flat.buffer.count = flat.count[i];
  const readings = pose.readings;
  passes.readings = readings;
  if (layout !== passes.sharedLayout) {
    // Poses read at the same points have the same covariance: they share one copy (read-only by its
    // type; frozen, its reads took about 5 % longer). The points nothing checks are those of the
    // same readings, and so is what the remarks say of the parts.
    passes.sharedLayout = layout;
    passes.covarianceOut = layout.outOfPlane.shape.covariance.slice();
    passes.covarianceIn = layout.inPlane.shape.covariance.slice();
    const unchecked = uncheckedPoints(flat.buffer, passes.labelOf);
    passes.uncheckedOut = unchecked.outOfPlane;
    passes.uncheckedIn = unchecked.inPlane;
  }
  loadPartCore(core.outOfPlane, layout, 'outOfPlane', store.ssrs[2 * i], passes.covarianceOut);
  loadPartCore(core.inPlane, layout, 'inPlane', store.ssrs[2 * i + 1], passes.covarianceIn);
  const rotation = Math.max(Math.abs(core.wx), Math.abs(core.wy), Math.abs(core.wz));
  if (!(rotation <= MAX_ROTATION_RAD)) {
    throw new FlexInputError(
      FN,
      `poses[${i}].readings`,
      `give a fitted rotation of ${rotation.toFixed(2)} rad, far outside the small-angle model: check the readings and the gauge points' positions`,
    );
  }
  const judgement = judgeOutliers(flat.buffer, core, passes.scatterMm, passes.limitFor, passes.judgement);
  // Kept for the pose's fit, built if it is read (storedFit).
  store.covariances.push(passes.covarianceOut, passes.covarianceIn);
  store.unchecked.push(passes.uncheckedOut, passes.uncheckedIn);
  keepJudgement(store, 2 * i, judgement.outOfPlane);
  keepJudgement(store, 2 * i + 1, judgement.inPlane);
  const outliers = judgement.flagged.length === 0 ? null : flaggedReadings(flat.buffer, judgement, passes.labelOf);
  store.outliers.push(outliers);
  passes.fitted[i] = 1;

  // The measures as numbers, straight into the columns the bounds read.
  const outSd = readingSd(core.outOfPlane.status, judgement.outOfPlane.scatterMm, residualSd(core.outOfPlane));
  const inSd = readingSd(core.inPlane.status, judgement.inPlane.scatterMm, residualSd(core.inPlane));
  const extremes = passes.extremes;
  passes.extremesOf(core.tx, core.ty, core.tz, core.wx, core.wy, core.wz, extremes);
  const columns = passes.columns;
  for (const measure of ENVELOPE_MEASURES) {
    const at = extremeAt(measure, extremes);
    columns[measure].values[i] = measureSize(measure, extremes[at]);
    columns[measure].uncertainties[i] = measureUncertainty(measure, extremes[at + 1], extremes[at + 2], outSd, inSd, passes.covarianceOut, passes.covarianceIn);
  }

  const flags = passes.flags;
  if (outliers !== null) {
    for (const o of outliers) {
      flags.push({ poseId: pose.id, pointId: o.pointId, axis: o.axis, valueMm: o.value, residualMm: o.residual, score: o.score, kind: 'outlier' });
    }
  }
  for (const part of ['outOfPlane', 'inPlane'] as const) {
    if (!judgement[part].misfit) continue;
    const end = flat.start[i] + flat.count[i];
    for (let k = flat.start[i]; k < end; k++) {
      if ((flat.buffer.axis[k] === 0) !== (part === 'outOfPlane')) continue;
      const index = flat.inputIndex[k];
      flags.push({
        poseId: pose.id,
        pointId: readings[index].pointId,
        axis: AXIS_OF_CODE[flat.buffer.axis[k]],
        valueMm: flat.buffer.value[k],
        residualMm: flat.buffer.residual[k],
        score: null,
        kind: 'misfit',
      });
    }
  }
  return poseResult(passes, i, false, null, remarkFitOf(passes, layout, judgement, outliers));
}

/**
 * What the remarks read of a fitted pose's fit: for a pose with no flag of its own, one object
 * shared by the poses of its layout (the parts' reasons and notes depend on the layout alone).
 */
function remarkFitOf(passes: PosePasses, layout: PoseLayout, judgement: PoseJudgement, outliers: FlaggedReading[] | null): RemarkPose['fit'] {
  if (passes.remarkFit === null || passes.remarkLayout !== layout) {
    const core = passes.core as PoseFitCore;
    const counts = { lateral: layout.inPlane.nL, vertical: layout.inPlane.nV };
    passes.remarkOut = remarkPart('outOfPlane', core.outOfPlane, judgement.outOfPlane.check, counts, passes.uncheckedOut);
    passes.remarkIn = remarkPart('inPlane', core.inPlane, judgement.inPlane.check, counts, passes.uncheckedIn);
    passes.remarkFit = { outliers: NO_OUTLIERS, outOfPlane: passes.remarkOut, inPlane: passes.remarkIn };
    passes.remarkLayout = layout;
  }
  const misfitOut = judgement.outOfPlane.misfit;
  const misfitIn = judgement.inPlane.misfit;
  if (outliers === null && !misfitOut && !misfitIn) return passes.remarkFit;
  return {
    outliers: outliers ?? NO_OUTLIERS,
    outOfPlane: misfitOut ? { ...passes.remarkOut, misfit: true } : passes.remarkOut,
    inPlane: misfitIn ? { ...passes.remarkIn, misfit: true } : passes.remarkIn,
  };
}

/** One pose's result (one shape for all poses), and the facts the remarks read of it. */
function poseResult(passes: PosePasses, i: number, isBaseline: boolean, note: string | null, remarkFit: RemarkPose['fit']): PoseResult {
  const { s, flat } = passes;
  const poseId = passes.input.poses[i].id;
  const missingBaselineCount = flat.missingBaseline[i];
  passes.remarkPoses.push({ poseId, isBaseline, note, missingBaselineCount, fit: remarkFit });
  return new PoseResultView(passes.store, i, poseId, isBaseline, s.liftTwists[i], s.relativeTwists[i], missingBaselineCount, note);
}

function directionName(direction: TwistDirection): string {
  return TWIST_DIRECTION_NAMES[direction];
}

interface DirectionData {
  poseIndexes: number[];
  /** The poses' twist magnitudes (degrees), in the order of poseIndexes. */
  xs: Float64Array;
  medianTwistDeg: number;
}

/** The fitted poses of each twist direction, checked as repeats for the tolerance method. */
function directionData(
  input: EnvelopeInput,
  poses: readonly PoseResult[],
  fitted: Uint8Array,
  p: EnvelopeParameters,
  notes: string[],
): Record<TwistDirection, DirectionData> {
  const indexes: Record<TwistDirection, number[]> = { positive: [], negative: [] };
  const slight: string[] = [];
  for (let i = 0; i < poses.length; i++) {
    const pose = poses[i];
    // A pose has measures exactly when it has a fit (reading either would build it).
    if (fitted[i] === 0) continue;
    if (Math.abs(pose.twistDeg) < MIN_FIT_TWIST_DEG) slight.push(pose.poseId);
    else indexes[pose.twistDeg > 0 ? 'positive' : 'negative'].push(i);
  }
  const data = {} as Record<TwistDirection, DirectionData>;
  for (const direction of TWIST_DIRECTIONS) {
    const poseIndexes = indexes[direction];
    const xs = new Float64Array(poseIndexes.length);
    for (let k = 0; k < xs.length; k++) xs[k] = Math.abs(poses[poseIndexes[k]].twistDeg);
    data[direction] = { poseIndexes, xs, medianTwistDeg: 0 };
  }
  if (slight.length > 0)
    notes.push(`${slight.join(', ')}: twisted less than ${MIN_FIT_TWIST_DEG}° from the baseline: measured, but not used for the twist lines`);
  for (const direction of TWIST_DIRECTIONS) {
    const d = data[direction];
    const sorted = d.xs.slice().sort();
    const mid = sorted.length >> 1;
    d.medianTwistDeg = sorted.length === 0 ? 0 : sorted.length % 2 === 1 ? sorted[mid] : 0.5 * (sorted[mid - 1] + sorted[mid]);
    if (p.method === 'tolerance') {
      d.xs.forEach((x, k) => {
        if (Math.abs(x - d.medianTwistDeg) > p.repeatBandDeg) {
          const index = d.poseIndexes[k];
          throw new FlexInputError(
            FN,
            `poses[${index}]`,
            `('${input.poses[index].id}') is twisted ${x.toFixed(1)}° (${directionName(direction)}), outside ±${p.repeatBandDeg}° of the runs' median ${d.medianTwistDeg.toFixed(1)}°: the tolerance method takes repeated runs of one pose; use the prediction method for poses at different twists`,
          );
        }
      });
    }
    if (d.xs.length === 0) {
      const other = direction === 'positive' ? 'negative' : 'positive';
      notes.push(
        `no pose twisted ${directionName(direction)} by ${MIN_FIT_TWIST_DEG}° or more: the bound covers ${directionName(other)} only; test the other diagonal too`,
      );
    } else if (p.designTwistDeg < d.medianTwistDeg && p.method === 'tolerance') {
      notes.push(`the design twist (${p.designTwistDeg}°) is below the repeated runs' twist ${directionName(direction)} (${d.medianTwistDeg.toFixed(1)}°)`);
    } else {
      let reached = -Infinity;
      for (const x of d.xs) reached = Math.max(reached, x);
      if (p.designTwistDeg < reached) {
        notes.push(`the design twist (${p.designTwistDeg}°) is below the largest twist reached ${directionName(direction)} (${reached.toFixed(1)}°)`);
      } else if (p.designTwistDeg > FAR_EXTRAPOLATION * reached) {
        notes.push(
          `the design twist (${p.designTwistDeg}°) is ${(p.designTwistDeg / reached).toFixed(1)} × the largest twist reached ${directionName(direction)} (${reached.toFixed(1)}°): a long extrapolation`,
        );
      }
    }
  }
  return data;
}

/** Per measure, each pose's value and its 1-SD uncertainty (NaN where unknown or for a pose without measures). */
type MeasureColumns = Record<EnvelopeMeasure, { values: Float64Array; uncertainties: Float64Array }>;

/** Empty measure columns for `count` poses (NaN: no measure). */
function emptyMeasureColumns(count: number): MeasureColumns {
  const columns = {} as MeasureColumns;
  for (const measure of ENVELOPE_MEASURES)
    columns[measure] = { values: new Float64Array(count).fill(Number.NaN), uncertainties: new Float64Array(count).fill(Number.NaN) };
  return columns;
}

function measureEnvelope(
  measure: EnvelopeMeasure,
  poses: readonly PoseResult[],
  fitted: Uint8Array,
  columns: MeasureColumns,
  data: Record<TwistDirection, DirectionData>,
  p: EnvelopeParameters,
  settings: BoundSettings,
): MeasureEnvelope {
  const { values, uncertainties } = columns[measure];
  let worstIndex = -1;
  let fitUncertaintyMm: number | null = null;
  for (let i = 0; i < poses.length; i++) {
    if (fitted[i] === 0) continue;
    if (worstIndex < 0 || values[i] > values[worstIndex]) worstIndex = i;
    if (!Number.isNaN(uncertainties[i])) fitUncertaintyMm = Math.max(fitUncertaintyMm ?? 0, uncertainties[i]);
  }
  const worst = (poses[worstIndex].measures as Record<EnvelopeMeasure, PoseMeasure>)[measure];
  const directions = {} as Record<TwistDirection, DirectionBound>;
  for (const direction of TWIST_DIRECTIONS) {
    const d = data[direction];
    const ys = new Float64Array(d.poseIndexes.length);
    for (let k = 0; k < ys.length; k++) ys[k] = values[d.poseIndexes[k]];
    directions[direction] =
      p.method === 'prediction'
        ? predictionDirectionBound(direction, d.xs, ys, settings)
        : toleranceDirectionBound(direction, d.xs, ys, d.medianTwistDeg, settings);
  }
  let governingDirection: TwistDirection | null = null;
  for (const direction of TWIST_DIRECTIONS) {
    const bound = directions[direction].upperBoundMm;
    if (bound !== null && (governingDirection === null || bound > (directions[governingDirection].upperBoundMm as number))) governingDirection = direction;
  }
  const upperBoundMm = governingDirection === null ? null : directions[governingDirection].upperBoundMm;
  const projectedMm = governingDirection === null ? null : directions[governingDirection].projectedMm;
  const measured = worst.valueMm;
  const governing = upperBoundMm !== null && upperBoundMm > measured ? 'upperBound' : 'measured';
  const baseMm = governing === 'upperBound' ? (upperBoundMm as number) : measured;
  const withMarginMm = baseMm * (1 + p.margin);
  const withAllowanceMm = withMarginMm + p.allowanceMm;
  const envelopeMm = roundUpToIncrement(withAllowanceMm, p.incrementMm);
  const terms = {
    measuredWorstMm: measured,
    measuredWorstPoseId: poses[worstIndex].poseId,
    directions,
    governingDirection,
    upperBoundMm,
    governing,
    fitUncertaintyMm: fitUncertaintyMm as number | null,
    withMarginMm,
    withAllowanceMm,
    envelopeMm,
  } as const;
  return {
    measure,
    axis: MEASURE_AXIS[measure],
    measuredWorstMm: measured,
    measuredWorstPoseId: terms.measuredWorstPoseId,
    measuredWorstAt: { y: worst.y, z: worst.z, side: worst.side },
    directions,
    governingDirection,
    projectedMm,
    upperBoundMm,
    governing,
    fitUncertaintyMm,
    baseMm,
    withMarginMm,
    withAllowanceMm,
    envelopeMm,
    reasons: measureReasons(terms, p),
  };
}

/**
 * Derives the design envelope of a flex-test session.
 * @param input vehicle tracks, gauge points, the opening's outline, how readings were entered, the
 *   reference (baseline) pose, the poses with their lifts and readings, and the design parameters.
 * @returns per pose its twist, fit and measures; per measure (fore-aft opening and closing, lateral,
 *   vertical) the bound of each twist direction, the governing one, the envelope and its reasons;
 *   the flagged readings; and session-wide notes.
 * @example designEnvelope({ ...session, parameters: { designTwistDeg: 12 } }).measures.lateral.envelopeMm // => 185
 */
export function designEnvelope(input: EnvelopeInput): EnvelopeResult {
  if (input === null || typeof input !== 'object') throw new FlexInputError(FN, 'input', 'must be an object');
  const p = resolveParameters(input.parameters);
  if (input.tracks === null || typeof input.tracks !== 'object') throw new FlexInputError(FN, 'tracks', 'must be an object');
  requireTrack('tracks.frontMm', input.tracks.frontMm);
  requireTrack('tracks.rearMm', input.tracks.rearMm);
  validateOutline(FN, input.outline);
  const pointIndex = indexGaugeLocations(FN, 'gaugePoints', input.gaugePoints);
  const { liftTwists, scratch, codeStart } = checkPoses(input, pointIndex);
  if (input.readingMode !== 'gap' && input.readingMode !== 'displacement') {
    throw new FlexInputError(FN, 'readingMode', `must be 'gap' or 'displacement', got '${String(input.readingMode)}'`);
  }
  const baselineIndex = input.baselinePoseId === undefined ? -1 : input.poses.findIndex((pose) => pose.id === input.baselinePoseId);
  if (input.baselinePoseId !== undefined && baselineIndex < 0) {
    throw new FlexInputError(FN, 'baselinePoseId', `names no pose of the session: '${String(input.baselinePoseId)}'`);
  }
  if (input.readingMode === 'gap' && baselineIndex < 0) {
    throw new FlexInputError(FN, 'baselinePoseId', "is required when readings are raw gaps (readingMode 'gap')");
  }
  const baselineTwistDeg = baselineIndex < 0 ? 0 : liftTwists[baselineIndex];
  const relativeTwists = new Float64Array(liftTwists.length);
  for (let i = 0; i < liftTwists.length; i++) {
    const relative = liftTwists[i] - baselineTwistDeg;
    if (Math.abs(relative) > MAX_TWIST_DEG) {
      throw new FlexInputError(
        FN,
        `poses[${i}].lifts`,
        `give a twist of ${relative.toFixed(1)}° relative to the baseline pose, beyond ±${MAX_TWIST_DEG}°: check the lifts`,
      );
    }
    relativeTwists[i] = relative;
  }

  const notes: string[] = [];
  const session: Session = { points: input.gaugePoints, scratch, codeStart, baselineIndex, liftTwists, relativeTwists };
  const { poses, fitted, remarkPoses, scatterMm, flags, columns } = evaluatePoses(input, session);
  if (!fitted.includes(1)) throw new FlexInputError(FN, 'poses', 'need at least one pose with readings besides the baseline');
  // The remarks read the facts judgePose kept of each pose, so no pose's fit is built for them.
  const readingNotes = readingRemarks({ poses: remarkPoses, scatterMm, baselineTwistDeg });
  const data = directionData(input, poses, fitted, p, notes);

  const tCache = new Map<number, number>();
  const k1Cache = new Map<number, number>();
  const settings: BoundSettings = {
    designTwistDeg: p.designTwistDeg,
    confidence: p.confidence,
    coverage: p.coverage,
    throughOrigin: p.throughOrigin,
    repeatBandDeg: p.repeatBandDeg,
    tFor: (df) => {
      if (!tCache.has(df)) tCache.set(df, studentTQuantile(p.confidence, df));
      return tCache.get(df) as number;
    },
    k1For: (n) => {
      if (!k1Cache.has(n)) k1Cache.set(n, oneSidedToleranceFactor(n, p.coverage, p.confidence));
      return k1Cache.get(n) as number;
    },
  };
  const measures = {} as Record<EnvelopeMeasure, MeasureEnvelope>;
  for (const measure of ENVELOPE_MEASURES) measures[measure] = measureEnvelope(measure, poses, fitted, columns, data, p, settings);
  return { parameters: p, baselineTwistDeg, scatterMm, poses, measures, flags, readingNotes, notes };
}
