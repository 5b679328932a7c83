/**
 * Least-squares straight line y = intercept + slope·x, ordinary or weighted, with a one-sided upper
 * prediction bound for a new observation (see docs/method.md §5).
 *
 * Scatter models: 'constant' (Var yᵢ = σ², ordinary least squares, weights 1) or 'proportional'
 * (Var yᵢ = σ²·xᵢ², the scatter of the displacement grows with the twist: weights wᵢ = 1/xᵢ², x > 0).
 * Weighted least squares minimises Σ wᵢ·(yᵢ − a − b·xᵢ)²:
 * - through the origin (default: no twist, no motion): b = Σwxy / Σwx², df = n − 1,
 *   x-part of the leverage q(x) = x² / Σwx²; with proportional scatter b is the mean of yᵢ/xᵢ.
 * - with intercept: weighted means x̄_w = Σwx/Σw, ȳ_w; b = Σw(x − x̄_w)(y − ȳ_w) / S, S = Σw(x − x̄_w)²
 *   (centred sums, two passes), a = ȳ_w − b·x̄_w, df = n − 2, q(x) = 1/Σw + (x − x̄_w)² / S.
 * Residual SD s = √(Σ wᵢ·eᵢ² / df) (σ's estimate). A new observation at x has weight w(x)
 * (1 or 1/x²), so the one-sided upper prediction bound is
 *   ŷ(x) + t(confidence, df) · s · √(1/w(x) + q(x)).
 * With proportional scatter through the origin this is x·(r̄ + t·s_r·√(1 + 1/n)), the one-sample
 * prediction bound of the ratios rᵢ = yᵢ/xᵢ. R² = 1 − Σwe² / Σw(y − ȳ_w)² (uncentred, Σwy², without
 * intercept); 1 when the data have no spread at all.
 * Source: docs/method.md §5; Montgomery, Peck & Vining, Introduction to Linear Regression Analysis
 * (5th ed.), ch. 2 (prediction of new observations; regression through the origin) and ch. 5
 * (generalized and weighted least squares);
 * Draper & Smith, Applied Regression Analysis (3rd ed.), §1.4, §3.1 and ch. 9 (generalized and
 * weighted least squares); NIST/SEMATECH e-Handbook §4.4.5.2 (weighting for non-constant scatter).
 * Complexity O(n).
 */
import { FlexInputError, requireFinite } from './errors';
import { predictionLeverage, upperPredictionBoundAt, type LinearFitSummary, type ScatterModel } from './prediction-bound';

export interface LinearFitOptions {
  /** Default true: the line passes through (0, 0). */
  throughOrigin?: boolean;
  /** Default 'constant'; 'proportional' weights each point by 1/x² (needs every x > 0). */
  scatter?: ScatterModel;
}

export interface LinearFit extends LinearFitSummary {
  predict(x: number): number;
  /** The x-part of the prediction variance, q(x) = x̄ᵀ(XᵀWX)⁻¹x̄ (the leverage for unit weights). */
  leverage(x: number): number;
  /** ŷ(x) + t(confidence, df)·s·√(1/w(x) + q(x)); confidence one-sided, e.g. 0.95. */
  upperPredictionBound(x: number, confidence: number): number;
}

/** Magnitude limit for x and y: keeps every sum of squares finite. */
const MAX_ABS_VALUE = 1e100;
const FN = 'linearFit';

function isNumberArray(values: unknown): boolean {
  return Array.isArray(values) || values instanceof Float64Array;
}

/**
 * Fits the line.
 * @param xs explanatory values (e.g. twist, degrees). @param ys responses (e.g. displacement, mm).
 * @param options throughOrigin (default true) and scatter model (default 'constant').
 * @returns the fitted line with predict, leverage and upperPredictionBound.
 * @example linearFit([1, 2, 3], [2.1, 3.9, 6.0]).slope // => 1.9929 (through the origin)
 */
