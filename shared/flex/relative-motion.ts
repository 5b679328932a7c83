/**
 * Relative-motion fit of one pose: the small-angle rigid motion of the cab relative to the body
 * that best explains the readings at the gauge points, with residuals and outlier flags.
 *
 * Model (d = t + omega × r, r = (0, y, z)):
 *   dx = tx + wy·z − wz·y ;  dy = ty − wx·z ;  dz = tz + wx·y.
 * Two independent linear least-squares problems, each solved by Householder QR on centred
 * coordinates (see leastSquares):
 * - out-of-plane (tx, wy, wz) from fore-aft readings: needs readings at ≥ 3 points not on one line;
 *   on one line only the tilt along that line is found (the tilt across it is set to 0); at one point
 *   only, translation tx (rotation 0).
 * - in-plane (ty, tz, wx) from lateral and vertical readings jointly: wx needs lateral readings at
 *   different heights or vertical readings at different lateral positions; otherwise translation only.
 *   A missing axis leaves its translation at 0.
 * "Different" means a spread (RMS distance from the mean) of at least MIN_LEVER_MM; "on one line"
 * means points deviate from their best line by less than max(MIN_LEVER_MM, COLLINEAR_RATIO × the spread
 * along it). Below these, a rotation would magnify reading error (±0.5 mm) many times over.
 * Outliers: modified z-score of each part's residuals (see robust-scale), checked only where the part
 * has at least 3 more readings than fitted parameters.
 * Source: the model is small-rotation rigid-body kinematics; least squares: Golub & Van Loan §5.3;
 * outliers: NIST/SEMATECH e-Handbook §1.3.5.17. Complexity O(readings) per pose.
 *
 * Example: fitRelativeMotion(
 *   [{ id: 'A', y: 0, z: 0 }, { id: 'B', y: 100, z: 0 }, { id: 'C', y: 0, z: 100 }],
 *   [{ pointId: 'A', axis: 'foreAft', value: 2 }, { pointId: 'B', axis: 'foreAft', value: 2 },
 *    { pointId: 'C', axis: 'foreAft', value: 3 }]).motion.omega.y // => 0.01 (tx = 2, wz = 0)
 */
import { FlexInputError, requireLength } from './errors';
import { leastSquares } from './least-squares';
import { predictDisplacement } from './predict-displacement';
import { MODIFIED_Z_THRESHOLD, modifiedZScores } from './robust-scale';
import { isAxis, type Axis, type GaugePoint, type Reading, type RigidMotion } from './types';

export const MIN_LEVER_MM = 10;
export const COLLINEAR_RATIO = 0.05;
/** Readings beyond the fitted parameters needed before outliers are judged. */
const MIN_REDUNDANCY_FOR_OUTLIERS = 3;

export type FitPartStatus = 'full' | 'partial' | 'translationOnly' | 'none';

export interface FitPart {
  status: FitPartStatus;
  readingCount: number;
  parameterCount: number;
  /** √(mean residual²) over this part's readings; 0 without readings. */
  residualRms: number;
  /** Why the part is not fully identifiable; null when status is 'full'. */
  reason: string | null;
  /** Whether there were enough redundant readings to judge outliers. */
  outliersChecked: boolean;
}

export interface ReadingResidual {
  /** Index of the reading in the input array. */
  index: number;
  pointId: string;
  axis: Axis;
  value: number;
  predicted: number;
  residual: number;
  /** Modified z-score; null where the part had too few readings to judge. */
  modifiedZ: number | null;
  outlier: boolean;
}

export interface RelativeMotionFit {
  motion: RigidMotion;
  residuals: ReadingResidual[];
  residualRms: number;
  outOfPlane: FitPart;
  inPlane: FitPart;
  outliers: ReadingResidual[];
}

export interface FitOptions {
  /** Modified z-score beyond which a reading is flagged; default 3.5. */
  outlierThreshold?: number;
}

const FN = 'fitRelativeMotion';

interface Located {
  index: number;
  y: number;
  z: number;
  value: number;
}

interface OutOfPlane {
  tx: number;
  wy: number;
  wz: number;
  status: FitPartStatus;
  parameterCount: number;
  reason: string | null;
}

interface InPlane {
  ty: number;
  tz: number;
  wx: number;
  status: FitPartStatus;
  parameterCount: number;
  reason: string | null;
}

function mean(values: readonly number[]): number {
  let sum = 0;
  for (const v of values) sum += v;
  return sum / values.length;
}

function rmsSpread(values: readonly number[]): number {
  const m = mean(values);
  let sum = 0;
  for (const v of values) sum += (v - m) * (v - m);
  return Math.sqrt(sum / values.length);
}

