import { expect } from 'vitest';

/**
 * Test helper: asserts |actual − expected| ≤ rel · max(1, |actual|, |expected|).
 * Floating-point error grows with the magnitudes involved, so a fixed absolute tolerance fails by
 * chance on large values (a 50 mm result carries ~1e-14 mm of rounding per operation); below 1 the
 * bound is absolute, so values near zero are not held to an impossible relative standard.
 */
/**
 * @param actual the value computed. @param expected the reference. @param rel relative tolerance (absolute below 1).
 * @returns nothing; fails the test when off.
 * @example expectClose(1.0000000001, 1, 1e-9) // passes
 */
export function expectClose(actual: number, expected: number, rel: number): void {
  const scale = Math.max(1, Math.abs(actual), Math.abs(expected));
  const diff = Math.abs(actual - expected);
  if (!(diff <= rel * scale)) {
    expect.fail(`expected ${actual} to be within ${rel} (relative) of ${expected}, off by ${diff}`);
  }
}
