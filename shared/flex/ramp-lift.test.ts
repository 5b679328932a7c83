import { describe, expect, it } from 'vitest';
import { rampLiftMm } from './ramp-lift';
import { FlexInputError } from './errors';

describe('rampLiftMm', () => {
  it('is the distance up the ramp times the sine of its angle', () => {
    // Python: 1500 * math.sin(math.radians(20)) = 513.0302149885031
    expect(rampLiftMm(1500, 20)).toBeCloseTo(513.0302149885031, 9);
    // Python: 62 * 25.4 * math.sin(math.radians(23)) = 615.3233811449084 (62 in up a 23° ramp)
    expect(rampLiftMm(62 * 25.4, 23)).toBeCloseTo(615.3233811449084, 9);
    // Python: 1000 * math.sin(math.radians(15)) = 258.81904510252076
    expect(rampLiftMm(1000, 15)).toBeCloseTo(258.81904510252076, 9);
    expect(rampLiftMm(0, 20)).toBe(0);
  });

  it('throws FlexInputError naming the field for bad input', () => {
    expect(() => rampLiftMm(-1, 20)).toThrowError(/rampLiftMm: distance/);
    expect(() => rampLiftMm(1000, 0)).toThrowError(/rampLiftMm: angle/);
    expect(() => rampLiftMm(1000, 90)).toThrowError(FlexInputError);
    expect(() => rampLiftMm(Number.NaN, 20)).toThrowError(FlexInputError);
  });
});
