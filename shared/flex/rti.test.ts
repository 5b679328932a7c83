import { describe, it, expect } from 'vitest';
import { rampTravelIndex, roundRti } from './rti';
import { FlexInputError } from './errors';
import { inToMm } from './units';

describe('rampTravelIndex', () => {
  it('reproduces the worked examples', () => {
    // off-road trade publications: 62 in up the ramp on a 94 in wheelbase → 659.6 (one source truncates to 659)
    expect(roundRti(rampTravelIndex(62, 94))).toBe(659.6);
    expect(rampTravelIndex(62, 94)).toBeCloseTo(659.574468, 6);
    // off-road trade publications: 1500 mm on 2500 mm → 600
    expect(rampTravelIndex(1500, 2500)).toBe(600);
    // the ratio is unit-free: the same example in mm
    expect(roundRti(rampTravelIndex(inToMm(62), inToMm(94)))).toBe(659.6);
  });

  it('rounds halves away from zero', () => {
    expect(roundRti(600.05)).toBe(600.1);
    expect(roundRti(600.04)).toBe(600);
    expect(roundRti(0)).toBe(0);
  });

  it('throws FlexInputError for bad input', () => {
    expect(() => rampTravelIndex(1000, 0)).toThrowError(/rampTravelIndex: wheelbase/);
    expect(() => rampTravelIndex(-1, 2500)).toThrowError(/rampTravelIndex: distance/);
    expect(() => rampTravelIndex(NaN, 2500)).toThrowError(FlexInputError);
    expect(() => roundRti(-3)).toThrowError(FlexInputError);
  });
});