export function linearFit(xs: readonly number[], ys: readonly number[], options: LinearFitOptions = {}): LinearFit {
  const summary = lineSummary(xs, ys, options.throughOrigin ?? true, options.scatter ?? 'constant');
  const { intercept, slope } = summary;
  return {
    ...summary,
    predict: (x: number): number => intercept + slope * requireFinite(FN, 'x', x),
    leverage: (x: number): number => predictionLeverage(summary, x),
    upperPredictionBound: (x: number, confidence: number): number => upperPredictionBoundAt(summary, x, confidence),
  };
}

/**
 * The fitted line as plain data (what linearFit returns without its methods), from any array of
 * numbers; designEnvelope fits each measure's line with it, with no methods to build per bound.
 * @param xs explanatory values. @param ys responses. @param throughOrigin the line passes through (0, 0).
 * @param scatter 'constant' or 'proportional' (weights 1/x², every x > 0).
 * @returns the line's summary, the same numbers linearFit gives.
 * @example lineSummary([1, 2, 3], [2.1, 3.9, 6.0], true, 'constant').slope // => 1.9929
 */
export function lineSummary(xs: ArrayLike<number>, ys: ArrayLike<number>, throughOrigin: boolean, scatter: ScatterModel): LinearFitSummary {
  const fn = FN;
  if (scatter !== 'constant' && scatter !== 'proportional') {
    throw new FlexInputError(fn, 'options.scatter', `must be 'constant' or 'proportional', got '${String(scatter)}'`);
  }
  if (!isNumberArray(xs) || !isNumberArray(ys)) throw new FlexInputError(fn, 'xs', 'and ys must be arrays');
  if (xs.length !== ys.length) {
    throw new FlexInputError(fn, 'ys', `must have the same length as xs (${xs.length}), got ${ys.length}`);
  }
  const n = xs.length;
  const parameters = throughOrigin ? 1 : 2;
  if (n < parameters + 1) {
    throw new FlexInputError(fn, 'xs', `needs at least ${parameters + 1} points ${throughOrigin ? 'through the origin' : 'with an intercept'}, got ${n}`);
  }
  const weights = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const x = xs[i];
    const y = ys[i];
    // Field names are built only for a value that fails.
    if (!(Math.abs(x) <= MAX_ABS_VALUE) || typeof x !== 'number') {
      requireFinite(fn, `xs[${i}]`, x);
      throw new FlexInputError(fn, `xs[${i}]`, `must be within ±${MAX_ABS_VALUE}`);
    }
    if (!(Math.abs(y) <= MAX_ABS_VALUE) || typeof y !== 'number') {
      requireFinite(fn, `ys[${i}]`, y);
      throw new FlexInputError(fn, `ys[${i}]`, `must be within ±${MAX_ABS_VALUE}`);
    }
    if (scatter === 'proportional' && !(x > 0)) throw new FlexInputError(fn, `xs[${i}]`, `must be greater than 0 with proportional scatter, got ${x}`);
    weights[i] = scatter === 'proportional' ? 1 / (x * x) : 1;
  }

  let sumWeights = 0;
  let swx = 0;
  let swy = 0;
  for (let i = 0; i < n; i++) {
    sumWeights += weights[i];
    swx += weights[i] * xs[i];
    swy += weights[i] * ys[i];
  }
  const meanX = throughOrigin ? 0 : swx / sumWeights;
  const meanY = throughOrigin ? 0 : swy / sumWeights;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    const dx = xs[i] - meanX;
    const dy = ys[i] - meanY;
    sxx += weights[i] * dx * dx;
    sxy += weights[i] * dx * dy;
    syy += weights[i] * dy * dy;
  }
  if (sxx === 0) {
    throw new FlexInputError(fn, 'xs', throughOrigin ? 'are all 0: no slope through the origin' : 'are all equal: no slope');
  }
  const slope = sxy / sxx;
  const intercept = meanY - slope * meanX;
  let ssr = 0;
  for (let i = 0; i < n; i++) {
    const r = ys[i] - (intercept + slope * xs[i]);
    ssr += weights[i] * r * r;
  }
  const df = n - parameters;
  const residualSd = Math.sqrt(ssr / df);
  const rSquared = syy === 0 ? 1 : Math.max(0, 1 - ssr / syy);
  return { slope, intercept, throughOrigin, scatter, n, df, residualSd, rSquared, sumWeights, meanX, sxx };
}
