import { describe, it, expect } from 'vitest';
import { predictionLeverage, upperPredictionBoundAt } from './prediction-bound';
import { linearFit } from './linear-fit';
import { studentTQuantile } from './student-t';
import { FlexInputError } from './errors';

describe('upperPredictionBoundAt', () => {
  it('is the textbook one-sided prediction bound of an ordinary line', () => {
    const fit = linearFit([1, 2, 3, 4, 5], [2.2, 3.9, 6.1, 8.0, 9.8], { throughOrigin: false });
    const xs = [1, 2, 3, 4, 5];
    const mean = 3;
    const sxx = xs.reduce((s, x) => s + (x - mean) ** 2, 0);
    // Montgomery, Peck & Vining (5th ed.), ch. 2, prediction of new observations: ŷ(x₀) ± t·s·√(1 + 1/n + (x₀ − x̄)²/Sxx)
    const expected = fit.intercept + fit.slope * 8 + studentTQuantile(0.95, 3) * fit.residualSd * Math.sqrt(1 + 1 / 5 + (8 - mean) ** 2 / sxx);
    expect(upperPredictionBoundAt(fit, 8, 0.95)).toBeCloseTo(expected, 12);
    expect(predictionLeverage(fit, 8)).toBeCloseTo(1 / 5 + 25 / sxx, 12);
  });

  it('with scatter proportional to x through the origin, is x·(mean ratio + t·s·√(1 + 1/n))', () => {
    const xs = [4, 8, 12, 16];
    const ys = [37, 70, 111, 141];
    const fit = linearFit(xs, ys, { scatter: 'proportional' });
    const r = ys.map((y, i) => y / xs[i]);
    const mean = r.reduce((a, b) => a + b, 0) / 4;
    const sd = Math.sqrt(r.reduce((a, v) => a + (v - mean) ** 2, 0) / 3);
    // Montgomery, Peck & Vining (5th ed.), ch. 5, weighted least squares with weights 1/x²: Var(new − ŷ) = σ²·(x₀² + x₀²/Σ(1/x²·x²)) = σ²x₀²(1 + 1/n)
    expect(upperPredictionBoundAt(fit, 30, 0.95)).toBeCloseTo(30 * (mean + studentTQuantile(0.95, 3) * sd * Math.sqrt(1 + 1 / 4)), 10);
    expect(upperPredictionBoundAt(fit, 30, 0.95, 2)).toBeCloseTo(30 * (mean + 2 * sd * Math.sqrt(1 + 1 / 4)), 10);
  });

  it('refuses a design point of 0 or below with proportional scatter', () => {
    const fit = linearFit([4, 8, 12], [37, 70, 111], { scatter: 'proportional' });
    expect(() => upperPredictionBoundAt(fit, 0, 0.95)).toThrowError(/upperPredictionBoundAt: x must be greater than 0/);
    expect(() => predictionLeverage(fit, NaN)).toThrowError(FlexInputError);
  });
});
