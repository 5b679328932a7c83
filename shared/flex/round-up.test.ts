import { describe, it, expect } from 'vitest';
import { roundUpToIncrement } from './round-up';
import { inToMm } from './units';
import { FlexInputError } from './errors';

describe('roundUpToIncrement', () => {
  it('rounds up to whole increments', () => {
    expect(roundUpToIncrement(181.2, 5)).toBe(185);
    expect(roundUpToIncrement(185, 5)).toBe(185);
    expect(roundUpToIncrement(0, 5)).toBe(0);
    // 1/4 in = 6.35 mm (NIST SP 811 App. B.8); 8 in = 203.2 mm stays on the grid
    expect(roundUpToIncrement(inToMm(8), inToMm(0.25))).toBe(203.2);
    expect(roundUpToIncrement(197.1, inToMm(0.25))).toBe(203.2);
  });

  it('throws FlexInputError for bad input', () => {
    expect(() => roundUpToIncrement(10, 0)).toThrowError(/roundUpToIncrement: increment/);
    expect(() => roundUpToIncrement(-1, 5)).toThrowError(FlexInputError);
  });
});
