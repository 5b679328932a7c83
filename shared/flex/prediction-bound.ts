/**
 * The prediction variance and one-sided upper prediction bound of a fitted straight line, from its
 * summary alone (so a chart or a stored snapshot can evaluate the bound at any x without refitting).
 *
 * Formula (see linearFit): q(x) = x² / Σwx² through the origin, 1/Σw + (x − x̄_w)² / S with an
 * intercept; bound(x) = ŷ(x) + t(confidence, df) · s · √(1/w(x) + q(x)), w(x) = 1 for constant
 * scatter and 1/x² for scatter proportional to x.
 * Source: docs/method.md §5; Montgomery, Peck & Vining, Introduction to Linear Regression Analysis
 * (5th ed.), ch. 2 (prediction of new observations) and ch. 5 (weighted least squares).
 */
import { FlexInputError, requireFinite } from './errors';
import { studentTQuantile } from './student-t';

export type ScatterModel = 'constant' | 'proportional';

/** Everything needed to evaluate the line and its bound anywhere (plain data, stored in snapshots). */
export interface LinearFitSummary {
  slope: number;
  /** 0 when throughOrigin. */
  intercept: number;
  throughOrigin: boolean;
  scatter: ScatterModel;
  n: number;
  df: number;
  /** s: the SD of a point of weight 1 (for proportional scatter: of y/x, mm per degree). */
  residualSd: number;
  rSquared: number;
  /** Σw. */
  sumWeights: number;
  /** x̄_w; 0 when throughOrigin. */
  meanX: number;
  /** Σw(x − x̄_w)² (Σwx² when throughOrigin). */
  sxx: number;
}

/**
 * The x-part of the prediction variance of a fitted line at x.
 * @param fit the line's summary. @param x where to predict.
 * @returns q(x) (dimensionless for unit weights).
 * @example predictionLeverage(linearFit([2, 4, 6, 8], [9, 21, 29, 41]), 10) // => 0.8333 (100 / 120)
 */
export function predictionLeverage(fit: LinearFitSummary, x: number): number {
  requireFinite('predictionLeverage', 'x', x);
  if (fit.throughOrigin) return (x * x) / fit.sxx;
  return 1 / fit.sumWeights + ((x - fit.meanX) * (x - fit.meanX)) / fit.sxx;
}

/**
 * One-sided upper prediction bound of a fitted line for a new observation at x.
 * @param fit the line's summary. @param x where to predict (> 0 for proportional scatter).
 * @param confidence one-sided, 0.5 ≤ confidence < 1. @param tQuantile optional t(confidence, df) already computed.
 * @returns ŷ(x) + t·s·√(1/w(x) + q(x)).
 * @example upperPredictionBoundAt(linearFit([1, 2, 3], [3, 6, 9]), 5, 0.99) // => 15 (no scatter)
 */
export function upperPredictionBoundAt(fit: LinearFitSummary, x: number, confidence: number, tQuantile?: number): number {
  const fn = 'upperPredictionBoundAt';
  requireFinite(fn, 'x', x);
  if (fit.scatter === 'proportional' && !(x > 0)) throw new FlexInputError(fn, 'x', `must be greater than 0 with proportional scatter, got ${x}`);
  const t = tQuantile ?? studentTQuantile(confidence, fit.df);
  const newVariance = fit.scatter === 'proportional' ? x * x : 1;
  return fit.intercept + fit.slope * x + t * fit.residualSd * Math.sqrt(newVariance + predictionLeverage(fit, x));
}
