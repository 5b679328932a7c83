/**
 * Robust scale of residuals: the median absolute residual, scaled to estimate a normal SD.
 *
 * Formula: σ̂ = 1.4826 · median |rᵢ| (1.4826 = 1/Φ⁻¹(3/4) makes it consistent for the SD of a normal
 * distribution; residuals of a least-squares fit are centred at 0, so no median is subtracted).
 * A few misreads among many residuals barely move it (breakdown point 50 %), unlike an RMS. Its
 * efficiency at the normal is about 37 %: it carries the information of about 0.37 × as many
 * degrees of freedom as an SD from the same residuals.
 * The median is found by selection (Hoare's quickselect) on a copy, in expected O(n).
 * Source: NIST/SEMATECH e-Handbook of Statistical Methods §1.3.5.17 (MAD); Rousseeuw & Croux,
 * "Alternatives to the median absolute deviation", JASA 88 (1993) 1273–1283 (efficiency 37 %).
 */
import { FlexInputError } from './errors';

/** 1 / Φ⁻¹(0.75): makes the median absolute value of N(0, σ²) draws estimate σ. */
export const MAD_TO_SD = 1.482602218505602;
/** Gaussian efficiency of the MAD (Rousseeuw & Croux 1993). */
export const MAD_EFFICIENCY = 0.37;

function select(values: Float64Array, k: number): number {
  let lo = 0;
  let hi = values.length - 1;
  while (lo < hi) {
    const pivot = values[(lo + hi) >> 1];
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (values[i] < pivot) i++;
      while (values[j] > pivot) j--;
      if (i <= j) {
        const swap = values[i];
        values[i] = values[j];
        values[j] = swap;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return values[k];
  }
  return values[k];
}

/**
 * Robust SD of residuals centred at zero.
 * @param residuals at least one finite residual (mm).
 * @returns 1.4826 · median |rᵢ|.
 * @example residualScale([0.5, -0.4, 0.3, -0.6, 25]) // => 0.741 (1.4826 × 0.5: the 25 does not count)
 */
export function residualScale(residuals: ArrayLike<number>): number {
  const n = residuals.length;
  if (n === 0) throw new FlexInputError('residualScale', 'residuals', 'must not be empty');
  const magnitudes = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const r = residuals[i];
    if (!Number.isFinite(r)) throw new FlexInputError('residualScale', `residuals[${i}]`, `must be a finite number, got ${String(r)}`);
    magnitudes[i] = r;
  }
  return residualScaleInPlace(magnitudes);
}

/**
 * residualScale on the caller's own scratch array, which it reorders (no copy: for a session's
 * thousands of residuals, checked finite by the caller).
 * @param values finite residuals; overwritten. @returns 1.4826 · median |rᵢ|.
 * @example residualScaleInPlace(Float64Array.of(0.5, -0.4, 0.3, -0.6, 25)) // => 0.741
 */
export function residualScaleInPlace(values: Float64Array): number {
  const n = values.length;
  if (n === 0) throw new FlexInputError('residualScaleInPlace', 'values', 'must not be empty');
  const magnitudes = values;
  for (let i = 0; i < n; i++) magnitudes[i] = Math.abs(magnitudes[i]);
  const mid = n >> 1;
  const upper = select(magnitudes, mid);
  if (n % 2 === 1) return MAD_TO_SD * upper;
  let lower = -Infinity;
  for (let i = 0; i < mid; i++) if (magnitudes[i] > lower) lower = magnitudes[i];
  return MAD_TO_SD * 0.5 * (lower + upper);
}
