/**
 * Least-squares straight line y = intercept + slope·x, with a one-sided upper prediction bound.
 *
 * Formula: through the origin (default: no twist, no motion) slope = Σxy / Σx², df = n − 1,
 *   leverage h(x) = x² / Σx², R² = 1 − SSR / Σy² (uncentred, as for any model without intercept).
 * With intercept: slope = Sxy / Sxx on centred sums (two passes, for accuracy), df = n − 2,
 *   h(x) = 1/n + (x − x̄)² / Sxx, R² = 1 − SSR / Syy.
 * Residual SD s = √(SSR / df). Upper prediction bound for a new observation at x:
 *   ŷ(x) + t(confidence, df) · s · √(1 + h(x)).
 * R² is 1 when the data have no spread at all (nothing is left unexplained).
 * Source: Draper & Smith, Applied Regression Analysis (3rd ed.), §1.4 and §3.1 (prediction interval);
 * NIST/SEMATECH e-Handbook §4.1.4.1 (least squares). Complexity O(n).
 *
 * Example: linearFit([1, 2, 3], [2.1, 3.9, 6.0]).slope // => 1.9929 (through the origin)
 */
import { FlexInputError, requireFinite } from './errors';
import { studentTQuantile } from './student-t';

export interface LinearFitOptions {
  /** Default true: the line passes through (0, 0). */
  throughOrigin?: boolean;
}

export interface LinearFitSummary {
  slope: number;
  /** 0 when throughOrigin. */
  intercept: number;
  throughOrigin: boolean;
  n: number;
  df: number;
  residualSd: number;
  rSquared: number;
}

export interface LinearFit extends LinearFitSummary {
  predict(x: number): number;
  leverage(x: number): number;
  /** ŷ(x) + t(confidence, df)·s·√(1 + h(x)); confidence one-sided, e.g. 0.95. */
  upperPredictionBound(x: number, confidence: number): number;
}

/** Magnitude limit for x and y: keeps every sum of squares finite. */
const MAX_ABS_VALUE = 1e100;

export function linearFit(xs: readonly number[], ys: readonly number[], options: LinearFitOptions = {}): LinearFit {
  const fn = 'linearFit';
  const throughOrigin = options.throughOrigin ?? true;
  if (!Array.isArray(xs) || !Array.isArray(ys)) throw new FlexInputError(fn, 'xs', 'and ys must be arrays');
  if (xs.length !== ys.length) {
    throw new FlexInputError(fn, 'ys', `must have the same length as xs (${xs.length}), got ${ys.length}`);
  }
  const n = xs.length;
  const parameters = throughOrigin ? 1 : 2;
  if (n < parameters + 1) {
    throw new FlexInputError(fn, 'xs', `needs at least ${parameters + 1} points ${throughOrigin ? 'through the origin' : 'with an intercept'}, got ${n}`);
  }
  xs.forEach((x, i) => {
    requireFinite(fn, `xs[${i}]`, x);
    if (Math.abs(x) > MAX_ABS_VALUE) throw new FlexInputError(fn, `xs[${i}]`, `must be within ±${MAX_ABS_VALUE}`);
  });
  ys.forEach((y, i) => {
    requireFinite(fn, `ys[${i}]`, y);
    if (Math.abs(y) > MAX_ABS_VALUE) throw new FlexInputError(fn, `ys[${i}]`, `must be within ±${MAX_ABS_VALUE}`);
  });

  const xMean = throughOrigin ? 0 : xs.reduce((a, b) => a + b, 0) / n;
  const yMean = throughOrigin ? 0 : ys.reduce((a, b) => a + b, 0) / n;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    const dx = xs[i] - xMean;
    const dy = ys[i] - yMean;
    sxx += dx * dx;
    sxy += dx * dy;
    syy += dy * dy;
  }
  if (sxx === 0) {
    throw new FlexInputError(fn, 'xs', throughOrigin ? 'are all 0: no slope through the origin' : 'are all equal: no slope');
  }
  const slope = sxy / sxx;
  const intercept = yMean - slope * xMean;
  let ssr = 0;
  for (let i = 0; i < n; i++) {
    const r = ys[i] - (intercept + slope * xs[i]);
    ssr += r * r;
  }
  const df = n - parameters;
  const residualSd = Math.sqrt(ssr / df);
  const rSquared = syy === 0 ? 1 : Math.max(0, 1 - ssr / syy);

  const predict = (x: number): number => intercept + slope * requireFinite(fn, 'x', x);
  const leverage = (x: number): number => {
    requireFinite(fn, 'x', x);
    return (throughOrigin ? 0 : 1 / n) + ((x - xMean) * (x - xMean)) / sxx;
  };
  const upperPredictionBound = (x: number, confidence: number): number =>
    predict(x) + studentTQuantile(confidence, df) * residualSd * Math.sqrt(1 + leverage(x));

  return { slope, intercept, throughOrigin, n, df, residualSd, rSquared, predict, leverage, upperPredictionBound };
}
