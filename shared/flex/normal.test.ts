import { describe, it, expect } from 'vitest';
import { normalCdf, normalDensity, normalQuantile } from './normal';
import { simpson } from './test-fixtures';
import { FlexInputError } from './errors';

/** Φ(z) by integrating the density e^(−u²/2)/√(2π) from 0: independent of the incomplete gamma. */
const phiByIntegration = (z: number) => 0.5 + simpson((u) => Math.exp(-0.5 * u * u) / Math.sqrt(2 * Math.PI), 0, z, 4000);

describe('normal distribution', () => {
  it('matches table values', () => {
    // NIST/SEMATECH e-Handbook §1.3.6.7.1 (cumulative normal table): Φ(1.96) = 0.97500, Φ(1.00) = 0.84134
    expect(normalCdf(1.96)).toBeCloseTo(0.975, 5);
    expect(normalCdf(1)).toBeCloseTo(0.84134, 5);
    expect(normalCdf(0)).toBe(0.5);
    expect(normalCdf(-1)).toBeCloseTo(1 - 0.84134, 5);
    // scipy.stats.norm.ppf([0.95, 0.975, 0.99, 0.90]) (R: qnorm(c(0.95, 0.975, 0.99, 0.90))) =
    // 1.644853627, 1.959963985, 2.326347874, 1.281551566 — quoted from memory, so checked here by
    // integrating the density: Φ at each value is its p to 1e-9
    for (const [p, z] of [
      [0.95, 1.644853627],
      [0.975, 1.959963985],
      [0.99, 2.326347874],
      [0.9, 1.281551566],
    ]) {
      expect(Math.abs(phiByIntegration(z) - p)).toBeLessThan(1e-9);
    }
    expect(normalQuantile(0.95)).toBeCloseTo(1.644853627, 8);
    expect(normalQuantile(0.975)).toBeCloseTo(1.959963985, 8);
    expect(normalQuantile(0.99)).toBeCloseTo(2.326347874, 8);
    expect(normalQuantile(0.9)).toBeCloseTo(1.281551566, 8);
    expect(normalQuantile(0.1)).toBeCloseTo(-1.281551566, 8);
  });

  it('has the density of the definition and a quantile that inverts the CDF in both tails', () => {
    expect(normalDensity(0)).toBeCloseTo(1 / Math.sqrt(2 * Math.PI), 15);
    expect(normalDensity(-1.5)).toBeCloseTo(Math.exp(-1.125) / Math.sqrt(2 * Math.PI), 15);
    for (const p of [1e-10, 1e-6, 0.001, 0.3, 0.7, 0.999, 1 - 1e-9]) {
      const z = normalQuantile(p);
      // relative precision kept in the far tails
      const tail = p < 0.5 ? normalCdf(z) : normalCdf(-z);
      expect(Math.abs(tail / Math.min(p, 1 - p) - 1)).toBeLessThan(1e-6);
    }
  });

  it('rejects probabilities outside (0, 1)', () => {
    expect(() => normalQuantile(1)).toThrowError(FlexInputError);
    expect(() => normalQuantile(0)).toThrowError(/normalQuantile: p/);
    expect(() => normalCdf(NaN)).toThrowError(/normalCdf: z/);
  });
});
