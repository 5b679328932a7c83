import { describe, it, expect } from 'vitest';
import { median, modifiedZScores, MODIFIED_Z_THRESHOLD } from './robust-scale';

describe('modifiedZScores', () => {
  it('flags only the far residual', () => {
    const scores = modifiedZScores([0.1, -0.2, 0, 0.2, 9]);
    expect(scores.map((m) => Math.abs(m) > MODIFIED_Z_THRESHOLD)).toEqual([false, false, false, false, true]);
  });

  it('uses the textbook formula above the resolution floor', () => {
    const r = [-4, -2, 0, 2, 4, 30];
    // hand-checked: median 1, |r − 1| = 5,3,1,1,3,29 → MAD 3; M(30) = 0.6745·29/3 (NIST/SEMATECH e-Handbook §1.3.5.17)
    expect(modifiedZScores(r)[5]).toBeCloseTo((0.6745 * 29) / 3, 12);
    expect(median([3, 1, 2])).toBe(2);
    expect(median([4, 1, 2, 3])).toBe(2.5);
  });

  it('does not flag reading noise when the fit is nearly perfect', () => {
    const scores = modifiedZScores([0.001, -0.001, 0, 0.0005, 1]);
    expect(scores.every((m) => Math.abs(m) <= MODIFIED_Z_THRESHOLD)).toBe(true);
  });
});
