import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { fitRelativeMotion } from './relative-motion';
import { predictDisplacement } from './predict-displacement';
import { seededNormal } from './synthetic-session';
import { expectClose } from './expect-close';
import { FlexInputError } from './errors';
import type { Axis, GaugePoint, Reading, RigidMotion } from './types';

const points: GaugePoint[] = [
  { id: 'A', y: 320, z: 1470 },
  { id: 'B', y: 0, z: 1470 },
  { id: 'C', y: -320, z: 1470 },
  { id: 'D', y: -320, z: 1050 },
  { id: 'E', y: -320, z: 630 },
  { id: 'F', y: 0, z: 630 },
  { id: 'G', y: 320, z: 630 },
  { id: 'H', y: 320, z: 1050 },
];

const motion: RigidMotion = { t: { x: 4, y: 60, z: 8 }, omega: { x: 0.012, y: 0.003, z: -0.004 } };

function readingsOf(m: RigidMotion, pts: GaugePoint[], axes: Axis[] = ['foreAft', 'lateral', 'vertical']): Reading[] {
  const readings: Reading[] = [];
  for (const p of pts) {
    const d = predictDisplacement(m, p.y, p.z);
    const byAxis: Record<Axis, number> = { foreAft: d.dx, lateral: d.dy, vertical: d.dz };
    for (const axis of axes) readings.push({ pointId: p.id, axis, value: byAxis[axis] });
  }
  return readings;
}

function expectMotionClose(actual: RigidMotion, expected: RigidMotion, digitsT: number, digitsOmega = digitsT + 3): void {
  for (const k of ['x', 'y', 'z'] as const) {
    expect(actual.t[k]).toBeCloseTo(expected.t[k], digitsT);
    expect(actual.omega[k]).toBeCloseTo(expected.omega[k], digitsOmega);
  }
}

