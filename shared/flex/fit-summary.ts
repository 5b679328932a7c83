/**
 * The public summary of one pose's relative-motion fit: the motion, per part (out-of-plane and
 * in-plane) its status and the reasons in the engineer's words, residuals, the parameters'
 * unscaled covariance, the kind of outlier check it allowed, and the flagged readings.
 * Shared by fitRelativeMotion and designEnvelope so both report a fit the same way (buildFit).
 * See docs/method.md §2–§3.
 */
import { nounFor, plural } from '../plural';
import { MAX_EDGE_ERROR_RATIO, type PartCore, type PoseBuffer, type PoseFitCore } from './pose-fit';
import type { OutlierCheck, PartJudgement, PoseJudgement } from './outlier-rule';
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

/**
 * s = √(SSR / (n − p)) of a part's fit; null without redundancy. One place for the fit's summary and
 * for designEnvelope, which works out the measures' uncertainties before (or without) building it.
 * @param core the part's core fit. @returns the residual SD (mm), or null.
 * @example residualSd({ ...core, readingCount: 6, parameterCount: 3, ssr: 0.75 }) // => 0.5
 */
export function residualSd(core: PartCore): number | null {
  const redundancy = core.readingCount - core.parameterCount;
  return redundancy > 0 ? Math.sqrt(core.ssr / redundancy) : null;
}

/** Packs one part's core fit and its judgement into the public per-part summary. */
function summarisePart(
  kind: 'outOfPlane' | 'inPlane',
  core: PartCore,
  part: PartJudgement,
  rms: number,
  counts: { lateral: number; vertical: number },
  unchecked: readonly string[],
): FitPart {
  return {
    status: core.status,
    readingCount: core.readingCount,
    parameterCount: core.parameterCount,
    residualRms: rms,
    residualSdMm: residualSd(core),
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
 * What the remarks on a session say of one part of a pose's fit, as its summary would hold it
 * (designEnvelope writes them without building the summary).
 * @param kind the part. @param core its core fit. @param check its outlier check.
 * @param counts the pose's lateral and vertical readings. @param unchecked the points of its readings nothing checks.
 * @returns the part's reason and outlier note, as in FitPart.
 * @example partRemarks('inPlane', core, 'checked', { lateral: 6, vertical: 0 }, []).reason // => 'no vertical readings: tz set to 0'
 */
export function partRemarks(
  kind: 'outOfPlane' | 'inPlane',
  core: PartCore,
  check: OutlierCheck,
  counts: { lateral: number; vertical: number },
  unchecked: readonly string[],
): { reason: string | null; outlierNote: string | null } {
  return { reason: partReason(kind, core, counts), outlierNote: outlierNote(kind, core, check, unchecked) };
}

function rmsOf(sum: number, n: number): number {
  return n === 0 ? 0 : Math.sqrt(sum / n);
}

/**
 * The public fit of a pose from its core fit, its parts' judgements, its residuals and what was
 * found of its readings: the one place a RelativeMotionFit is assembled (packFit from a pose's
 * buffer; designEnvelope from the numbers it keeps, when a pose's fit is first read).
 * @param core the motion and the parts' core fits. @param judgement each part's outlier check.
 * @param residual residuals and @param axis axis codes at [start, start + count).
 * @param uncheckedOut the points of fore-aft readings nothing checks. @param uncheckedIn the same for lateral and vertical.
 * @param outliers the flagged readings.
 * @returns the RelativeMotionFit.
 * @example buildFit(core, judgement, buffer.residual, buffer.axis, 0, 18, [], [], []).residuals.length // => 18
 */
export function buildFit(
  core: PoseFitCore,
  judgement: Pick<PoseJudgement, 'outOfPlane' | 'inPlane'>,
  residual: Float64Array,
  axis: Uint8Array,
  start: number,
  count: number,
  uncheckedOut: readonly string[],
  uncheckedIn: readonly string[],
  outliers: FlaggedReading[],
): RelativeMotionFit {
  const residuals = new Array<number>(count);
  let squaresOut = 0;
  let squaresIn = 0;
  let lateral = 0;
  let vertical = 0;
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
  }
  const counts = { lateral, vertical };
  return {
    motion: { t: { x: core.tx, y: core.ty, z: core.tz }, omega: { x: core.wx, y: core.wy, z: core.wz } },
    residuals,
    residualRms: rmsOf(total, count),
    outOfPlane: summarisePart('outOfPlane', core.outOfPlane, judgement.outOfPlane, rmsOf(squaresOut, core.outOfPlane.readingCount), counts, uncheckedOut),
    inPlane: summarisePart('inPlane', core.inPlane, judgement.inPlane, rmsOf(squaresIn, core.inPlane.readingCount), counts, uncheckedIn),
    outliers,
  };
}

/**
 * The flagged readings of a judged pose, as its fit lists them.
 * @param buffer the pose's readings as fitted and judged. @param judgement the outlier rule's verdict.
 * @param labelOf the point id and axis of a buffer index, and its index in the caller's input.
 * @returns one FlaggedReading per flagged reading, in buffer order.
 * @example flaggedReadings(buffer, judgement, labelOf)[0].score // => 7.9
 */
export function flaggedReadings(
  buffer: PoseBuffer,
  judgement: PoseJudgement,
  labelOf: (i: number) => { pointId: string; axis: Axis; index: number },
): FlaggedReading[] {
  return judgement.flagged.map((i): FlaggedReading => {
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
}

/**
 * The points of a pose's readings that alone fix part of its fit (NaN standardized residual), per part.
 * @param buffer the pose's readings as fitted. @param labelOf the point id of a buffer index.
 * @returns the fore-aft ones and the lateral and vertical ones, in buffer order (NONE when there are none).
 * @example uncheckedPoints(buffer, labelOf).inPlane // => ['c']
 */
export function uncheckedPoints(
  buffer: PoseBuffer,
  labelOf: (i: number) => { pointId: string },
): { outOfPlane: readonly string[]; inPlane: readonly string[] } {
  let outOfPlane: string[] | null = null;
  let inPlane: string[] | null = null;
  const end = buffer.start + buffer.count;
  for (let i = buffer.start; i < end; i++) {
    if (!Number.isNaN(buffer.standardized[i])) continue;
    if (buffer.axis[i] === 0) (outOfPlane ??= []).push(labelOf(i).pointId);
    else (inPlane ??= []).push(labelOf(i).pointId);
  }
  return { outOfPlane: outOfPlane ?? NONE, inPlane: inPlane ?? NONE };
}

/**
 * The public fit result of a pose from its core fit and judgement (fitRelativeMotion).
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
  const unchecked = uncheckedPoints(buffer, labelOf);
  const outliers = flaggedReadings(buffer, judgement, labelOf);
  return buildFit(core, judgement, buffer.residual, buffer.axis, buffer.start, buffer.count, unchecked.outOfPlane, unchecked.inPlane, outliers);
}
