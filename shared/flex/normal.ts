/**
 * Standard normal distribution: CDF and quantile.
 *
 * Formula: Φ(z) = ½·erfc(−z/√2), with erfc(x) = Q(½, x²) for x ≥ 0 (regularized upper incomplete
 * gamma) and erfc(x) = 2 − erfc(−x) below; the quantile inverts Φ by bisection to ~1e-12.
 * Source: Abramowitz & Stegun, Handbook of Mathematical Functions, 7.1.2 and 6.5.17.
 *
 * Example: normalCdf(1.959964) // => 0.975 ; normalQuantile(0.95) // => 1.644854
 */
import { requireFinite, requireProbability } from './errors';
import { invertIncreasing } from './invert-increasing';
import { regularizedGammaQ } from './special-functions';

function erfc(x: number): number {
  const q = regularizedGammaQ(0.5, x * x);
  return x >= 0 ? q : 2 - q;
}

export function normalCdf(z: number): number {
  requireFinite('normalCdf', 'z', z);
  return 0.5 * erfc(-z / Math.SQRT2);
}

export function normalQuantile(p: number): number {
  requireProbability('normalQuantile', 'p', p);
  return invertIncreasing(normalCdf, p, 0, 1);
}