function fitOutOfPlane(rows: readonly Located[]): OutOfPlane {
  if (rows.length === 0) {
    return { tx: 0, wy: 0, wz: 0, status: 'none', parameterCount: 0, reason: 'no fore-aft readings: out-of-plane motion set to 0' };
  }
  const yMean = mean(rows.map((r) => r.y));
  const zMean = mean(rows.map((r) => r.z));
  let syy = 0;
  let syz = 0;
  let szz = 0;
  for (const r of rows) {
    syy += (r.y - yMean) ** 2;
    syz += (r.y - yMean) * (r.z - zMean);
    szz += (r.z - zMean) ** 2;
  }
  syy /= rows.length;
  syz /= rows.length;
  szz /= rows.length;
  // Eigenvalues of the 2×2 scatter matrix: spreads along and across the points' best line.
  const half = Math.sqrt(((syy - szz) / 2) ** 2 + syz * syz);
  const along = Math.sqrt(Math.max(0, (syy + szz) / 2 + half));
  const across = Math.sqrt(Math.max(0, (syy + szz) / 2 - half));

  if (along < MIN_LEVER_MM) {
    return {
      tx: mean(rows.map((r) => r.value)),
      wy: 0,
      wz: 0,
      status: 'translationOnly',
      parameterCount: 1,
      reason: 'fore-aft readings at one point only: rotations about y and z need three points not on one line, set to 0',
    };
  }
  if (across < Math.max(MIN_LEVER_MM, COLLINEAR_RATIO * along)) {
    const lambda = (syy + szz) / 2 + half;
    const raw = syz !== 0 ? [lambda - szz, syz] : syy >= szz ? [1, 0] : [0, 1];
    const length = Math.hypot(raw[0], raw[1]);
    const uy = raw[0] / length;
    const uz = raw[1] / length;
    const [c, slope] = leastSquares(
      rows.map((r) => [1, (r.y - yMean) * uy + (r.z - zMean) * uz]),
      rows.map((r) => r.value),
    );
    // dx varies along the line with gradient slope·u = (−wz, wy); across the line it is taken as flat.
    const wz = -slope * uy;
    const wy = slope * uz;
    return {
      tx: c - wy * zMean + wz * yMean,
      wy,
      wz,
      status: 'partial',
      parameterCount: 2,
      reason: 'fore-aft readings at points along one line: the tilt across that line is not identifiable, set to 0',
    };
  }
  const [c, wy, wz] = leastSquares(
    rows.map((r) => [1, r.z - zMean, -(r.y - yMean)]),
    rows.map((r) => r.value),
  );
  return { tx: c - wy * zMean + wz * yMean, wy, wz, status: 'full', parameterCount: 3, reason: null };
}

function fitInPlane(lateral: readonly Located[], vertical: readonly Located[]): InPlane {
  if (lateral.length === 0 && vertical.length === 0) {
    return { ty: 0, tz: 0, wx: 0, status: 'none', parameterCount: 0, reason: 'no lateral or vertical readings: in-plane motion set to 0' };
  }
  const missing: string[] = [];
  if (lateral.length === 0) missing.push('no lateral readings: ty set to 0');
  if (vertical.length === 0) missing.push('no vertical readings: tz set to 0');
  const lateralLever = lateral.length > 0 ? rmsSpread(lateral.map((r) => r.z)) : 0;
  const verticalLever = vertical.length > 0 ? rmsSpread(vertical.map((r) => r.y)) : 0;

  if (lateralLever < MIN_LEVER_MM && verticalLever < MIN_LEVER_MM) {
    return {
      ty: lateral.length > 0 ? mean(lateral.map((r) => r.value)) : 0,
      tz: vertical.length > 0 ? mean(vertical.map((r) => r.value)) : 0,
      wx: 0,
      status: 'translationOnly',
      parameterCount: (lateral.length > 0 ? 1 : 0) + (vertical.length > 0 ? 1 : 0),
      reason: [
        'rotation about x not identifiable: needs lateral readings at different heights or vertical readings at different lateral positions; set to 0',
        ...missing,
      ].join('; '),
    };
  }
  // Centred at reference heights so the rotation column is not nearly parallel to the translations.
  const zRef = lateral.length > 0 ? mean(lateral.map((r) => r.z)) : 0;
  const yRef = vertical.length > 0 ? mean(vertical.map((r) => r.y)) : 0;
  const hasLateral = lateral.length > 0;
  const hasVertical = vertical.length > 0;
  const rows: number[][] = [];
  const values: number[] = [];
  for (const r of lateral) {
    rows.push([...(hasLateral ? [1] : []), ...(hasVertical ? [0] : []), -(r.z - zRef)]);
    values.push(r.value);
  }
  for (const r of vertical) {
    rows.push([...(hasLateral ? [0] : []), ...(hasVertical ? [1] : []), r.y - yRef]);
    values.push(r.value);
  }
  const solution = leastSquares(rows, values);
  const wx = solution[solution.length - 1];
  const tyRef = hasLateral ? solution[0] : 0;
  const tzRef = hasVertical ? solution[hasLateral ? 1 : 0] : 0;
  return {
    ty: hasLateral ? tyRef + wx * zRef : 0,
    tz: hasVertical ? tzRef - wx * yRef : 0,
    wx,
    status: missing.length === 0 ? 'full' : 'partial',
    parameterCount: solution.length,
    reason: missing.length === 0 ? null : missing.join('; '),
  };
}

