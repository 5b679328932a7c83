/**
 * The public summary of one pose's relative-motion fit: the motion, per part (out-of-plane and
 * in-plane) its status and the reasons in the engineer's words, residuals, the parameters'
 * unscaled covariance, the kind of outlier check it allowed, and the flagged readings.
 * Shared by fitRelativeMotion and designEnvelope so both report a fit the same way.
 * See docs/method.md §2–§3.
 */
import { nounFor, plural } from '../plural';
import { MAX_EDGE_ERROR_RATIO, type PartCore, type PoseBuffer, type PoseFitCore } from './pose-fit';
import type { OutlierCheck, PoseJudgement } from './outlier-rule';
import type { Axis, FitPartStatus, RigidMotion } from './types';

export interface FitPart {
  status: FitPartStatus;
  readingCount: number;
  parameterCount: number;
  /** √(mean residual²) over this part's readings; 0 without readings. */
  residualRms: number;
  /** s = √(SSR / (n − p)); null without redundancy. */
  residualSdMm: number | null;
  /** Why the part is not fully identifiable; null when status is 'full'. */
  reason: string | null;
  /** 1-SD error of this part's prediction at the opening's worst corner, per mm of reading SD. */
  edgeErrorRatio: number;
  /**
   * Unscaled covariance (XᵀX)⁻¹ of (tx, wy, wz) or (ty, tz, wx), row-major 3×3 (× σ² for mm², rad²).
   * Read-only: in designEnvelope's result the poses read at the same points share one array.
   */
  covariance: readonly number[];
  outlierCheck: OutlierCheck;
  /** The reading SD this part's residuals were judged against (mm). */
  scatterMm: number;
  /** The score above which a reading is flagged; null when nothing in the pose could be judged. */
  outlierLimit: number | null;
  /** Why the outlier check was limited or skipped; null when every reading was judged. */
  outlierNote: string | null;
  /** 'misfitOnly': the readings do not fit one rigid motion, and which one is off cannot be told. */
  misfit: boolean;
}

export interface FlaggedReading {
  /** Index of the reading in the input array. */
  index: number;
  pointId: string;
  axis: Axis;
  value: number;
  predicted: number;
  residual: number;
  /** The deleted residual in units of its standard error (the outlier rule's score). */
  score: number;
}

export interface RelativeMotionFit {
  motion: RigidMotion;
  /** Residual of each input reading (value − fitted), in the input's order. */
  residuals: number[];
  residualRms: number;
  outOfPlane: FitPart;
  inPlane: FitPart;
  outliers: FlaggedReading[];
}

/** No readings left unchecked (shared: read, never written). */
const NONE: readonly string[] = [];

/** The number of times over as words: "12 times over", or "without limit". */
function magnified(ratio: number | null): string {
  return ratio === null || !Number.isFinite(ratio) ? 'without limit' : `${ratio.toFixed(1)} times over`;
}

/**
 * Why a part is not fully identifiable, in the engineer's words; the same text for the same gauge
 * layout, so a session can state it once for all poses. Null when the part is 'full'.
 */
function partReason(kind: 'outOfPlane' | 'inPlane', core: PartCore, counts: { lateral: number; vertical: number }): string | null {
  if (kind === 'outOfPlane') {
    switch (core.limitation) {
      case 'none':
        return 'no fore-aft readings: out-of-plane motion set to 0';
      case 'onePoint':
        return 'fore-aft readings at one point only: rotations about y and z need three points not on one line, set to 0';
      case 'line':
        return `fore-aft readings at points close to one line: the tilt across that line would carry a reading's error to the opening's edge ${magnified(core.refusedEdgeErrorRatio)} (the limit is ${MAX_EDGE_ERROR_RATIO}), so it is set to 0`;
      case 'spread':
        return `fore-aft readings at points too close together for this opening: rotations about y and z would carry a reading's error to its edge ${magnified(core.refusedEdgeErrorRatio)} (the limit is ${MAX_EDGE_ERROR_RATIO}), so only the translation is fitted and motion these points cannot see is not in the envelope`;
      default:
        return null;
    }
  }
  if (core.limitation === null) return null;
  const missing: string[] = [];
  if (counts.lateral === 0) missing.push('no lateral readings: ty set to 0');
  if (counts.vertical === 0) missing.push('no vertical readings: tz set to 0');
  if (core.limitation === 'none') return 'no lateral or vertical readings: in-plane motion set to 0';
  if (core.limitation === 'noRotation') {
    const refused =
      core.refusedEdgeErrorRatio === null
        ? ''
        : `; from these points it would carry a reading's error to the opening's edge ${magnified(core.refusedEdgeErrorRatio)} (the limit is ${MAX_EDGE_ERROR_RATIO})`;
    return [
      `rotation about x not identifiable: needs lateral readings at different heights or vertical readings at different lateral positions${refused}; set to 0`,
      ...missing,
    ].join('; ');
  }
  return missing.length === 0 ? null : missing.join('; ');
}

