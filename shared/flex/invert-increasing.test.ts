import { describe, it, expect } from 'vitest';
import { invertIncreasing } from './invert-increasing';

describe('invertIncreasing', () => {
  it('finds roots inside and outside the first bracket', () => {
    expect(invertIncreasing((x) => x * x * x, 8, 0, 1)).toBeCloseTo(2, 11);
    expect(invertIncreasing((x) => x, -1234.5, 0, 1)).toBeCloseTo(-1234.5, 8);
    expect(invertIncreasing(Math.atan, 1.5, 0, 1)).toBeCloseTo(Math.tan(1.5), 8);
  });

  it('takes Newton steps when given the derivative, and falls back to bisection where they leave the bracket', () => {
    let calls = 0;
    const cube = (x: number) => {
      calls++;
      return x * x * x;
    };
    expect(invertIncreasing(cube, 8, 1.9, 0.5, (x) => 3 * x * x)).toBeCloseTo(2, 13);
    expect(calls).toBeLessThan(10);
    // atan's Newton step from 0 overshoots towards its flat tail: the safeguard keeps it bracketed
    expect(invertIncreasing(Math.atan, 1.5, 0, 1, (x) => 1 / (1 + x * x))).toBeCloseTo(Math.tan(1.5), 8);
  });
});
