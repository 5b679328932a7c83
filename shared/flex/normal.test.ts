import { describe, it, expect } from 'vitest';
import { normalCdf, normalQuantile } from './normal';
import { FlexInputError } from './errors';

describe('normal distribution', () => {
  it('matches table values', () => {
    // NIST/SEMATECH e-Handbook §1.3.6.7.1 (cumulative normal table): Φ(1.96) = 0.97500, Φ(1.00) = 0.84134
    expect(normalCdf(1.96)).toBeCloseTo(0.975, 5);
    expect(normalCdf(1)).toBeCloseTo(0.84134, 5);
    expect(normalCdf(0)).toBe(0.5);
    expect(normalCdf(-1)).toBeCloseTo(1 - 0.84134, 5);
    // from memory: z(0.95) = 1.644853627, z(0.975) = 1.959963985, z(0.99) = 2.326347874, z(0.90) = 1.281551566
    expect(normalQuantile(0.95)).toBeCloseTo(1.644853627, 8);
    expect(normalQuantile(0.975)).toBeCloseTo(1.959963985, 8);
    expect(normalQuantile(0.99)).toBeCloseTo(2.326347874, 8);
    expect(normalQuantile(0.9)).toBeCloseTo(1.281551566, 8);
    expect(normalQuantile(0.1)).toBeCloseTo(-1.281551566, 8);
  });

  it('rejects probabilities outside (0, 1)', () => {
    expect(() => normalQuantile(1)).toThrowError(FlexInputError);
    expect(() => normalQuantile(0)).toThrowError(/normalQuantile: p/);
    expect(() => normalCdf(NaN)).toThrowError(/normalCdf: z/);
  });
});
