import { describe, it, expect } from 'vitest';
import { noncentralTCdf, noncentralTQuantile } from './noncentral-t';
import { studentTCdf } from './student-t';
import { normalCdf } from './normal';
import { FlexInputError } from './errors';
import { noncentralTCdfByZ } from './test-fixtures';

describe('noncentral t', () => {
  it('reduces to Student t when delta = 0', () => {
    // definition: the noncentral t with delta = 0 is Student's t
    for (const df of [1, 2, 5, 30, 150]) {
      for (const t of [-3, -0.5, 0.5, 2, 10]) expect(noncentralTCdf(t, df, 0)).toBeCloseTo(studentTCdf(t, df), 9);
    }
  });

  it('tends to a shifted normal for large df', () => {
    // definition: S → 1 as df → ∞, so P(T' ≤ t) → Φ(t − delta)
    expect(noncentralTCdf(3.5, 1e5, 2)).toBeCloseTo(normalCdf(1.5), 3);
  });

  it('agrees with the same probability integrated over Z and the chi-square tail, to 1e-8', () => {
    for (const [t, df, delta] of [
      [2.5, 1, 1.8],
      [40, 1, 1.8],
      [3.1, 4, 2.9],
      [2.2, 9, 4.05],
      [12.6, 39, 8.1],
      [3.0, 199, 2.5],
    ]) {
      expect(Math.abs(noncentralTCdf(t, df, delta) - noncentralTCdfByZ(t, df, delta))).toBeLessThan(1e-8);
    }
  });

  it('has a quantile that inverts the CDF', () => {
    for (const [p, df, delta] of [
      [0.95, 1, 1.81],
      [0.99, 4, 2.87],
      [0.5, 30, 0],
      [0.9, 299, 22.1],
    ]) {
      expect(noncentralTCdf(noncentralTQuantile(p, df, delta), df, delta)).toBeCloseTo(p, 10);
    }
  });

  it('stays finite for a large noncentrality (where the AS 243 series underflows)', () => {
    const q = noncentralTQuantile(0.99, 999, 3.09 * Math.sqrt(1000));
    expect(Number.isFinite(q)).toBe(true);
    expect(noncentralTCdf(q, 999, 3.09 * Math.sqrt(1000))).toBeCloseTo(0.99, 9);
  });

  it('throws FlexInputError for bad input', () => {
    expect(() => noncentralTCdf(1, 0.5, 0)).toThrowError(/noncentralTCdf: df/);
    expect(() => noncentralTQuantile(0.9, 5, NaN)).toThrowError(FlexInputError);
  });
});
