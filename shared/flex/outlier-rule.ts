/**
 * The outlier rule of one pose's fit: which reading is a misread (see docs/method.md §3).
 *
 * For a reading i of a part with n readings and p fitted parameters (redundancy ν = n − p):
 *   score_i = |e_i| / (√(1 − h_i) · σ_i),  σ_i = max(σ_floor, s₍ᵢ₎),
 * i.e. the deleted (leave-one-out) residual e_i / (1 − h_i) in units of its own standard error,
 * judged against the reading SD σ_floor (the tape's resolution, or the session's scatter when it is
 * larger) and against the scatter of the other readings s₍ᵢ₎ when that is larger still. A misread
 * does not inflate its own σ_i (it is left out of s₍ᵢ₎), so least squares cannot smear it away;
 * the other readings' s₍ᵢ₎ include the misread, which keeps them from being flagged with it.
 * A reading is flagged when score_i exceeds the limit the caller gives for the number of tests T in
 * the pose (Bonferroni: z or t at 1 − α/(2T), α = OUTLIER_FALSE_ALARM_RATE), so pure reading noise
 * flags at most about α of poses. Under pure noise of SD σ_floor, score_i ≤ |N(0, 1)|.
 * - ν ≥ 2: every reading is judged ('checked').
 * - ν = 1: the standardized residuals are all equal in size, so the readings can only be judged
 *   together: 'misfitOnly', with `misfit` when |e|/√(1 − h) > limit·σ_floor.
 * - ν = 0: nothing to judge ('skipped').
 * Source: Montgomery, Peck & Vining, Introduction to Linear Regression Analysis (5th ed.), §4.2.1
 * (PRESS residuals, R-student, s₍ᵢ₎); Kutner, Nachtsheim, Neter & Li, Applied Linear Statistical
 * Models (5th ed.), §10.2 (studentized deleted residuals, Bonferroni outlier test).
 */
import type { PoseBuffer, PoseFitCore } from './pose-fit';

/** Chance that a pose of pure reading noise gets any reading flagged (Bonferroni-controlled). */
export const OUTLIER_FALSE_ALARM_RATE = 0.01;

export type OutlierCheck = 'checked' | 'misfitOnly' | 'skipped';

export type FitPartName = 'outOfPlane' | 'inPlane';

export interface PartJudgement {
  check: OutlierCheck;
  /** The reading SD this part's residuals were judged against (mm). */
  scatterMm: number;
  /** The score above which a reading is flagged; null when nothing was tested in the pose. */
  limit: number | null;
  /** misfitOnly: the part's readings do not fit one rigid motion and which one is off cannot be told. */
  misfit: boolean;
  /** misfitOnly: |e|/√(1 − h) in mm, the size of the misfit; null otherwise. */
  misfitMm: number | null;
}

export interface PoseJudgement {
  outOfPlane: PartJudgement;
  inPlane: PartJudgement;
  /** Buffer indexes of the flagged readings (their scores are in buffer.score). */
  flagged: number[];
}

function checkOf(redundancy: number): OutlierCheck {
  return redundancy >= 2 ? 'checked' : redundancy === 1 ? 'misfitOnly' : 'skipped';
}

function resetPart(part: PartJudgement, check: OutlierCheck, scatterMm: number, limit: number | null): void {
  part.check = check;
  part.scatterMm = scatterMm;
  part.limit = limit;
  part.misfit = false;
  part.misfitMm = null;
}

/**
 * Judges one pose's readings (see the module comment).
 * @param buffer the pose's readings and their residual statistics (fitPoseParts); scores are written into buffer.score.
 * @param fit the pose's fit.
 * @param scatterMm σ_floor per part: the reading SD its residuals are judged against (> 0).
 * @param limitFor the score limit of a part for T tests in the pose, e.g. T ↦ z(1 − α/(2T)).
 * @param into a judgement to overwrite and return instead of a new one (a session judges pose after
 *   pose into one; read it before the next pose).
 * @returns per part the kind of check and its limit, and the flagged readings (scores in buffer.score).
 * @example judgeOutliers(buffer, fit, { outOfPlane: 0.5, inPlane: 0.5 }, (t) => normalQuantile(1 - 0.01 / (2 * t))).flagged // => [0]
 */
export function judgeOutliers(
  buffer: PoseBuffer,
  fit: PoseFitCore,
  scatterMm: Record<FitPartName, number>,
  limitFor: (tests: number, part: FitPartName) => number,
  into?: PoseJudgement,
): PoseJudgement {
  const outOfPlane = checkOf(fit.outOfPlane.readingCount - fit.outOfPlane.parameterCount);
  const inPlane = checkOf(fit.inPlane.readingCount - fit.inPlane.parameterCount);
  const end = buffer.start + buffer.count;
  let tests = (outOfPlane === 'misfitOnly' ? 1 : 0) + (inPlane === 'misfitOnly' ? 1 : 0);
  for (let i = buffer.start; i < end; i++) {
    buffer.score[i] = Number.NaN;
    if ((buffer.axis[i] === 0 ? outOfPlane : inPlane) === 'checked' && !Number.isNaN(buffer.standardized[i])) tests++;
  }
  const judgement: PoseJudgement = into ?? {
    outOfPlane: { check: outOfPlane, scatterMm: 0, limit: null, misfit: false, misfitMm: null },
    inPlane: { check: inPlane, scatterMm: 0, limit: null, misfit: false, misfitMm: null },
    flagged: [],
  };
  resetPart(judgement.outOfPlane, outOfPlane, scatterMm.outOfPlane, tests > 0 ? limitFor(tests, 'outOfPlane') : null);
  resetPart(judgement.inPlane, inPlane, scatterMm.inPlane, tests > 0 ? limitFor(tests, 'inPlane') : null);
  if (judgement.flagged.length > 0) judgement.flagged.length = 0;
  if (tests === 0) return judgement;
  for (let i = buffer.start; i < end; i++) {
    const part = buffer.axis[i] === 0 ? judgement.outOfPlane : judgement.inPlane;
    const standardized = buffer.standardized[i];
    if (Number.isNaN(standardized)) continue;
    const limit = part.limit as number;
    if (part.check === 'checked') {
      const score = Math.abs(standardized) / Math.max(part.scatterMm, buffer.deletedSd[i]);
      buffer.score[i] = score;
      if (score > limit) judgement.flagged.push(i);
    } else if (part.check === 'misfitOnly') {
      part.misfitMm = Math.abs(standardized);
      part.misfit = Math.abs(standardized) > limit * part.scatterMm;
    }
  }
  return judgement;
}
