import { describe, it, expect } from 'vitest';
import { invertIncreasing } from './invert-increasing';

describe('invertIncreasing', () => {
  it('finds roots inside and outside the first bracket', () => {
    expect(invertIncreasing((x) => x * x * x, 8, 0, 1)).toBeCloseTo(2, 11);
    expect(invertIncreasing((x) => x, -1234.5, 0, 1)).toBeCloseTo(-1234.5, 8);
    expect(invertIncreasing(Math.atan, 1.5, 0, 1)).toBeCloseTo(Math.tan(1.5), 8);
  });
});
