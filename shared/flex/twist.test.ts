import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { crossAxleTwistDeg } from './twist';
import { expectClose } from './expect-close';
import { FlexInputError } from './errors';

const lift = fc.double({ min: -800, max: 800, noNaN: true });
const track = fc.double({ min: 1000, max: 2500, noNaN: true });

describe('crossAxleTwistDeg', () => {
  it('is the front roll for a single lifted front wheel', () => {
    // hand-checked: atan(300 / 1800) = atan(1/6) = 9.46232° (axle roll = atan(height difference ÷ track),
    // suspension-analysis software documentation)
    expect(crossAxleTwistDeg({ fl: 300, fr: 0, rl: 0, rr: 0 }, 1800, 1800)).toBeCloseTo(9.4623, 4);
  });

  it('adds front and rear rolls of opposite sense (diagonal lift)', () => {
    // hand-checked: FL up 300 on 1800 and RR up 300 on 1800: 2 × atan(1/6) = 18.9246°
    expect(crossAxleTwistDeg({ fl: 300, fr: 0, rl: 0, rr: 300 }, 1800, 1800)).toBeCloseTo(18.9246, 4);
    // hand-checked: 45° front roll (lift equal to track), level rear
    expect(crossAxleTwistDeg({ fl: 0, fr: -1700, rl: 0, rr: 0 }, 1700, 1600)).toBeCloseTo(45, 12);
  });

  it('is zero when the whole truck is lifted evenly', () => {
    expect(crossAxleTwistDeg({ fl: 200, fr: 200, rl: 200, rr: 200 }, 1800, 1750)).toBe(0);
  });

  it('property: zero lifts give zero twist', () => {
    fc.assert(fc.property(track, track, (tf, tr) => crossAxleTwistDeg({ fl: 0, fr: 0, rl: 0, rr: 0 }, tf, tr) === 0));
  });

  it('property: mirroring left and right negates the twist', () => {
    fc.assert(
      fc.property(lift, lift, lift, lift, track, track, (fl, fr, rl, rr, tf, tr) => {
        const twist = crossAxleTwistDeg({ fl, fr, rl, rr }, tf, tr);
        const mirrored = crossAxleTwistDeg({ fl: fr, fr: fl, rl: rr, rr: rl }, tf, tr);
        expectClose(mirrored, -twist, 1e-9);
        expect(Number.isFinite(twist)).toBe(true);
      }),
    );
  });

  it('throws FlexInputError naming the field for bad input', () => {
    expect(() => crossAxleTwistDeg({ fl: NaN, fr: 0, rl: 0, rr: 0 }, 1800, 1800)).toThrowError(/crossAxleTwistDeg: lifts.fl/);
    expect(() => crossAxleTwistDeg({ fl: 0, fr: 0, rl: 0, rr: 0 }, 0, 1800)).toThrowError(FlexInputError);
    expect(() => crossAxleTwistDeg({ fl: 0, fr: 0, rl: 0, rr: 0 }, 1800, -5)).toThrowError(/trackRear/);
    expect(() => crossAxleTwistDeg({ fl: Infinity, fr: 0, rl: 0, rr: 0 }, 1800, 1800)).toThrowError(FlexInputError);
  });
});
