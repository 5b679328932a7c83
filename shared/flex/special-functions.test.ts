import { describe, it, expect } from 'vitest';
import { logGamma, regularizedBeta, regularizedGammaQ } from './special-functions';
import { simpson } from './test-fixtures';

describe('special functions', () => {
  it('logGamma matches factorials and Γ(1/2) = √π', () => {
    expect(Math.exp(logGamma(5))).toBeCloseTo(24, 10); // Γ(5) = 4! (definition)
    expect(logGamma(11)).toBeCloseTo(Math.log(3628800), 10); // Γ(11) = 10! (definition)
    expect(logGamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 12); // Γ(1/2) = √π (classical identity)
    // Γ(0.1) = 9.513507698668732 (scipy.special.gamma(0.1), quoted from memory), checked by integration:
    // Γ(0.1) = Γ(1.1)/0.1 and Γ(1.1) = ∫ t^0.1 e^−t dt = ∫ 10·u^10·e^(−u^10) du (t = u^10, smooth)
    const gamma11 = simpson((u) => 10 * u ** 10 * Math.exp(-(u ** 10)), 0, 1.8, 20000);
    expect(Math.abs(gamma11 / 0.1 - 9.513507698668732)).toBeLessThan(1e-9);
    expect(logGamma(0.1)).toBeCloseTo(Math.log(9.513507698668732), 10);
  });

  it('regularizedBeta has the closed forms of small integer parameters', () => {
    // I_x(1, 1) = x; I_x(2, 2) = 3x² − 2x³ (closed forms from the definition)
    expect(regularizedBeta(0.3, 1, 1)).toBeCloseTo(0.3, 13);
    expect(regularizedBeta(0.3, 2, 2)).toBeCloseTo(3 * 0.09 - 2 * 0.027, 13);
    expect(regularizedBeta(0.9, 2, 2)).toBeCloseTo(3 * 0.81 - 2 * 0.729, 13);
    expect(regularizedBeta(0, 2, 3)).toBe(0);
    expect(regularizedBeta(1, 2, 3)).toBe(1);
  });

  it('regularizedGammaQ gives erfc and the exponential tail', () => {
    // Q(1, x) = e^−x (closed form); Q(1/2, x²) = erfc(x); erfc(1) = 0.157299207050285
    // (scipy.special.erfc(1), quoted from memory), checked as (2/√π)·∫₁^∞ e^(−t²) dt by integration
    expect(Math.abs((2 / Math.sqrt(Math.PI)) * simpson((t) => Math.exp(-t * t), 1, 9, 20000) - 0.157299207050285)).toBeLessThan(1e-12);
    expect(regularizedGammaQ(1, 2.5)).toBeCloseTo(Math.exp(-2.5), 13);
    expect(regularizedGammaQ(1, 0.2)).toBeCloseTo(Math.exp(-0.2), 13);
    expect(regularizedGammaQ(0.5, 1)).toBeCloseTo(0.157299207050285, 13);
  });
});
