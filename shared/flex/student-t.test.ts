import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { studentTCdf, studentTQuantile } from './student-t';
import { normalQuantile } from './normal';
import { FlexInputError } from './errors';
import { simpson } from './test-fixtures';

/**
 * P(T ≤ t) by numerical integration, independent of the incomplete beta: with u = √df·tan θ the t
 * density becomes ∝ cos^(df−1) θ on (−π/2, π/2), so P(T ≤ t) = ∫ up to atan(t/√df) ÷ the whole.
 */
function tCdfByIntegration(t: number, df: number): number {
  const f = (theta: number) => Math.cos(theta) ** (df - 1);
  return simpson(f, -Math.PI / 2, Math.atan(t / Math.sqrt(df)), 4000) / simpson(f, -Math.PI / 2, Math.PI / 2, 4000);
}

/** A table value printed to three decimals is right if the true quantile lies within ±0.0005 of it. */
function expectTableValue(p: number, df: number, printed: number): void {
  expect(tCdfByIntegration(printed - 0.0005, df)).toBeLessThan(p);
  expect(tCdfByIntegration(printed + 0.0005, df)).toBeGreaterThan(p);
  expect(studentTQuantile(p, df)).toBeCloseTo(printed, 3);
}

describe('studentTQuantile', () => {
  it('matches the NIST/SEMATECH t table of upper critical values', () => {
    // NIST/SEMATECH e-Handbook, upper critical values of the t distribution: df 10 → 2.2281, 1.8125
    expect(studentTQuantile(0.975, 10)).toBeCloseTo(2.2281, 4);
    expect(studentTQuantile(0.95, 10)).toBeCloseTo(1.8125, 4);
    // same table, df 9 (n = 10 observations in a one-sample bound) → 2.262, 1.833
    expect(studentTQuantile(0.975, 9)).toBeCloseTo(2.262, 3);
    expect(studentTQuantile(0.95, 9)).toBeCloseTo(1.833, 3);
  });

  it('matches further t table values, each checked by numerical integration of the density', () => {
    // Upper critical values as printed in t tables (NIST/SEMATECH e-Handbook §1.3.6.7.2), quoted from
    // memory; reproducible with scipy.stats.t.ppf(p, df) or R qt(p, df). df 1 and 2 have closed forms:
    // tan(π(p − ½)) and (2p − 1)/√(2p(1 − p)).
    expect(studentTQuantile(0.95, 1)).toBeCloseTo(Math.tan(Math.PI * 0.45), 9);
    expect(studentTQuantile(0.995, 1)).toBeCloseTo(Math.tan(Math.PI * 0.495), 8);
    expect(studentTQuantile(0.95, 2)).toBeCloseTo(0.9 / Math.sqrt(2 * 0.95 * 0.05), 9);
    for (const [p, df, printed] of [
      [0.95, 1, 6.314],
      [0.975, 1, 12.706],
      [0.995, 1, 63.657],
      [0.95, 2, 2.92],
      [0.95, 5, 2.015],
      [0.975, 5, 2.571],
      [0.975, 20, 2.086],
      [0.95, 30, 1.697],
      [0.975, 100, 1.984],
      [0.95, 100, 1.66],
      [0.95, 200, 1.653],
    ]) {
      expectTableValue(p, df, printed);
    }
  });

  it('is symmetric and tends to the normal quantile', () => {
    expect(studentTQuantile(0.025, 10)).toBeCloseTo(-studentTQuantile(0.975, 10), 12);
    expect(studentTQuantile(0.5, 7)).toBe(0);
    expect(studentTQuantile(0.95, 1e6)).toBeCloseTo(normalQuantile(0.95), 5);
  });

  it('property: the CDF undoes the quantile', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.001, max: 0.999, noNaN: true }), fc.integer({ min: 1, max: 300 }), (p, df) => {
        const t = studentTQuantile(p, df);
        expect(Number.isFinite(t)).toBe(true);
        expect(studentTCdf(t, df)).toBeCloseTo(p, 9);
      }),
    );
  });

  it('throws FlexInputError for bad input', () => {
    expect(() => studentTQuantile(0.95, 0)).toThrowError(/studentTQuantile: df/);
    expect(() => studentTQuantile(1.2, 5)).toThrowError(/studentTQuantile: p/);
    expect(() => studentTQuantile(NaN, 5)).toThrowError(FlexInputError);
    expect(() => studentTCdf(1, Infinity)).toThrowError(FlexInputError);
  });
});
