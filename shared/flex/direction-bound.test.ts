import { describe, it, expect } from 'vitest';
import { predictionDirectionBound, toleranceDirectionBound, type BoundSettings } from './direction-bound';
import { studentTQuantile } from './student-t';
import { oneSidedToleranceFactor } from './tolerance-factor';

const settings: BoundSettings = {
  designTwistDeg: 20,
  confidence: 0.95,
  coverage: 0.9,
  throughOrigin: true,
  repeatBandDeg: 1,
  tFor: (df) => studentTQuantile(0.95, df),
  k1For: (n) => oneSidedToleranceFactor(n, 0.9, 0.95),
};

describe('predictionDirectionBound', () => {
  it('projects the mean ratio and bounds it by the ratios’ one-sample prediction bound', () => {
    const bound = predictionDirectionBound('positive', [5, 10, 15], [45, 91, 134], settings);
    const r = [9, 9.1, 134 / 15];
    const mean = r.reduce((a, b) => a + b, 0) / 3;
    const sd = Math.sqrt(r.reduce((a, v) => a + (v - mean) ** 2, 0) / 2);
    expect(bound.projectedMm).toBeCloseTo(20 * mean, 10);
    // Montgomery, Peck & Vining (5th ed.), ch. 5, weighted least squares (weights 1/x²): 20·(r̄ + t(0.95, 2)·s·√(1 + 1/3))
    expect(bound.upperBoundMm).toBeCloseTo(20 * (mean + studentTQuantile(0.95, 2) * sd * Math.sqrt(4 / 3)), 10);
    expect(bound.twistReachedDeg).toBe(15);
    expect(bound.fit?.scatter).toBe('proportional');
  });

  it('says why there is no bound', () => {
    expect(predictionDirectionBound('negative', [12], [100], settings).unavailable).toBe('needs at least 2 poses twisted this way by 1° or more, has 1');
    expect(predictionDirectionBound('negative', [12, 12, 12], [100, 101, 99], { ...settings, throughOrigin: false }).unavailable).toMatch(
      /two different twists/,
    );
  });
});

describe('toleranceDirectionBound', () => {
  it('is mean + k1·s of the runs scaled to the design twist', () => {
    const bound = toleranceDirectionBound('positive', [10, 10, 10.2, 9.9], [90, 92, 91, 89], 10, settings);
    const scaled = [180, 184, (91 * 20) / 10.2, (89 * 20) / 9.9];
    const mean = scaled.reduce((a, b) => a + b, 0) / 4;
    const sd = Math.sqrt(scaled.reduce((a, v) => a + (v - mean) ** 2, 0) / 3);
    // NIST/SEMATECH e-Handbook §7.2.6.3
    expect(bound.upperBoundMm).toBeCloseTo(mean + oneSidedToleranceFactor(4, 0.9, 0.95) * sd, 10);
    expect(bound.tolerance).toMatchObject({ n: 4, medianTwistDeg: 10, bandDeg: 1 });
    expect(toleranceDirectionBound('positive', [10], [90], 10, settings).unavailable).toMatch(/at least 2 runs/);
  });
});
