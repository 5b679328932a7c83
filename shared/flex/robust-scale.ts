/**
 * Robust outlier flags for residuals: the modified z-score.
 *
 * Formula: M_i = 0.6745 · (r_i − median(r)) / MAD, MAD = median |r_i − median(r)|; flag |M_i| > 3.5.
 * MAD is floored at READING_RESOLUTION_MM so that near-perfect fits do not flag ordinary reading
 * noise: gauge gaps are read to about ±0.5 mm (common practice), so a residual must be at least
 * 3.5 × 0.5 / 0.6745 ≈ 2.6 mm from the median before it is flagged.
 * Source: Iglewicz & Hoaglin, How to Detect and Handle Outliers (1993), as given in the
 * NIST/SEMATECH e-Handbook §1.3.5.17.
 *
 * Example: modifiedZScores([0.1, -0.2, 0, 0.2, 9]).map((m) => Math.abs(m) > 3.5) // => last only
 */
export const MODIFIED_Z_THRESHOLD = 3.5;
export const READING_RESOLUTION_MM = 0.5;

export function median(values: readonly number[]): number {
  if (values.length === 0) throw new Error('median: no values');
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 === 1 ? sorted[mid] : 0.5 * (sorted[mid - 1] + sorted[mid]);
}

export function modifiedZScores(residuals: readonly number[]): number[] {
  const centre = median(residuals);
  const mad = Math.max(median(residuals.map((r) => Math.abs(r - centre))), READING_RESOLUTION_MM);
  return residuals.map((r) => (0.6745 * (r - centre)) / mad);
}