describe('fitRelativeMotion', () => {
  it('recovers a synthetic rigid motion exactly', () => {
    const fit = fitRelativeMotion(points, readingsOf(motion, points));
    expectMotionClose(fit.motion, motion, 9);
    expect(fit.residualRms).toBeLessThan(1e-9);
    expect(fit.outOfPlane.status).toBe('full');
    expect(fit.inPlane.status).toBe('full');
    expect(fit.outOfPlane.reason).toBeNull();
    expect(fit.outliers).toHaveLength(0);
  });

  it('solves the documented three-point example', () => {
    const fit = fitRelativeMotion(
      [{ id: 'A', y: 0, z: 0 }, { id: 'B', y: 100, z: 0 }, { id: 'C', y: 0, z: 100 }],
      [
        { pointId: 'A', axis: 'foreAft', value: 2 },
        { pointId: 'B', axis: 'foreAft', value: 2 },
        { pointId: 'C', axis: 'foreAft', value: 3 },
      ],
    );
    // hand-checked: A gives tx = 2, B gives wz = 0, C gives wy = (3 − 2) / 100
    expect(fit.motion.t.x).toBeCloseTo(2, 12);
    expect(fit.motion.omega.z).toBeCloseTo(0, 12);
    expect(fit.motion.omega.y).toBeCloseTo(0.01, 12);
    expect(fit.inPlane.status).toBe('none');
  });

  it('gives the expected residual RMS under seeded noise', () => {
    const normal = seededNormal(42);
    const sd = 0.5;
    const many = Array.from({ length: 24 }, (_, i) => ({ id: `Q${i}`, y: -320 + (i % 6) * 128, z: 630 + Math.floor(i / 6) * 280 }));
    const readings = readingsOf(motion, many).map((r) => ({ ...r, value: r.value + sd * normal() }));
    const fit = fitRelativeMotion(many, readings);
    // least-squares theory: E[RMS²] = σ²·(n − p)/n with n = 72 readings, p = 6 parameters → 0.479 mm
    expect(fit.residualRms).toBeGreaterThan(0.4);
    expect(fit.residualRms).toBeLessThan(0.56);
    // 0.5 mm noise over a ±320 mm lever: rotations to about ±0.002 rad, translations to about ±0.5 mm
    expectMotionClose(fit.motion, motion, 0, 2);
    expect(fit.outliers).toHaveLength(0);
  });

  it('flags a single bad reading and only that one', () => {
    const normal = seededNormal(7);
    const readings = readingsOf(motion, points).map((r) => ({ ...r, value: r.value + 0.3 * normal() }));
    const bad = readings.findIndex((r) => r.pointId === 'D' && r.axis === 'lateral');
    readings[bad] = { ...readings[bad], value: readings[bad].value + 15 };
    const fit = fitRelativeMotion(points, readings);
    expect(fit.outliers.map((o) => o.index)).toEqual([bad]);
    expect(fit.residuals[bad].outlier).toBe(true);
    expect(Math.abs(fit.residuals[bad].modifiedZ ?? 0)).toBeGreaterThan(3.5);
    expect(fit.inPlane.outliersChecked).toBe(true);
  });

  it('falls back to translation only at a single point, with reasons', () => {
    const fit = fitRelativeMotion(points, readingsOf(motion, [points[0]]));
    const d = predictDisplacement(motion, points[0].y, points[0].z);
    expect(fit.motion.t.x).toBeCloseTo(d.dx, 12);
    expect(fit.motion.t.y).toBeCloseTo(d.dy, 12);
    expect(fit.motion.t.z).toBeCloseTo(d.dz, 12);
    expect(fit.motion.omega).toEqual({ x: 0, y: 0, z: 0 });
    expect(fit.outOfPlane.status).toBe('translationOnly');
    expect(fit.outOfPlane.reason).toMatch(/one point/);
    expect(fit.inPlane.status).toBe('translationOnly');
    expect(fit.inPlane.reason).toMatch(/rotation about x not identifiable/);
    expect(fit.outOfPlane.outliersChecked).toBe(false);
  });

  it('keeps the along-line tilt when fore-aft points lie on one line', () => {
    const top = points.filter((p) => p.z === 1470);
    const readings = [...readingsOf(motion, top, ['foreAft']), ...readingsOf(motion, points, ['lateral', 'vertical'])];
    const fit = fitRelativeMotion(points, readings);
    expect(fit.outOfPlane.status).toBe('partial');
    expect(fit.outOfPlane.reason).toMatch(/one line/);
    // along the top edge the fit reproduces dx exactly
    for (const p of top) expect(predictDisplacement(fit.motion, p.y, p.z).dx).toBeCloseTo(predictDisplacement(motion, p.y, p.z).dx, 9);
    expect(fit.motion.omega.z).toBeCloseTo(motion.omega.z, 12);
    expect(fit.motion.omega.y).toBeCloseTo(0, 12);
    expect(fit.inPlane.status).toBe('full');
  });

  it('reports a missing axis and solves the rest', () => {
    const fit = fitRelativeMotion(points, readingsOf(motion, points, ['lateral']));
    expect(fit.outOfPlane.status).toBe('none');
    expect(fit.inPlane.status).toBe('partial');
    expect(fit.inPlane.reason).toMatch(/no vertical readings/);
    expect(fit.motion.t.y).toBeCloseTo(motion.t.y, 9);
    expect(fit.motion.omega.x).toBeCloseTo(motion.omega.x, 12);
    expect(fit.motion.t.z).toBe(0);
  });

  it('property: reordering readings does not change the fit', () => {
    const normal = seededNormal(3);
    const readings = readingsOf(motion, points).map((r) => ({ ...r, value: r.value + normal() }));
    const reference = fitRelativeMotion(points, readings);
    fc.assert(
      fc.property(fc.shuffledSubarray(readings.map((_, i) => i), { minLength: readings.length, maxLength: readings.length }), (order) => {
        const fit = fitRelativeMotion(points, order.map((i) => readings[i]));
        for (const k of ['x', 'y', 'z'] as const) {
          expectClose(fit.motion.t[k], reference.motion.t[k], 1e-9);
          expectClose(fit.motion.omega[k], reference.motion.omega[k], 1e-9);
        }
        expectClose(fit.residualRms, reference.residualRms, 1e-9);
        expect(fit.outliers.length).toBe(reference.outliers.length);
      }),
      { numRuns: 30 },
    );
  });

  it('property: never returns NaN; bad input throws FlexInputError only', () => {
    const coordinate = fc.double({ min: -2000, max: 2000, noNaN: true });
    const value = fc.oneof(fc.double({ noNaN: false }), fc.double({ min: -200, max: 200, noNaN: true }));
    const axis = fc.constantFrom<Axis>('foreAft', 'lateral', 'vertical');
    fc.assert(
      fc.property(
        fc.array(fc.tuple(coordinate, coordinate), { minLength: 1, maxLength: 6 }),
        fc.array(fc.tuple(fc.nat(5), axis, value), { minLength: 1, maxLength: 20 }),
        (coords, raw) => {
          const pts = coords.map(([y, z], i) => ({ id: `p${i}`, y, z }));
          const readings = raw.map(([i, ax, v]) => ({ pointId: `p${i % pts.length}`, axis: ax, value: v }));
          try {
            const fit = fitRelativeMotion(pts, readings);
            const numbers = [...Object.values(fit.motion.t), ...Object.values(fit.motion.omega), fit.residualRms];
            for (const r of fit.residuals) numbers.push(r.residual, r.predicted, r.modifiedZ ?? 0);
            expect(numbers.every(Number.isFinite)).toBe(true);
          } catch (error) {
            expect(error).toBeInstanceOf(FlexInputError);
          }
        },
      ),
    );
  });

  it('throws FlexInputError naming the field', () => {
    const good = readingsOf(motion, points);
    expect(() => fitRelativeMotion(points, [])).toThrowError(/fitRelativeMotion: readings/);
    expect(() => fitRelativeMotion(points, [{ pointId: 'Z', axis: 'lateral', value: 1 }])).toThrowError(/readings\[0\].pointId/);
    expect(() => fitRelativeMotion(points, [{ pointId: 'A', axis: 'sideways' as Axis, value: 1 }])).toThrowError(/readings\[0\].axis/);
    expect(() => fitRelativeMotion(points, [{ ...good[0], value: NaN }])).toThrowError(FlexInputError);
    expect(() => fitRelativeMotion([...points, points[0]], good)).toThrowError(/repeats gauge point id/);
    expect(() => fitRelativeMotion([{ id: 'A', y: Infinity, z: 0 }], good.slice(0, 1))).toThrowError(/points\[0\].y/);
  });
});
