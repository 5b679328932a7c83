/**
 * Student t distribution: CDF and quantile for df > 0 (not necessarily whole).
 *
 * Formula: for t ≥ 0, P(T ≤ t) = 1 − ½·I_x(df/2, ½) with x = df / (df + t²) (regularized incomplete
 * beta); symmetric for t < 0. The quantile inverts the CDF by bisection to ~1e-12 relative.
 * Source: Abramowitz & Stegun, Handbook of Mathematical Functions, 26.7.1 and 26.5.27.
 *
 * Example: studentTQuantile(0.975, 10) // => 2.2281 ; studentTQuantile(0.95, 9) // => 1.8331
 */
import { FlexInputError, requireFinite, requireProbability } from './errors';
import { invertIncreasing } from './invert-increasing';
import { regularizedBeta } from './special-functions';

/** Degrees of freedom beyond this make t indistinguishable from the normal for any use here. */
const MAX_DF = 1e7;

function requireDf(fn: string, df: number): void {
  requireFinite(fn, 'df', df);
  if (df <= 0 || df > MAX_DF) throw new FlexInputError(fn, 'df', `must be in (0, ${MAX_DF}], got ${df}`);
}

function cdf(t: number, df: number): number {
  const tail = 0.5 * regularizedBeta(df / (df + t * t), df / 2, 0.5);
  return t >= 0 ? 1 - tail : tail;
}

export function studentTCdf(t: number, df: number): number {
  requireFinite('studentTCdf', 't', t);
  requireDf('studentTCdf', df);
  return cdf(t, df);
}

export function studentTQuantile(p: number, df: number): number {
  requireProbability('studentTQuantile', 'p', p);
  requireDf('studentTQuantile', df);
  if (p === 0.5) return 0;
  // Solve in the upper tail and mirror, so both tails get the same relative precision.
  const upper = invertIncreasing((t) => cdf(t, df), Math.max(p, 1 - p), 1, 1);
  return p > 0.5 ? upper : -upper;
}