function validate(points: readonly GaugePoint[], readings: readonly Reading[]): Map<string, GaugePoint> {
  if (!Array.isArray(points) || points.length === 0) throw new FlexInputError(FN, 'points', 'must be a non-empty array');
  if (!Array.isArray(readings) || readings.length === 0) {
    throw new FlexInputError(FN, 'readings', 'must be a non-empty array: nothing to fit');
  }
  const byId = new Map<string, GaugePoint>();
  points.forEach((point, i) => {
    if (point === null || typeof point !== 'object' || typeof point.id !== 'string') {
      throw new FlexInputError(FN, `points[${i}].id`, 'must be a string');
    }
    if (byId.has(point.id)) throw new FlexInputError(FN, `points[${i}].id`, `repeats gauge point id '${point.id}'`);
    requireLength(FN, `points[${i}].y`, point.y);
    requireLength(FN, `points[${i}].z`, point.z);
    byId.set(point.id, point);
  });
  readings.forEach((reading, i) => {
    if (reading === null || typeof reading !== 'object') throw new FlexInputError(FN, `readings[${i}]`, 'must be an object');
    if (!byId.has(reading.pointId)) {
      throw new FlexInputError(FN, `readings[${i}].pointId`, `names no known gauge point: '${String(reading.pointId)}'`);
    }
    if (!isAxis(reading.axis)) {
      throw new FlexInputError(FN, `readings[${i}].axis`, `must be 'foreAft', 'lateral' or 'vertical', got '${String(reading.axis)}'`);
    }
    requireLength(FN, `readings[${i}].value`, reading.value);
  });
  return byId;
}

function rms(values: readonly number[]): number {
  if (values.length === 0) return 0;
  let sum = 0;
  for (const v of values) sum += v * v;
  return Math.sqrt(sum / values.length);
}

export function fitRelativeMotion(
  points: readonly GaugePoint[],
  readings: readonly Reading[],
  options: FitOptions = {},
): RelativeMotionFit {
  const byId = validate(points, readings);
  const threshold = options.outlierThreshold ?? MODIFIED_Z_THRESHOLD;
  if (!Number.isFinite(threshold) || threshold <= 0) {
    throw new FlexInputError(FN, 'options.outlierThreshold', `must be a positive number, got ${String(threshold)}`);
  }
  const located: Record<Axis, Located[]> = { foreAft: [], lateral: [], vertical: [] };
  readings.forEach((reading, index) => {
    const point = byId.get(reading.pointId) as GaugePoint;
    located[reading.axis].push({ index, y: point.y, z: point.z, value: reading.value });
  });

  const outOfPlane = fitOutOfPlane(located.foreAft);
  const inPlane = fitInPlane(located.lateral, located.vertical);
  const motion: RigidMotion = {
    t: { x: outOfPlane.tx, y: inPlane.ty, z: inPlane.tz },
    omega: { x: inPlane.wx, y: outOfPlane.wy, z: outOfPlane.wz },
  };

  const residuals: ReadingResidual[] = readings.map((reading, index) => {
    const point = byId.get(reading.pointId) as GaugePoint;
    const d = predictDisplacement(motion, point.y, point.z);
    const predicted = reading.axis === 'foreAft' ? d.dx : reading.axis === 'lateral' ? d.dy : d.dz;
    return {
      index,
      pointId: reading.pointId,
      axis: reading.axis,
      value: reading.value,
      predicted,
      residual: reading.value - predicted,
      modifiedZ: null,
      outlier: false,
    };
  });

  const summarise = (part: OutOfPlane | InPlane, members: ReadingResidual[]): FitPart => {
    const outliersChecked = members.length - part.parameterCount >= MIN_REDUNDANCY_FOR_OUTLIERS;
    if (outliersChecked) {
      const scores = modifiedZScores(members.map((m) => m.residual));
      members.forEach((m, i) => {
        m.modifiedZ = scores[i];
        m.outlier = Math.abs(scores[i]) > threshold;
      });
    }
    return {
      status: part.status,
      readingCount: members.length,
      parameterCount: part.parameterCount,
      residualRms: rms(members.map((m) => m.residual)),
      reason: part.reason,
      outliersChecked,
    };
  };

  const outOfPlanePart = summarise(outOfPlane, residuals.filter((r) => r.axis === 'foreAft'));
  const inPlanePart = summarise(inPlane, residuals.filter((r) => r.axis !== 'foreAft'));
  return {
    motion,
    residuals,
    residualRms: rms(residuals.map((r) => r.residual)),
    outOfPlane: outOfPlanePart,
    inPlane: inPlanePart,
    outliers: residuals.filter((r) => r.outlier),
  };
}
