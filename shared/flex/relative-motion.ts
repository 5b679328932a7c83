/**
 * Relative-motion fit of one pose: the small-angle rigid motion of the cab relative to the body
 * that best explains the readings at the gauge points, with residuals and the readings the
 * outlier rule flags (see docs/method.md §2–§3).
 *
 * Model (d = t + omega × r, r = (0, y, z)):
 *   dx = tx + wy·z − wz·y ;  dy = ty − wx·z ;  dz = tz + wx·y.
 * Two independent least-squares problems (see fitPoseParts): out-of-plane (tx, wy, wz) from the
 * fore-aft readings, in-plane (ty, tz, wx) from the lateral and vertical readings. A rotation is
 * fitted only where the points' layout would carry a reading's error to the opening's edge at most
 * MAX_EDGE_ERROR_RATIO (10) times over; otherwise the part keeps the tilt along the points' line or
 * its translation only, and `reason` says why, with the factor the refused rotation would have had.
 * Each part carries the unscaled covariance of its parameters, so the fit's uncertainty can be
 * carried to any point of the outline.
 * Outliers: each reading's deleted residual judged against the reading SD (judgeOutliers), with a
 * Bonferroni limit z(1 − α/(2T)) over the T readings judged, α = 1 %. A part needs 2 more readings
 * than parameters to single out a misread; with 1 more it is judged as a whole ('misfitOnly').
 * Source: docs/method.md §2–§3; small-rotation rigid-body kinematics; least squares: Montgomery,
 * Peck & Vining (5th ed.), ch. 3; outliers: the same, §4.2.1. Complexity O(readings).
 */
import { FlexInputError, requireFinite, requireLength } from './errors';
import { packFit, type RelativeMotionFit } from './fit-summary';
import { indexGaugeLocations } from './gauge-index';
import { normalQuantile } from './normal';
import { OUTLIER_FALSE_ALARM_RATE, judgeOutliers } from './outlier-rule';
import { outlineCorners, validateOutline, type OpeningOutline } from './perimeter';
import { fitPoseParts, poseBuffer } from './pose-fit';
import { isAxis, type Axis, type GaugeLocation, type GaugeValue } from './types';

/**
 * Reading SD the outlier rule assumes when the readings show no more scatter: gauge gaps are read
 * to about ±0.5 mm with a tape or rule (common practice), taken here as one SD — conservative, since
 * rounding to the nearest millimetre alone gives 1/√12 = 0.29 mm.
 */
export const READING_SD_MM = 0.5;

export interface FitOptions {
  /** Reading SD to judge residuals against (mm, > 0); default READING_SD_MM. */
  readingSdMm?: number;
}

const FN = 'fitRelativeMotion';
const AXIS_CODE: Record<Axis, number> = { foreAft: 0, lateral: 1, vertical: 2 };

/**
 * Fits the cab's motion relative to the body from one pose's readings.
 * @param points where the gauge points are (id, y, z in mm).
 * @param readings the pose's displacements (pointId, axis, value in mm); one per point and axis.
 * @param outline the opening, against which identifiability is judged.
 * @param options readingSdMm: the reading SD to judge residuals against (default 0.5 mm).
 * @returns the motion, per-part status and reasons, residuals and the flagged readings.
 * @example fitRelativeMotion(
 *   [{ id: 'A', y: 300, z: 700 }, { id: 'B', y: -300, z: 700 }, { id: 'C', y: 300, z: 1300 }],
 *   [{ pointId: 'A', axis: 'foreAft', value: 2 }, { pointId: 'B', axis: 'foreAft', value: 2 },
 *    { pointId: 'C', axis: 'foreAft', value: 8 }],
 *   { width: 700, height: 900, cornerRadius: 80, bottomZ: 600 }).motion.omega.y // => 0.01
 */
export function fitRelativeMotion(
  points: readonly GaugeLocation[],
  readings: readonly GaugeValue[],
  outline: OpeningOutline,
  options: FitOptions = {},
): RelativeMotionFit {
  if (!Array.isArray(readings) || readings.length === 0) throw new FlexInputError(FN, 'readings', 'must be a non-empty array: nothing to fit');
  validateOutline(FN, outline);
  const scatterMm = options.readingSdMm ?? READING_SD_MM;
  requireFinite(FN, 'options.readingSdMm', scatterMm);
  if (scatterMm <= 0) throw new FlexInputError(FN, 'options.readingSdMm', `must be greater than 0, got ${scatterMm}`);
  const byId = indexGaugeLocations(FN, 'points', points);
  const count = readings.length;
  const buffer = poseBuffer(count);
  const seen = new Map<string, number>();
  readings.forEach((reading, i) => {
    if (reading === null || typeof reading !== 'object') throw new FlexInputError(FN, `readings[${i}]`, 'must be an object');
    const at = byId.get(reading.pointId);
    if (at === undefined) throw new FlexInputError(FN, `readings[${i}].pointId`, `names no known gauge point: '${String(reading.pointId)}'`);
    if (!isAxis(reading.axis)) throw new FlexInputError(FN, `readings[${i}].axis`, `must be 'foreAft', 'lateral' or 'vertical', got '${String(reading.axis)}'`);
    requireLength(FN, `readings[${i}].value`, reading.value);
    const key = `${reading.pointId}\u0000${reading.axis}`;
    const first = seen.get(key);
    if (first !== undefined)
      throw new FlexInputError(FN, `readings[${i}]`, `repeats the reading of point '${reading.pointId}' on axis ${reading.axis} (readings[${first}])`);
    seen.set(key, i);
    buffer.axis[i] = AXIS_CODE[reading.axis as Axis];
    buffer.y[i] = points[at].y;
    buffer.z[i] = points[at].z;
    buffer.value[i] = reading.value;
  });
  const core = fitPoseParts(buffer, outlineCorners(outline));
  const judgement = judgeOutliers(buffer, core, { outOfPlane: scatterMm, inPlane: scatterMm }, (tests) =>
    normalQuantile(1 - OUTLIER_FALSE_ALARM_RATE / (2 * tests)),
  );
  return packFit(buffer, core, judgement, (i) => ({ pointId: readings[i].pointId, axis: readings[i].axis, index: i }));
}