/** What limited a part's outlier check; null when every reading was judged or there were none. */
function outlierNote(kind: 'outOfPlane' | 'inPlane', core: PartCore, check: OutlierCheck, unchecked: readonly string[]): string | null {
  if (core.readingCount === 0) return null;
  const name = kind === 'outOfPlane' ? 'fore-aft' : 'lateral and vertical';
  // A reading that alone fixes part of the fit is matched exactly whatever its value.
  const alone =
    check === 'skipped' || unchecked.length === 0
      ? ''
      : `; the ${name} ${nounFor(unchecked.length, 'reading')} at ${unchecked.join(', ')} alone ${unchecked.length === 1 ? 'fixes' : 'fix'} part of the fit, so nothing checks ${unchecked.length === 1 ? 'it' : 'them'}`;
  if (check === 'checked') return alone === '' ? null : alone.slice(2);
  const counts = `${plural(core.readingCount, 'reading')} for ${plural(core.parameterCount, 'unknown')}; ${core.parameterCount + 2} are needed to single out a misread`;
  return (check === 'misfitOnly' ? `${name} readings judged together only (${counts})` : `outlier check skipped for ${name} readings (${counts})`) + alone;
}

/** Packs one part's core fit and its judgement into the public per-part summary. */
function summarisePart(
  kind: 'outOfPlane' | 'inPlane',
  core: PartCore,
  judgement: PoseJudgement,
  rms: number,
  counts: { lateral: number; vertical: number },
  unchecked: readonly string[],
): FitPart {
  const part = kind === 'outOfPlane' ? judgement.outOfPlane : judgement.inPlane;
  const redundancy = core.readingCount - core.parameterCount;
  return {
    status: core.status,
    readingCount: core.readingCount,
    parameterCount: core.parameterCount,
    residualRms: rms,
    residualSdMm: redundancy > 0 ? Math.sqrt(core.ssr / redundancy) : null,
    reason: partReason(kind, core, counts),
    edgeErrorRatio: core.edgeErrorRatio,
    covariance: core.covariance,
    outlierCheck: part.check,
    scatterMm: part.scatterMm,
    outlierLimit: part.limit,
    outlierNote: outlierNote(kind, core, part.check, unchecked),
    misfit: part.misfit,
  };
}

/**
 * The public fit result of a pose from its core fit and judgement (shared with designEnvelope).
 * @param buffer the pose's readings as fitted. @param core their fit. @param judgement the outlier rule's verdict.
 * @param labelOf the point id and axis of a buffer index, and its index in the caller's input.
 * @returns the RelativeMotionFit.
 * @example packFit(buffer, fitPoseParts(buffer, corners), judgement, labelOf).outOfPlane.status // => 'full'
 */
export function packFit(
  buffer: PoseBuffer,
  core: PoseFitCore,
  judgement: PoseJudgement,
  labelOf: (i: number) => { pointId: string; axis: Axis; index: number },
): RelativeMotionFit {
  const { start, count, axis, residual, standardized } = buffer;
  const residuals = new Array<number>(count);
  let squaresOut = 0;
  let squaresIn = 0;
  let lateral = 0;
  let vertical = 0;
  let uncheckedOut: string[] | null = null;
  let uncheckedIn: string[] | null = null;
  let total = 0;
  for (let k = 0; k < count; k++) {
    const i = start + k;
    const e = residual[i];
    residuals[k] = e;
    total += e * e;
    if (axis[i] === 0) squaresOut += e * e;
    else {
      squaresIn += e * e;
      if (axis[i] === 1) lateral++;
      else vertical++;
    }
    if (Number.isNaN(standardized[i])) {
      if (axis[i] === 0) (uncheckedOut ??= []).push(labelOf(i).pointId);
      else (uncheckedIn ??= []).push(labelOf(i).pointId);
    }
  }
  const counts = { lateral, vertical };
  const rmsOf = (sum: number, n: number): number => (n === 0 ? 0 : Math.sqrt(sum / n));
  const outliers = judgement.flagged.map((i): FlaggedReading => {
    const label = labelOf(i);
    return {
      index: label.index,
      pointId: label.pointId,
      axis: label.axis,
      value: buffer.value[i],
      predicted: buffer.value[i] - buffer.residual[i],
      residual: buffer.residual[i],
      score: buffer.score[i],
    };
  });
  return {
    motion: { t: { x: core.tx, y: core.ty, z: core.tz }, omega: { x: core.wx, y: core.wy, z: core.wz } },
    residuals,
    residualRms: rmsOf(total, buffer.count),
    outOfPlane: summarisePart('outOfPlane', core.outOfPlane, judgement, rmsOf(squaresOut, core.outOfPlane.readingCount), counts, uncheckedOut ?? NONE),
    inPlane: summarisePart('inPlane', core.inPlane, judgement, rmsOf(squaresIn, core.inPlane.readingCount), counts, uncheckedIn ?? NONE),
    outliers,
  };
}
