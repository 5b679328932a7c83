import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { studentTCdf, studentTQuantile } from './student-t';
import { normalQuantile } from './normal';
import { FlexInputError } from './errors';

describe('studentTQuantile', () => {
  it('matches the NIST/SEMATECH t table given in the check sheet', () => {
    // NIST/SEMATECH e-Handbook, upper critical values of the t distribution: df 10 → 2.2281, 1.8125
    expect(studentTQuantile(0.975, 10)).toBeCloseTo(2.2281, 4);
    expect(studentTQuantile(0.95, 10)).toBeCloseTo(1.8125, 4);
    // same table, df 9 (n = 10 observations in a one-sample bound) → 2.262, 1.833
    expect(studentTQuantile(0.975, 9)).toBeCloseTo(2.262, 3);
    expect(studentTQuantile(0.95, 9)).toBeCloseTo(1.833, 3);
  });

  it('matches further NIST/SEMATECH t table values (from memory)', () => {
    // NIST/SEMATECH e-Handbook t table, from memory: df 1 → 6.314 (0.95), 12.706 (0.975), 63.657 (0.995)
    expect(studentTQuantile(0.95, 1)).toBeCloseTo(6.314, 3);
    expect(studentTQuantile(0.975, 1)).toBeCloseTo(12.706, 3);
    expect(studentTQuantile(0.995, 1)).toBeCloseTo(63.657, 3);
    // from memory: df 2 → 2.920 (0.95); df 5 → 2.015 (0.95), 2.571 (0.975); df 20 → 2.086 (0.975)
    expect(studentTQuantile(0.95, 2)).toBeCloseTo(2.92, 3);
    expect(studentTQuantile(0.95, 5)).toBeCloseTo(2.015, 3);
    expect(studentTQuantile(0.975, 5)).toBeCloseTo(2.571, 3);
    expect(studentTQuantile(0.975, 20)).toBeCloseTo(2.086, 3);
    // from memory: df 30 → 1.697 (0.95); df 100 → 1.984 (0.975), 1.660 (0.95); df 200 → 1.653 (0.95)
    expect(studentTQuantile(0.95, 30)).toBeCloseTo(1.697, 3);
    expect(studentTQuantile(0.975, 100)).toBeCloseTo(1.984, 3);
    expect(studentTQuantile(0.95, 100)).toBeCloseTo(1.66, 3);
    expect(studentTQuantile(0.95, 200)).toBeCloseTo(1.653, 3);
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
