import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { natrellaToleranceFactor, oneSidedToleranceFactor } from './tolerance-factor';
import { FlexInputError } from './errors';
import { normalQuantile } from './normal';
import { noncentralTCdfByZ } from './test-fixtures';

/**
 * A printed k1 (three decimals) is right if the exact confidence of mean + k·s, P(T' ≤ k·√n) with
 * df = n − 1 and δ = z_p·√n (NIST/SEMATECH e-Handbook §7.2.6.3), crosses gamma within ±0.0005 of it;
 * the probability is integrated by another route than the code's (noncentralTCdfByZ).
 */
function expectTableK1(n: number, p: number, gamma: number, printed: number, decimals = 3): void {
  const delta = normalQuantile(p) * Math.sqrt(n);
  const half = 0.5 * 10 ** -decimals;
  expect(noncentralTCdfByZ((printed - half) * Math.sqrt(n), n - 1, delta)).toBeLessThan(gamma);
  expect(noncentralTCdfByZ((printed + half) * Math.sqrt(n), n - 1, delta)).toBeGreaterThan(gamma);
  expect(oneSidedToleranceFactor(n, p, gamma)).toBeCloseTo(printed, decimals);
}

describe('oneSidedToleranceFactor', () => {
  it('matches the exact and approximate factors of the e-Handbook setting', () => {
    // n = 40, p = 0.90, gamma = 0.99 (the setting of NIST/SEMATECH e-Handbook §7.2.6.3): exact k1 = 1.9017
    // (R: qt(0.99, 39, qnorm(0.9) * sqrt(40)) / sqrt(40)), checked here to 4 decimals by integration
    expectTableK1(40, 0.9, 0.99, 1.9017, 4);
    // Natrella's formula (NBS Handbook 91), evaluated by hand: 1.9034
    expect(natrellaToleranceFactor(40, 0.9, 0.99)).toBeCloseTo(1.9034, 4);
    // NIST/SEMATECH e-Handbook §7.2.6.3 worked example: n = 43, p = 0.90, gamma = 0.99 → 1.8752.
    // That example evaluates Natrella's approximation; the exact noncentral-t value is 1.8740,
    // 0.0012 lower, the same gap as at n = 40 (1.9034 vs 1.9017) above.
    expect(natrellaToleranceFactor(43, 0.9, 0.99)).toBeCloseTo(1.8752, 4);
    expect(oneSidedToleranceFactor(43, 0.9, 0.99)).toBeCloseTo(1.874, 3);
  });

  it('matches one-sided tolerance tables, gamma = 0.95, each value checked by an independent integration', () => {
    // One-sided normal tolerance factors as printed in Natrella, NBS Handbook 91, Table A-7, quoted
    // from memory; reproducible with scipy.stats.nct.ppf(0.95, n - 1, norm.ppf(p) * sqrt(n)) / sqrt(n)
    // or R qt(0.95, n - 1, qnorm(p) * sqrt(n)) / sqrt(n).
    for (const [n, p, printed] of [
      [10, 0.9, 2.355],
      [10, 0.95, 2.911],
      [10, 0.99, 3.981],
      [20, 0.9, 1.926],
      [20, 0.95, 2.396],
      [20, 0.99, 3.295],
      [30, 0.9, 1.777],
      [30, 0.95, 2.22],
      [5, 0.95, 4.203],
    ]) {
      expectTableK1(n, p, 0.95, printed);
    }
  });

  it('stays exact in the far corner: n = 2, p = 0.95, gamma = 0.99 (k1 about 131)', () => {
    const n = 2;
    const k1 = oneSidedToleranceFactor(n, 0.95, 0.99);
    // its confidence by the independent integration over Z and the chi-square tail
    expect(Math.abs(noncentralTCdfByZ(k1 * Math.sqrt(n), n - 1, normalQuantile(0.95) * Math.sqrt(n)) - 0.99)).toBeLessThan(1e-10);
  });

  it('approaches z_p as n grows and exceeds it for every finite n', () => {
    // Natrella's approximation becomes exact as n grows (NBS Handbook 91); with a known mean and SD
    // the bound is m + z_p·s, z(0.90) = 1.2816 (normalQuantile, checked by integration in normal.test.ts)
    expect(oneSidedToleranceFactor(5000, 0.9, 0.95)).toBeCloseTo(natrellaToleranceFactor(5000, 0.9, 0.95), 4);
    expect(oneSidedToleranceFactor(5000, 0.9, 0.95) - normalQuantile(0.9)).toBeLessThan(0.05);
    fc.assert(
      fc.property(fc.integer({ min: 3, max: 200 }), (n) => {
        const k = oneSidedToleranceFactor(n, 0.9, 0.95);
        expect(Number.isFinite(k)).toBe(true);
        expect(k).toBeGreaterThan(1.2815);
      }),
      { numRuns: 15 },
    );
  });

  it('throws FlexInputError for bad input', () => {
    expect(() => oneSidedToleranceFactor(1, 0.9, 0.95)).toThrowError(/oneSidedToleranceFactor: n/);
    expect(() => oneSidedToleranceFactor(10.5, 0.9, 0.95)).toThrowError(FlexInputError);
    expect(() => oneSidedToleranceFactor(10, 1, 0.95)).toThrowError(/coverage/);
    expect(() => oneSidedToleranceFactor(10, 0.9, 0)).toThrowError(/confidence/);
    expect(() => natrellaToleranceFactor(2, 0.9, 0.99)).toThrowError(/natrellaToleranceFactor: n/);
    // below 0.5 the "bound" lies under the mean (k1 was −0.0044 at coverage 0.49): refused
    expect(() => oneSidedToleranceFactor(10, 0.49, 0.95)).toThrowError(/oneSidedToleranceFactor: coverage must be at least 0.5/);
    expect(() => oneSidedToleranceFactor(10, 0.9, 0.3)).toThrowError(/oneSidedToleranceFactor: confidence must be at least 0.5/);
  });
});
