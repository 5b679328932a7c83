/**
 * Why a measure's envelope has its value, as one chain of sentences: which term governs (the
 * measured worst or the upper bound of a twist direction), then margin, allowance and rounding,
 * then the other twist direction and the fit's uncertainty (docs/method.md §5–6).
 *
 * Envelope = max(measured worst, governing upper bound) × (1 + margin) + allowance, rounded up to
 * the fabrication increment. The sentences are written from the measure's own numbers, so the
 * same frozen result reads in mm or in inches (`words`); the computation stores them in mm.
 * Source: docs/method.md §6 (the envelope formula).
 */
import { MM_WORDS, type LengthWords } from './length-words';
import type { DirectionBound, TwistDirection } from './direction-bound';

/** The twist directions in the crew's words: which diagonal pair of wheels is up. */
export const TWIST_DIRECTION_NAMES: Record<TwistDirection, string> = { positive: 'FL–RR twist (+)', negative: 'FR–RL twist (−)' };

/** The parts of a measure's envelope the sentences name (a MeasureEnvelope has them all). */
export interface MeasureTerms {
  measuredWorstMm: number;
  measuredWorstPoseId: string;
  directions: Record<TwistDirection, Pick<DirectionBound, 'upperBoundMm' | 'unavailable'>>;
  governingDirection: TwistDirection | null;
  upperBoundMm: number | null;
  governing: 'measured' | 'upperBound';
  fitUncertaintyMm: number | null;
  withMarginMm: number;
  withAllowanceMm: number;
  envelopeMm: number;
}

/** The design parameters the sentences quote. */
export interface ReasonParameters {
  method: 'prediction' | 'tolerance';
  confidence: number;
  coverage: number;
  designTwistDeg: number;
  margin: number;
  allowanceMm: number;
  incrementMm: number;
}

const percent = (fraction: number) => `${Number((fraction * 100).toFixed(1))} %`;

/**
 * @param m the measure's terms. @param p the parameters it was computed with.
 * @param words how lengths are written (default: mm, as the computation stores them).
 * @returns the reasons, in reading order.
 * @example measureReasons(result.measures.lateral, result.parameters)[1] // => '+ margin 15 % = 140.3 mm'
 */
export function measureReasons(m: MeasureTerms, p: ReasonParameters, words: LengthWords = MM_WORDS): string[] {
  const L = words.length;
  const worstPose = m.measuredWorstPoseId;
  const label =
    p.method === 'prediction'
      ? `upper ${percent(p.confidence)} prediction bound at ${p.designTwistDeg}°`
      : `one-sided tolerance bound (coverage ${percent(p.coverage)}, confidence ${percent(p.confidence)}) at ${p.designTwistDeg}°`;
  const reasons: string[] = [];
  if (m.governingDirection === null || m.upperBoundMm === null) {
    reasons.push(`measured worst ${L(m.measuredWorstMm)} (${worstPose}) governs; no bound in either twist direction`);
  } else {
    const from = `${label}, ${TWIST_DIRECTION_NAMES[m.governingDirection]} (${L(m.upperBoundMm)})`;
    reasons.push(
      m.governing === 'upperBound'
        ? `${from} is above the measured worst (${L(m.measuredWorstMm)}, ${worstPose})`
        : `measured worst ${L(m.measuredWorstMm)} (${worstPose}) is at or above the ${from}`,
    );
  }
  reasons.push(`+ margin ${percent(p.margin)} = ${L(m.withMarginMm)}`);
  reasons.push(`+ allowance ${L(p.allowanceMm)} = ${L(m.withAllowanceMm)}`);
  reasons.push(`rounded up to the ${words.increment(p.incrementMm)} increment: ${L(m.envelopeMm)}.`);
  for (const direction of ['positive', 'negative'] as const) {
    if (direction === m.governingDirection) continue;
    const bound = m.directions[direction];
    reasons.push(
      bound.upperBoundMm === null
        ? `${TWIST_DIRECTION_NAMES[direction]}: no bound, ${bound.unavailable}.`
        : `${TWIST_DIRECTION_NAMES[direction]}: bound ${L(bound.upperBoundMm)}, lower.`,
    );
  }
  if (m.fitUncertaintyMm !== null && m.fitUncertaintyMm > 0) {
    reasons.push(`The fit is uncertain by up to ±${L(m.fitUncertaintyMm)} (1 SD) at the opening's edge in a pose; the bound's scatter includes it.`);
  }
  return reasons;
}
