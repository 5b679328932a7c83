/**
 * One-sided normal tolerance factor k1: with n repeated values of mean m and SD s, the bound
 * m + k1·s exceeds at least a fraction `coverage` (p) of the population with confidence gamma.
 *
 * Formula (exact): k1 = t'_gamma(df = n − 1, delta = z_p·√n) / √n, t' the noncentral t quantile.
 * Natrella's approximation (exported separately, for comparison with printed tables):
 *   k1 ≈ (z_p + √(z_p² − a·b)) / a,  a = 1 − z_gamma² / (2(n − 1)),  b = z_p² − z_gamma² / n.
 * Coverage and confidence must be at least 0.5: below it the "bound" lies under the mean.
 * Complexity: one noncentral-t quantile, about 0.3 ms, the first time for an (n, p, gamma); remembered after.
 * Source: NIST/SEMATECH e-Handbook of Statistical Methods §7.2.6.3; Natrella, Experimental
 * Statistics, NBS Handbook 91 (1963).
 */
import { FlexInputError, requireDesignProbability, requireFinite } from './errors';
import { noncentralTQuantile } from './noncentral-t';
import { normalQuantile } from './normal';

const MAX_N = 1e6;
/** k1 already computed, by n, coverage and confidence (each new n costs one noncentral-t quantile). Bounded. */
const remembered = new Map<string, number>();
const REMEMBER_AT_MOST = 512;

function requireSampleSize(fn: string, n: number): void {
  requireFinite(fn, 'n', n);
  if (!Number.isInteger(n) || n < 2 || n > MAX_N) {
    throw new FlexInputError(fn, 'n', `must be a whole number from 2 to ${MAX_N}, got ${n}`);
  }
}

/**
 * Exact one-sided normal tolerance factor k1.
 * @param n number of repeated values, 2 to 1e6.
 * @param coverage fraction p of the population the bound must exceed, 0.5 ≤ p < 1.
 * @param confidence confidence gamma of that statement, 0.5 ≤ gamma < 1.
 * @returns k1, so that mean + k1·SD is the bound.
 * @example oneSidedToleranceFactor(40, 0.9, 0.99) // => 1.9017
 */
export function oneSidedToleranceFactor(n: number, coverage: number, confidence: number): number {
  const fn = 'oneSidedToleranceFactor';
  requireSampleSize(fn, n);
  requireDesignProbability(fn, 'coverage', coverage);
  requireDesignProbability(fn, 'confidence', confidence);
  const key = `${n}|${coverage}|${confidence}`;
  const known = remembered.get(key);
  if (known !== undefined) return known;
  const delta = normalQuantile(coverage) * Math.sqrt(n);
  const k1 = noncentralTQuantile(confidence, n - 1, delta) / Math.sqrt(n);
  if (remembered.size >= REMEMBER_AT_MOST) remembered.clear();
  remembered.set(key, k1);
  return k1;
}

/**
 * Natrella's approximation of k1 (the form printed tables and the e-Handbook's example use).
 * @param n number of repeated values, 2 to 1e6. @param coverage p, 0.5 ≤ p < 1. @param confidence gamma, 0.5 ≤ gamma < 1.
 * @returns the approximate k1.
 * @example natrellaToleranceFactor(43, 0.9, 0.99) // => 1.8752
 */
export function natrellaToleranceFactor(n: number, coverage: number, confidence: number): number {
  const fn = 'natrellaToleranceFactor';
  requireSampleSize(fn, n);
  requireDesignProbability(fn, 'coverage', coverage);
  requireDesignProbability(fn, 'confidence', confidence);
  const zp = normalQuantile(coverage);
  const zg = normalQuantile(confidence);
  const a = 1 - (zg * zg) / (2 * (n - 1));
  const b = zp * zp - (zg * zg) / n;
  const radicand = zp * zp - a * b;
  if (a <= 0 || radicand < 0) {
    throw new FlexInputError(fn, 'n', `is too small for the approximation at this confidence (n = ${n}); use oneSidedToleranceFactor`);
  }
  return (zp + Math.sqrt(radicand)) / a;
}
