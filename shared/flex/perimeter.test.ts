import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import {
  EXTREME_STRIDE,
  lowestIsWorst,
  outlineCorners,
  outlineExtremesOn,
  perimeterWorst,
  perimeterWorstOn,
  sampleOutline,
  type OpeningOutline,
} from './perimeter';
import { predictDisplacement } from './predict-displacement';
import { FlexInputError } from './errors';
import type { RigidMotion } from './types';

const outline: OpeningOutline = { width: 700, height: 900, cornerRadius: 80, centreY: 0, bottomZ: 600 };

function still(): RigidMotion {
  return { t: { x: 0, y: 0, z: 0 }, omega: { x: 0, y: 0, z: 0 } };
}

describe('sampleOutline', () => {
  it('walks the whole outline with no gap larger than the step', () => {
    const points = sampleOutline(outline, 5);
    // hand-checked perimeter: 2·(700 + 900 − 4·80) + 2π·80 = 3062.65 mm → at least 613 points at 5 mm
    expect(points.length).toBeGreaterThanOrEqual(613);
    for (let i = 0; i < points.length; i++) {
      const next = points[(i + 1) % points.length];
      expect(Math.hypot(next.y - points[i].y, next.z - points[i].z)).toBeLessThanOrEqual(5 + 1e-9);
    }
    expect(Math.max(...points.map((p) => p.y))).toBeCloseTo(350, 9);
    expect(Math.min(...points.map((p) => p.z))).toBeCloseTo(600, 9);
    expect(Math.max(...points.map((p) => p.z))).toBeCloseTo(1500, 9);
    expect(new Set(points.map((p) => p.side))).toEqual(new Set(['top', 'bottom', 'left', 'right', 'topLeft', 'topRight', 'bottomLeft', 'bottomRight']));
  });

  it('keeps every point on the rounded rectangle', () => {
    for (const p of sampleOutline(outline, 3)) {
      // distance from the inner rectangle (inset by the radius) equals the radius on the outline
      const dy = Math.max(Math.abs(p.y) - (350 - 80), 0);
      const dz = Math.max(Math.abs(p.z - 1050) - (450 - 80), 0);
      expect(Math.hypot(dy, dz)).toBeCloseTo(80, 6);
    }
  });
});

describe('perimeterWorst', () => {
  it('finds the roll shear at the top edge, sign kept', () => {
    const motion = still();
    motion.omega.x = 0.01;
    const worst = perimeterWorst(motion, outline);
    // dy = −wx·z is largest in size at the top (z = 1500): −15 mm
    expect(worst.lateral.valueMm).toBeCloseTo(-15, 12);
    expect(worst.lateral.side).toBe('top');
    expect(worst.lateral.z).toBe(1500);
    // dz = wx·y largest at the left/right edges: ±3.5 mm
    expect(Math.abs(worst.vertical.valueMm)).toBeCloseTo(3.5, 12);
  });

  it('puts a diagonal fore-aft tilt on a corner arc', () => {
    const motion = still();
    motion.omega.y = 0.001;
    motion.omega.z = -0.001;
    const worst = perimeterWorst(motion, outline);
    // dx = 0.001·z + 0.001·y, largest at the top-left arc point facing (1, 1)/√2:
    // centre (270, 1420) + 80/√2·(1, 1) → 0.001·(270 + 1420 + 80·√2)
    expect(worst.foreAft.valueMm).toBeCloseTo(0.001 * (270 + 1420 + 80 * Math.SQRT2), 12);
    expect(worst.foreAft.side).toBe('topLeft');
  });

  it('property: never below dense sampling and never above it by more than the sampling error', () => {
    const small = fc.double({ min: -0.02, max: 0.02, noNaN: true });
    const shift = fc.double({ min: -30, max: 30, noNaN: true });
    fc.assert(
      fc.property(shift, shift, shift, small, small, small, (tx, ty, tz, wx, wy, wz) => {
        const motion = { t: { x: tx, y: ty, z: tz }, omega: { x: wx, y: wy, z: wz } };
        const worst = perimeterWorst(motion, outline);
        const samples = sampleOutline(outline, 1).map((p) => predictDisplacement(motion, p.y, p.z));
        const sampled = {
          foreAft: Math.max(...samples.map((d) => Math.abs(d.dx))),
          lateral: Math.max(...samples.map((d) => Math.abs(d.dy))),
          vertical: Math.max(...samples.map((d) => Math.abs(d.dz))),
        };
        for (const axis of ['foreAft', 'lateral', 'vertical'] as const) {
          // rounding grows with the displacement, so the slack is relative to it
          expect(Math.abs(worst[axis].valueMm)).toBeGreaterThanOrEqual(sampled[axis] - 1e-9 * Math.max(1, sampled[axis]));
          // 1 mm samples on an 80 mm arc miss the peak by at most r(1 − cos(θ/2)), far below 0.01 mm here
          expect(Math.abs(worst[axis].valueMm) - sampled[axis]).toBeLessThan(0.01);
          expect(Number.isFinite(worst[axis].y) && Number.isFinite(worst[axis].z)).toBe(true);
        }
      }),
      { numRuns: 40 },
    );
  });

  it('handles square corners', () => {
    const motion = still();
    motion.omega.y = 0.002;
    motion.omega.z = 0.001;
    const worst = perimeterWorst(motion, { width: 600, height: 400, cornerRadius: 0 });
    // dx = 0.002·z − 0.001·y, largest at y = −300, z = 400: 0.8 + 0.3
    expect(worst.foreAft.valueMm).toBeCloseTo(1.1, 12);
    expect(worst.foreAft.side).toBe('topRight');
  });

  it('throws FlexInputError for a bad outline', () => {
    expect(() => perimeterWorst(still(), { width: 0, height: 900, cornerRadius: 0 })).toThrowError(/perimeterWorst: outline.width/);
    expect(() => perimeterWorst(still(), { width: 700, height: 900, cornerRadius: 400 })).toThrowError(/cornerRadius/);
    expect(() => sampleOutline(outline, 0)).toThrowError(FlexInputError);
    expect(() => sampleOutline(outline, 1e-6)).toThrowError(/stepMm/);
  });
});

