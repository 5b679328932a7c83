/**
 * The remarks on a session's readings and fits, in the engineer's words (docs/method.md §3–4):
 * the session's scatter where it is larger than a gauge is read to, a baseline that is itself
 * twisted, each pose without usable readings or with readings lacking a baseline, each reading
 * the outlier rule flags, each set of readings that does not fit one rigid motion, and each limit
 * of the fit or of the outlier check, said once for the poses it applies to.
 *
 * Written from the computed result's own numbers, so a frozen result reads in mm or in inches
 * (`words`); the computation stores them in mm.
 * Source: docs/method.md §3 (outlier rule) and §4 (identifiability).
 */
import { MM_WORDS, type LengthWords } from './length-words';
import type { FitPartName } from './outlier-rule';
import type { PoseResult } from './envelope';
import type { FitPart, FlaggedReading } from './fit-summary';
import { READING_SD_MM } from './relative-motion';
import { plural } from '../plural';

const PART_NAMES: Record<FitPartName, string> = { outOfPlane: 'fore-aft', inPlane: 'lateral and vertical' };
const AXIS_WORDS = { foreAft: 'fore-aft', lateral: 'lateral', vertical: 'vertical' } as const;
/** A baseline twisted more than this is said in the remarks. */
export const BASELINE_TWIST_NOTE_DEG = 0.5;

/** What the remarks read of one part of a pose's fit (a FitPart has it). */
export type RemarkPart = Pick<FitPart, 'misfit' | 'readingCount' | 'parameterCount' | 'reason' | 'outlierNote'>;

/**
 * What the remarks read of a pose (a PoseResult has it): designEnvelope hands its poses' remarks in
 * this form, so a pose's whole fit is not built just to be remarked on.
 */
export interface RemarkPose extends Pick<PoseResult, 'poseId' | 'isBaseline' | 'note' | 'missingBaselineCount'> {
  fit: { outliers: readonly Pick<FlaggedReading, 'pointId' | 'axis' | 'residual' | 'score'>[]; outOfPlane: RemarkPart; inPlane: RemarkPart } | null;
}

export interface ReadingFacts {
  poses: readonly RemarkPose[];
  /** The reading SD each fit part was judged against; above READING_SD_MM it was estimated from the session. */
  scatterMm: Record<FitPartName, number>;
  baselineTwistDeg: number;
}

/**
 * @param facts the computed poses, the scatter each fit part was judged against, the baseline's twist.
 * @param words how lengths are written (default: mm).
 * @returns the remarks, session-wide first, then pose by pose, then the limits said once.
 * @example readingRemarks(result)[0] // => 'Ramp (#6): reading at D (vertical) is far from the fit (residual 8.2 mm, 9.7 × its expected scatter); review it'
 */
export function readingRemarks(facts: ReadingFacts, words: LengthWords = MM_WORDS): string[] {
  const notes: string[] = [];
  for (const part of ['outOfPlane', 'inPlane'] as const) {
    const scale = facts.scatterMm[part];
    if (scale > READING_SD_MM) {
      notes.push(
        `the ${PART_NAMES[part]} readings scatter about their fits by ${words.fine(scale)} (robust SD), more than the ${words.fine(READING_SD_MM)} a gauge is read to: outliers are judged against ${words.fine(scale)}`,
      );
    }
  }
  const baseline = facts.poses.find((pose) => pose.isBaseline);
  if (baseline && Math.abs(facts.baselineTwistDeg) >= BASELINE_TWIST_NOTE_DEG) {
    notes.push(
      `the baseline pose (${baseline.poseId}) is twisted ${facts.baselineTwistDeg.toFixed(1)}° by its lifts: every twist is taken relative to it, since its readings are the reference; the envelope assumes the boot is fitted with the vehicle level`,
    );
  }
  const fitted = facts.poses.filter((pose) => pose.fit !== null);
  const grouped = new Map<string, string[]>();
  const say = (text: string | null, poseId: string): void => {
    if (text !== null) grouped.set(text, [...(grouped.get(text) ?? []), poseId]);
  };
  for (const pose of facts.poses) {
    if (pose.note !== null && !pose.isBaseline) notes.push(`${pose.poseId}: ${pose.note}`);
    if (pose.missingBaselineCount > 0) notes.push(`${pose.poseId}: ${plural(pose.missingBaselineCount, 'reading')} without a baseline reading, not used`);
    const fit = pose.fit;
    if (fit === null) continue;
    for (const o of fit.outliers) {
      notes.push(
        `${pose.poseId}: reading at ${o.pointId} (${AXIS_WORDS[o.axis]}) is far from the fit (residual ${words.length(o.residual)}, ${o.score.toFixed(1)} × its expected scatter); review it`,
      );
    }
    for (const part of ['outOfPlane', 'inPlane'] as const) {
      const summary = fit[part];
      if (summary.misfit) {
        notes.push(
          `${pose.poseId}: the ${PART_NAMES[part]} readings do not fit one rigid motion, but with ${plural(summary.readingCount, 'reading')} for ${plural(summary.parameterCount, 'unknown')} the misread cannot be singled out; review them`,
        );
      }
      say(summary.reason, pose.poseId);
      say(summary.outlierNote, pose.poseId);
    }
  }
  for (const [text, ids] of grouped) notes.push(`${text} (${ids.length === fitted.length ? 'all poses' : ids.join(', ')})`);
  return notes;
}
