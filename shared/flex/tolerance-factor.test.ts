import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { natrellaToleranceFactor, oneSidedToleranceFactor } from './tolerance-factor';
import { FlexInputError } from './errors';

describe('oneSidedToleranceFactor', () => {
  it('matches the check-sheet values', () => {
    // CHECK-VALUES (NIST/SEMATECH e-Handbook §7.2.6.3 context): n = 40, p = 0.90, gamma = 0.99 → 1.9017 exact
    expect(oneSidedToleranceFactor(40, 0.9, 0.99)).toBeCloseTo(1.9017, 4);
    // same source: 1.9034 by Natrella's formula
    expect(natrellaToleranceFactor(40, 0.9, 0.99)).toBeCloseTo(1.9034, 4);
    // NIST/SEMATECH e-Handbook §7.2.6.3 worked example: n = 43, p = 0.90, gamma = 0.99 → 1.8752.
    // That example evaluates Natrella's approximation; the exact noncentral-t value is 1.8740,
    // 0.0012 lower, the same gap as at n = 40 (1.9034 vs 1.9017) above.
    expect(natrellaToleranceFactor(43, 0.9, 0.99)).toBeCloseTo(1.8752, 4);
    expect(oneSidedToleranceFactor(43, 0.9, 0.99)).toBeCloseTo(1.874, 3);
  });

  it('matches published one-sided tolerance tables, gamma = 0.95 (from memory)', () => {
    // One-sided normal tolerance factor tables (Natrella, NBS Handbook 91, Table A-7), from memory:
    // n = 10: p 0.90 → 2.355, 0.95 → 2.911, 0.99 → 3.981
    expect(oneSidedToleranceFactor(10, 0.9, 0.95)).toBeCloseTo(2.355, 3);
    expect(oneSidedToleranceFactor(10, 0.95, 0.95)).toBeCloseTo(2.911, 3);
    expect(oneSidedToleranceFactor(10, 0.99, 0.95)).toBeCloseTo(3.981, 3);
    // n = 20: 1.926, 2.396, 3.295 ; n = 30: 1.777, 2.220
    expect(oneSidedToleranceFactor(20, 0.9, 0.95)).toBeCloseTo(1.926, 3);
    expect(oneSidedToleranceFactor(20, 0.95, 0.95)).toBeCloseTo(2.396, 3);
    expect(oneSidedToleranceFactor(20, 0.99, 0.95)).toBeCloseTo(3.295, 3);
    expect(oneSidedToleranceFactor(30, 0.9, 0.95)).toBeCloseTo(1.777, 3);
    expect(oneSidedToleranceFactor(30, 0.95, 0.95)).toBeCloseTo(2.22, 3);
    // n = 5: 0.95 → 4.203
    expect(oneSidedToleranceFactor(5, 0.95, 0.95)).toBeCloseTo(4.203, 3);
  });

  it('approaches z_p as n grows and exceeds it for every finite n', () => {
    // Natrella's approximation becomes exact as n grows (NBS Handbook 91); with a known mean and SD
    // the bound is m + z_p·s, z(0.90) = 1.2816 (from memory)
    expect(oneSidedToleranceFactor(5000, 0.9, 0.95)).toBeCloseTo(natrellaToleranceFactor(5000, 0.9, 0.95), 4);
    expect(oneSidedToleranceFactor(5000, 0.9, 0.95) - 1.2816).toBeLessThan(0.05);
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
  });
});
