/**
 * Standard normal distribution: density, CDF and quantile.
 *
 * Formula: φ(z) = e^(−z²/2) / √(2π); Φ(z) = ½·erfc(−z/√2), with erfc(x) = Q(½, x²) for x ≥ 0
 * (regularized upper incomplete gamma) and erfc(x) = 2 − erfc(−x) below, so the lower tail keeps
 * its relative precision. The quantile solves Φ(z) = p in the lower tail (p > ½ by symmetry) by
 * Newton steps from the Hastings approximation (absolute error below 4.5e-4), to about 1e-13.
 * Source: Abramowitz & Stegun, Handbook of Mathematical Functions, 26.2.1, 7.1.2, 6.5.17 and
 * 26.2.23 (Hastings' starting value); Newton: Numerical Recipes (3rd ed.), §9.4.
 */
import { requireFinite, requireProbability } from './errors';
import { invertIncreasing } from './invert-increasing';
import { regularizedGammaQ } from './special-functions';

const INV_SQRT_2PI = 1 / Math.sqrt(2 * Math.PI);

function erfc(x: number): number {
  const q = regularizedGammaQ(0.5, x * x);
  return x >= 0 ? q : 2 - q;
}

/**
 * Density of the standard normal distribution.
 * @param z any finite number. @returns φ(z).
 * @example normalDensity(0) // => 0.398942 (1/√(2π))
 */
export function normalDensity(z: number): number {
  requireFinite('normalDensity', 'z', z);
  return INV_SQRT_2PI * Math.exp(-0.5 * z * z);
}

/**
 * Cumulative distribution function of the standard normal distribution.
 * @param z any finite number. @returns Φ(z) = P(Z ≤ z).
 * @example normalCdf(1.959964) // => 0.975
 */
export function normalCdf(z: number): number {
  requireFinite('normalCdf', 'z', z);
  return 0.5 * erfc(-z / Math.SQRT2);
}

/** Hastings' rational approximation of the lower-tail quantile, p ≤ ½ (A&S 26.2.23). */
function hastings(p: number): number {
  const t = Math.sqrt(-2 * Math.log(p));
  return -(t - (2.515517 + 0.802853 * t + 0.010328 * t * t) / (1 + 1.432788 * t + 0.189269 * t * t + 0.001308 * t * t * t));
}

/**
 * Quantile (inverse CDF) of the standard normal distribution.
 * @param p probability strictly between 0 and 1 (1e-10 from either end at most).
 * @returns z with Φ(z) = p.
 * @example normalQuantile(0.95) // => 1.644854
 */
export function normalQuantile(p: number): number {
  requireProbability('normalQuantile', 'p', p);
  if (p === 0.5) return 0;
  const lower = Math.min(p, 1 - p);
  const cdf = (z: number): number => 0.5 * erfc(-z / Math.SQRT2);
  const density = (z: number): number => INV_SQRT_2PI * Math.exp(-0.5 * z * z);
  const z = invertIncreasing(cdf, lower, hastings(lower), 0.01, density);
  return p < 0.5 ? z : -z;
}
