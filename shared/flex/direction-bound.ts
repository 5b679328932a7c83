/**
 * The upper bound of one envelope measure (e.g. lateral shear) at the design twist, from the poses
 * twisted one way (see docs/method.md §5–§6). Each twist direction is bounded on its own because a
 * truck need not move the same way on the two diagonals.
 *
 * - Prediction method: the measure y against the twist magnitude x (relative to the baseline), a
 *   straight line (through the origin by default) fitted by weighted least squares with scatter
 *   proportional to the twist (Var y = σ²x², weights 1/x²), and the one-sided upper prediction
 *   bound for a new pose at the design twist D: ŷ(D) + t(confidence, df)·s·√(D² + q(D)); through
 *   the origin, D·(r̄ + t·s_r·√(1 + 1/n)) on the ratios rᵢ = yᵢ/xᵢ (see linearFit).
 * - Tolerance method, for repeated runs of one pose: every run must lie within ±band degrees of the
 *   runs' median twist (otherwise they are not repeats, and the caller refuses); each run is scaled
 *   to the design twist in proportion (y·D/x, the same no-twist-no-motion model) and the bound is
 *   the one-sided normal tolerance bound mean + k1·s (coverage p, confidence gamma).
 * Source: docs/method.md §5; Montgomery, Peck & Vining, Introduction to Linear Regression Analysis
 * (5th ed.), ch. 2 (prediction of new observations; regression through the origin) and ch. 5
 * (weighted least squares); NIST/SEMATECH e-Handbook of Statistical Methods §4.4.5.2 and §7.2.6.3.
 */
import { lineSummary } from './linear-fit';
import { upperPredictionBoundAt, type LinearFitSummary } from './prediction-bound';

export type TwistDirection = 'positive' | 'negative';

export interface ToleranceSummary {
  n: number;
  meanMm: number;
  sdMm: number;
  k1: number;
  coverage: number;
  confidence: number;
  /** The runs' median twist magnitude and the band they lie in (degrees). */
  medianTwistDeg: number;
  bandDeg: number;
}

export interface DirectionBound {
  direction: TwistDirection;
  /** Poses of this direction the bound used (twisted at least MIN_FIT_TWIST_DEG). */
  poseCount: number;
  /** Largest twist magnitude reached this way (degrees, relative to the baseline); 0 if none. */
  twistReachedDeg: number;
  /** Prediction method: the line; null otherwise or when there are too few poses. */
  fit: LinearFitSummary | null;
  /** Tolerance method: the statistics of the scaled runs; null otherwise or when too few runs. */
  tolerance: ToleranceSummary | null;
  /** Line value (prediction) or mean of the scaled runs (tolerance) at the design twist. */
  projectedMm: number | null;
  upperBoundMm: number | null;
  /** Why there is no bound; null when there is one. */
  unavailable: string | null;
}

export interface BoundSettings {
  designTwistDeg: number;
  confidence: number;
  coverage: number;
  throughOrigin: boolean;
  repeatBandDeg: number;
  /** t(confidence, df), computed once per df by the caller. */
  tFor: (df: number) => number;
  /** k1(n), computed once per n by the caller. */
  k1For: (n: number) => number;
}

/** Poses twisted less than this (degrees) carry no usable slope: the reading resolution dominates. */
export const MIN_FIT_TWIST_DEG = 1;

function largest(xs: ArrayLike<number>): number {
  let most = 0;
  for (let i = 0; i < xs.length; i++) if (xs[i] > most) most = xs[i];
  return most;
}

function allEqual(xs: ArrayLike<number>): boolean {
  for (let i = 1; i < xs.length; i++) if (xs[i] !== xs[0]) return false;
  return true;
}

/**
 * The prediction method's bound for one direction.
 * @param direction which way the poses are twisted. @param xs twist magnitudes (degrees, ≥ MIN_FIT_TWIST_DEG).
 * @param ys the measure at each pose (mm, ≥ 0). @param s settings (design twist, confidence, line through the origin).
 * @returns the line, the projection and the upper bound at the design twist, or why there is none.
 * @example predictionDirectionBound('positive', [5, 10, 15], [45, 91, 134], settings).upperBoundMm // => about 185 at 20°
 */
export function predictionDirectionBound(direction: TwistDirection, xs: ArrayLike<number>, ys: ArrayLike<number>, s: BoundSettings): DirectionBound {
  const twistReachedDeg = largest(xs);
  const base = { direction, poseCount: xs.length, twistReachedDeg, fit: null, tolerance: null, projectedMm: null, upperBoundMm: null };
  const needed = s.throughOrigin ? 2 : 3;
  if (xs.length < needed) {
    return { ...base, unavailable: `needs at least ${needed} poses twisted this way by ${MIN_FIT_TWIST_DEG}° or more, has ${xs.length}` };
  }
  if (!s.throughOrigin && allEqual(xs)) {
    return { ...base, unavailable: 'needs poses at two different twists for a line with an intercept' };
  }
  const fit = lineSummary(xs, ys, s.throughOrigin, 'proportional');
  return {
    ...base,
    fit,
    projectedMm: fit.intercept + fit.slope * s.designTwistDeg,
    upperBoundMm: upperPredictionBoundAt(fit, s.designTwistDeg, s.confidence, s.tFor(fit.df)),
    unavailable: null,
  };
}

/**
 * The tolerance method's bound for one direction (the runs must already be checked as repeats).
 * @param direction which way the runs are twisted. @param xs twist magnitudes of the runs (degrees).
 * @param ys the measure at each run (mm). @param medianTwistDeg the runs' median twist. @param s settings.
 * @returns mean + k1·s of the runs scaled to the design twist, or why there is none.
 * @example toleranceDirectionBound('positive', [10, 10, 10.2], [90, 92, 91], 10, settings).tolerance?.n // => 3
 */
export function toleranceDirectionBound(
  direction: TwistDirection,
  xs: ArrayLike<number>,
  ys: ArrayLike<number>,
  medianTwistDeg: number,
  s: BoundSettings,
): DirectionBound {
  const twistReachedDeg = largest(xs);
  const base = { direction, poseCount: xs.length, twistReachedDeg, fit: null, tolerance: null, projectedMm: null, upperBoundMm: null };
  const n = xs.length;
  if (n < 2) return { ...base, unavailable: `needs at least 2 runs twisted this way by ${MIN_FIT_TWIST_DEG}° or more, has ${n}` };
  let sum = 0;
  const scaled = new Float64Array(n);
  for (let i = 0; i < n; i++) scaled[i] = (ys[i] * s.designTwistDeg) / xs[i];
  for (let i = 0; i < n; i++) sum += scaled[i];
  const meanMm = sum / n;
  let squares = 0;
  for (let i = 0; i < n; i++) squares += (scaled[i] - meanMm) * (scaled[i] - meanMm);
  const sdMm = Math.sqrt(squares / (n - 1));
  const k1 = s.k1For(n);
  return {
    ...base,
    tolerance: { n, meanMm, sdMm, k1, coverage: s.coverage, confidence: s.confidence, medianTwistDeg, bandDeg: s.repeatBandDeg },
    projectedMm: meanMm,
    upperBoundMm: meanMm + k1 * sdMm,
    unavailable: null,
  };
}