describe('perimeterWorst: highest and lowest apart', () => {
  it('gives the most opening and the most closing of the gap, each at its place', () => {
    // dx = −2 + 0.002·z: closes 0.8 mm along the bottom (z = 600), opens 1 mm along the top (z = 1500)
    const worst = perimeterWorst({ t: { x: -2, y: 0, z: 0 }, omega: { x: 0, y: 0.002, z: 0 } }, outline);
    expect(worst.foreAft.highest).toMatchObject({ side: 'top', z: 1500 });
    expect(worst.foreAft.highest.valueMm).toBeCloseTo(1, 12);
    expect(worst.foreAft.lowest).toMatchObject({ side: 'bottom', z: 600 });
    expect(worst.foreAft.lowest.valueMm).toBeCloseTo(-0.8, 12);
    expect(worst.foreAft.valueMm).toBeCloseTo(1, 12);
  });

  it('refuses a motion with NaN or a rotation beyond the small-angle model', () => {
    const motion = still();
    motion.omega.x = NaN;
    expect(() => perimeterWorst(motion, outline)).toThrowError(/perimeterWorst: motion\.omega\.x must be a finite number/);
    motion.omega.x = 0.9;
    expect(() => perimeterWorst(motion, outline)).toThrowError(/perimeterWorst: motion\.omega\.x must be within ±0\.5 rad/);
  });
});

describe('outlineCorners', () => {
  it('gives the bounding rectangle anticlockwise from the bottom left (+y)', () => {
    expect(outlineCorners(outline)).toEqual([350, 600, 350, 1500, -350, 1500, -350, 600]);
  });
});

describe('perimeterWorstOn', () => {
  it('gives what perimeterWorst gives, for motion after motion on one outline', () => {
    const on = perimeterWorstOn(outline);
    for (const motion of [still(), { t: { x: 1, y: -4, z: 2 }, omega: { x: 0.003, y: -0.001, z: 0.002 } }]) {
      expect(on(motion)).toEqual(perimeterWorst(motion, outline));
    }
    expect(() => perimeterWorstOn({ ...outline, height: 0 })).toThrowError(/perimeterWorstOn: outline.height/);
  });
});

describe('outlineExtremesOn', () => {
  it("gives perimeterWorst's highest and lowest values and places as numbers, to the bit", () => {
    const on = outlineExtremesOn(outline);
    const out = new Float64Array(3 * EXTREME_STRIDE);
    const motions: RigidMotion[] = [
      still(),
      { t: { x: 1, y: -4, z: 2 }, omega: { x: 0.003, y: -0.001, z: 0.002 } },
      { t: { x: -2.5, y: 7, z: -0.3 }, omega: { x: -0.004, y: 0, z: -0.0015 } },
      { t: { x: 0.4, y: 0, z: 3 }, omega: { x: 0, y: 0.002, z: 0 } },
    ];
    for (const motion of motions) {
      const worst = perimeterWorst(motion, outline);
      on(motion.t.x, motion.t.y, motion.t.z, motion.omega.x, motion.omega.y, motion.omega.z, out);
      (['foreAft', 'lateral', 'vertical'] as const).forEach((axis, c) => {
        const { highest, lowest } = worst[axis];
        expect(Array.from(out.subarray(EXTREME_STRIDE * c, EXTREME_STRIDE * (c + 1)))).toEqual([
          highest.valueMm,
          highest.y,
          highest.z,
          lowest.valueMm,
          lowest.y,
          lowest.z,
        ]);
        expect(worst[axis].valueMm).toBe(lowestIsWorst(highest.valueMm, lowest.valueMm) ? lowest.valueMm : highest.valueMm);
      });
    }
    expect(() => outlineExtremesOn({ ...outline, width: -1 })).toThrowError(/outlineExtremesOn: outline.width/);
  });

  it('calls a tie between highest and lowest for the highest', () => {
    expect(lowestIsWorst(5, -5)).toBe(false);
    expect(lowestIsWorst(3, -5)).toBe(true);
    expect(lowestIsWorst(-1, -5)).toBe(true);
  });
});
