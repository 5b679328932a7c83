// Plausibility of typed values against the vehicle (this product's rule of thumb, see plausible.ts):
// a slipped digit or a wrong unit is caught, ordinary flex-test readings are not.
import { describe, expect, it } from 'vitest';
import { liftDoubt, readingDoubt } from './plausible';

// The demo truck's size: 700 × 500 mm opening, 90 mm nominal gap (invented for the demo).
const truck = { nominalGapMm: 90, opening: { widthMm: 700, heightMm: 500, cornerRadiusMm: 80, centreYMm: 0, bottomZMm: 350 } };

describe('readingDoubt', () => {
  it('lets ordinary readings through in both reading modes', () => {
    for (const v of [0, 45, 90, 120, 270]) expect(readingDoubt(v, 'foreAft', 'gap', truck, 'mm')).toBeNull();
    for (const v of [-89, 0, 12, 180]) expect(readingDoubt(v, 'foreAft', 'displacement', truck, 'mm')).toBeNull();
    // The demo's lateral shear at the ramp pose is about 130 mm, and negative lateral offsets are ordinary.
    for (const v of [-130, -47, 20, 132, 350]) {
      expect(readingDoubt(v, 'lateral', 'gap', truck, 'mm')).toBeNull();
      expect(readingDoubt(v, 'vertical', 'displacement', truck, 'mm')).toBeNull();
    }
  });

  it('flags a raw gap that is negative or a slipped digit (900 for 90)', () => {
    expect(readingDoubt(-5, 'foreAft', 'gap', truck, 'mm')).toMatch(/cannot be negative/);
    expect(readingDoubt(900, 'foreAft', 'gap', truck, 'mm')).toMatch(/three times the nominal gap of 90.0 mm/);
  });

  it('flags a fore-aft displacement that closes the gap beyond contact or opens it far', () => {
    expect(readingDoubt(-95, 'foreAft', 'displacement', truck, 'mm')).toMatch(/inside the body/);
    expect(readingDoubt(181, 'foreAft', 'displacement', truck, 'mm')).toMatch(/twice its nominal/);
  });

  it('flags lateral and vertical values beyond half the opening, in the tester’s unit', () => {
    expect(readingDoubt(351, 'lateral', 'gap', truck, 'mm')).toMatch(/half the opening \(350.0 mm\)/);
    expect(readingDoubt(-3800, 'vertical', 'displacement', truck, 'in')).toMatch(/13.78 in/);
  });

  it('falls back to the opening when the vehicle has no nominal gap', () => {
    const noGap = { ...truck, nominalGapMm: 0 };
    expect(readingDoubt(300, 'foreAft', 'gap', noGap, 'mm')).toBeNull();
    expect(readingDoubt(400, 'foreAft', 'gap', noGap, 'mm')).toMatch(/half the opening/);
  });
});

describe('liftDoubt', () => {
  it('lets blocks and ramp lifts through and flags a lift that would tilt the axle past 30°', () => {
    // 1900 mm track: tan 30° × 1900 = 1096.97 mm (by hand).
    expect(liftDoubt(300, 1900, 'mm')).toBeNull();
    expect(liftDoubt(-250, 1900, 'mm')).toBeNull();
    expect(liftDoubt(1026, 1900, 'mm')).toBeNull();
    expect(liftDoubt(1097, 1900, 'mm')).toMatch(/more than 30° \(over 1097.0 mm/);
    expect(liftDoubt(-3000, 1900, 'mm')).not.toBeNull();
  });
});
