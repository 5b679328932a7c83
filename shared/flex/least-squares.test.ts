import { describe, it, expect } from 'vitest';
import { leastSquares } from './least-squares';

describe('leastSquares', () => {
  it('solves an exact system', () => {
    const x = leastSquares([[1, 0], [1, 1], [1, 2]], [1, 3, 5]);
    expect(x[0]).toBeCloseTo(1, 12);
    expect(x[1]).toBeCloseTo(2, 12);
  });

  it('matches the normal-equation solution of an overdetermined system', () => {
    // hand-checked: fit y = c to [1, 2, 6] gives the mean 3
    expect(leastSquares([[1], [1], [1]], [1, 2, 6])[0]).toBeCloseTo(3, 12);
    // hand-checked: 3-parameter plane through 4 points with one off by +4: residuals ±1
    const rows = [[1, 0, 0], [1, 1, 0], [1, 0, 1], [1, 1, 1]];
    const x = leastSquares(rows, [0, 1, 1, 6]);
    expect(x[0]).toBeCloseTo(-1, 12);
    expect(x[1]).toBeCloseTo(3, 12);
    expect(x[2]).toBeCloseTo(3, 12);
  });

  it('refuses a dependent column', () => {
    expect(() => leastSquares([[1, 2], [1, 2], [1, 2]], [1, 2, 3])).toThrowError(/dependent/);
  });
});
