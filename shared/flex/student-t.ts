/**
 * Student t distribution: CDF and quantile for df > 0 (not necessarily whole).
 *
 * Formula: for t ≥ 0, P(T > t) = ½·I_x(df/2, ½) with x = df / (df + t²) (regularized incomplete
 * beta); symmetric for t < 0. The quantile solves the upper tail P(T > t) = 1 − p (so a tail of
 * 1e-6 keeps its relative precision) by Newton steps on the t density
 * f(t) = Γ((df+1)/2) / (√(df·π)·Γ(df/2)) · (1 + t²/df)^(−(df+1)/2), from the Cornish–Fisher
 * expansion about the normal quantile; to about 1e-13 relative.
 * Source: Abramowitz & Stegun, Handbook of Mathematical Functions, 26.7.1, 26.5.27 and 26.7.5.
 */
import { FlexInputError, requireFinite, requireProbability } from './errors';
import { invertIncreasing } from './invert-increasing';
import { normalQuantile } from './normal';
import { logGamma, regularizedBeta } from './special-functions';

/** Degrees of freedom beyond this make t indistinguishable from the normal for any use here. */
const MAX_DF = 1e7;
/**
 * Quantiles already computed, by p and df: an envelope asks for the same few (0.95 at the same df)
 * on every recomputation as the engineer types. Bounded, and emptied when full.
 */
const remembered = new Map<string, number>();
const REMEMBER_AT_MOST = 512;

function requireDf(fn: string, df: number): void {
  requireFinite(fn, 'df', df);
  if (df <= 0 || df > MAX_DF) throw new FlexInputError(fn, 'df', `must be in (0, ${MAX_DF}], got ${df}`);
}

function upperTail(t: number, df: number): number {
  const tail = 0.5 * regularizedBeta(df / (df + t * t), df / 2, 0.5);
  return t >= 0 ? tail : 1 - tail;
}

/**
 * Cumulative distribution function of Student's t.
 * @param t any finite number. @param df degrees of freedom, > 0.
 * @returns P(T ≤ t).
 * @example studentTCdf(2.228139, 10) // => 0.975
 */
export function studentTCdf(t: number, df: number): number {
  requireFinite('studentTCdf', 't', t);
  requireDf('studentTCdf', df);
  return 1 - upperTail(t, df);
}

/**
 * Quantile of Student's t.
 * @param p probability strictly between 0 and 1. @param df degrees of freedom, > 0.
 * @returns t with P(T ≤ t) = p.
 * @example studentTQuantile(0.975, 10) // => 2.228139 ; studentTQuantile(0.95, 9) // => 1.833113
 */
export function studentTQuantile(p: number, df: number): number {
  requireProbability('studentTQuantile', 'p', p);
  requireDf('studentTQuantile', df);
  if (p === 0.5) return 0;
  const key = `${p}|${df}`;
  const known = remembered.get(key);
  if (known !== undefined) return known;
  const value = quantile(p, df);
  if (remembered.size >= REMEMBER_AT_MOST) remembered.clear();
  remembered.set(key, value);
  return value;
}

function quantile(p: number, df: number): number {
  const tail = Math.min(p, 1 - p);
  const z = -normalQuantile(tail);
  // Cornish–Fisher terms (A&S 26.7.5); for df ≤ 2 a poor start, which the safeguard absorbs.
  const start = z + (z ** 3 + z) / (4 * df) + (5 * z ** 5 + 16 * z ** 3 + 3 * z) / (96 * df * df);
  const logNorm = logGamma((df + 1) / 2) - logGamma(df / 2) - 0.5 * Math.log(df * Math.PI);
  const density = (t: number): number => Math.exp(logNorm - ((df + 1) / 2) * Math.log1p((t * t) / df));
  // −P(T > t) increases with t.
  const upper = invertIncreasing((t) => -upperTail(t, df), -tail, Math.max(start, 0), Math.max(1, z), density);
  return p > 0.5 ? upper : -upper;
}
