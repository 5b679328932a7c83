import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { MAD_TO_SD, residualScale, residualScaleInPlace } from './robust-scale';
import { normalQuantile } from './normal';
import { seededNormal } from './synthetic-session';
import { FlexInputError } from './errors';

function sortedMedianAbs(values: number[]): number {
  const sorted = values.map(Math.abs).sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 === 1 ? sorted[mid] : 0.5 * (sorted[mid - 1] + sorted[mid]);
}

describe('residualScale', () => {
  it('is 1.4826 × the median absolute residual, and a misread does not move it', () => {
    // hand-checked: |r| = 0.3, 0.4, 0.5, 0.6, 25 → median 0.5
    expect(residualScale([0.5, -0.4, 0.3, -0.6, 25])).toBeCloseTo(MAD_TO_SD * 0.5, 12);
    expect(residualScale([0.5, -0.4, 0.3, -0.6, 2500])).toBeCloseTo(MAD_TO_SD * 0.5, 12);
    // even count: mean of the two middle magnitudes, |r| = 1, 2, 3, 4 → 2.5
    expect(residualScale([4, -1, 3, -2])).toBeCloseTo(MAD_TO_SD * 2.5, 12);
  });

  it('uses the constant that makes it estimate a normal SD: 1 / Φ⁻¹(3/4)', () => {
    // definition of the MAD's consistency factor (NIST/SEMATECH e-Handbook §1.3.5.17)
    expect(MAD_TO_SD).toBeCloseTo(1 / normalQuantile(0.75), 12);
    const normal = seededNormal(31);
    const draws = Array.from({ length: 20000 }, () => 0.5 * normal());
    // sampling error of the MAD of 20 000 normal draws: about 1.1 %/√… ≈ 0.8 % of σ
    expect(residualScale(draws)).toBeGreaterThan(0.49);
    expect(residualScale(draws)).toBeLessThan(0.51);
  });

  it('property: agrees with a sort-based median of |r|', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: -1e3, max: 1e3, noNaN: true }), { minLength: 1, maxLength: 60 }), (values) => {
        expect(residualScale(values)).toBeCloseTo(MAD_TO_SD * sortedMedianAbs(values), 9);
      }),
    );
  });

  it("in place: the same value, on the caller's array", () => {
    const values = Float64Array.of(4, -1, 3, -2, 9);
    expect(residualScaleInPlace(values)).toBeCloseTo(residualScale([4, -1, 3, -2, 9]), 15);
    expect(() => residualScaleInPlace(new Float64Array(0))).toThrowError(/residualScaleInPlace: values/);
  });

  it('throws FlexInputError for no residuals or a NaN', () => {
    expect(() => residualScale([])).toThrowError(/residualScale: residuals must not be empty/);
    expect(() => residualScale([1, NaN])).toThrowError(FlexInputError);
  });
});
