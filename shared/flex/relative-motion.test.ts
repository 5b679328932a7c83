import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { fitRelativeMotion } from './relative-motion';
import { perimeterWorst, type OpeningOutline } from './perimeter';
import { predictDisplacement, scaleMotion } from './predict-displacement';
import { DEMO_MOTION_PER_DEG, seededNormal, seededRandom } from './synthetic-session';
import { expectClose } from './expect-close';
import { SIX_POINTS, readingsAt } from './test-fixtures';
import { FlexInputError } from './errors';
import type { Axis, GaugeLocation, GaugeValue, RigidMotion } from './types';

const outline: OpeningOutline = { width: 700, height: 900, cornerRadius: 80, centreY: 0, bottomZ: 600 };

const points: GaugeLocation[] = [
  { id: 'A', y: 320, z: 1470 },
  { id: 'B', y: 0, z: 1470 },
  { id: 'C', y: -320, z: 1470 },
  { id: 'D', y: -320, z: 1050 },
  { id: 'E', y: -320, z: 630 },
  { id: 'F', y: 0, z: 630 },
  { id: 'G', y: 320, z: 630 },
  { id: 'H', y: 320, z: 1050 },
];

const six = SIX_POINTS;

const motion: RigidMotion = { t: { x: 4, y: 60, z: 8 }, omega: { x: 0.012, y: 0.003, z: -0.004 } };

const readingsOf = readingsAt;

function expectMotionClose(actual: RigidMotion, expected: RigidMotion, digitsT: number, digitsOmega = digitsT + 3): void {
  for (const k of ['x', 'y', 'z'] as const) {
    expect(actual.t[k]).toBeCloseTo(expected.t[k], digitsT);
    expect(actual.omega[k]).toBeCloseTo(expected.omega[k], digitsOmega);
  }
}

describe('fitRelativeMotion', () => {
  it('recovers a synthetic rigid motion exactly', () => {
    const fit = fitRelativeMotion(points, readingsOf(motion, points), outline);
    expectMotionClose(fit.motion, motion, 9);
    expect(fit.residualRms).toBeLessThan(1e-9);
    expect(fit.outOfPlane.status).toBe('full');
    expect(fit.inPlane.status).toBe('full');
    expect(fit.outOfPlane.reason).toBeNull();
    expect(fit.outliers).toHaveLength(0);
    expect(fit.residuals).toHaveLength(24);
  });

  it('solves the documented three-point example', () => {
    const fit = fitRelativeMotion(
      [
        { id: 'A', y: 300, z: 700 },
        { id: 'B', y: -300, z: 700 },
        { id: 'C', y: 300, z: 1300 },
      ],
      [
        { pointId: 'A', axis: 'foreAft', value: 2 },
        { pointId: 'B', axis: 'foreAft', value: 2 },
        { pointId: 'C', axis: 'foreAft', value: 8 },
      ],
      outline,
    );
    // hand-checked: A and B (same z) give wz = 0; C is 600 mm above A: wy = (8 − 2) / 600; tx = 2 − 700·wy
    expect(fit.motion.omega.y).toBeCloseTo(0.01, 12);
    expect(fit.motion.omega.z).toBeCloseTo(0, 12);
    expect(fit.motion.t.x).toBeCloseTo(-5, 10);
    expect(fit.outOfPlane.status).toBe('full');
    expect(fit.outOfPlane.outlierCheck).toBe('skipped');
    expect(fit.inPlane.status).toBe('none');
  });

  it('gives the expected residual RMS under seeded noise', () => {
    const normal = seededNormal(42);
    const sd = 0.5;
    const many = Array.from({ length: 24 }, (_, i) => ({ id: `Q${i}`, y: -320 + (i % 6) * 128, z: 630 + Math.floor(i / 6) * 280 }));
    const readings = readingsOf(motion, many).map((r) => ({ ...r, value: r.value + sd * normal() }));
    const fit = fitRelativeMotion(many, readings, outline);
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
    const fit = fitRelativeMotion(points, readings, outline);
    expect(fit.outliers.map((o) => o.index)).toEqual([bad]);
    expect(fit.outliers[0].score).toBeGreaterThan(fit.inPlane.outlierLimit ?? Infinity);
    expect(fit.inPlane.outlierCheck).toBe('checked');
  });

  it('flags the 25 mm misread at six points that least squares smeared over every residual', () => {
    // a(320, 1470) read 27.3 where the others read about 2: the leave-one-out residual of a is 25.5 mm,
    // while its ordinary residual is only 0.417 × that (leverage 0.583, hand-checked: 1/6 + 1/4 + 1/6).
    const values = [27.3, 1.6, 2.4, 1.8, 2.1, 1.9];
    const fit = fitRelativeMotion(
      six,
      six.map((p, i) => ({ pointId: p.id, axis: 'foreAft' as const, value: values[i] })),
      outline,
    );
    expect(fit.outliers.map((o) => o.pointId)).toEqual(['a']);
    expect(fit.outliers[0].residual / (1 - 7 / 12)).toBeCloseTo(25.5, 1);
    expect(fit.outOfPlane.outlierCheck).toBe('checked');
  });

  it('simulation: catches a 10 mm misread at six points in ≥ 95 % of poses and flags pure 0.5 mm noise in ≤ 1 %', () => {
    // Seeded: 2000 poses each way; the motion of each pose is the demo truck's at a random twist of
    // 2–25° either way, read at the six points on all three axes with N(0, 0.5²) reading noise.
    const trials = 2000;
    const uniform = seededRandom(20261);
    const normal = seededNormal(20262);
    const pose = (): GaugeValue[] => {
      const twist = (2 + 23 * uniform()) * (uniform() < 0.5 ? -1 : 1);
      return readingsOf(scaleMotion(DEMO_MOTION_PER_DEG, twist), six).map((r) => ({ ...r, value: r.value + 0.5 * normal() }));
    };
    const caught: Record<Axis, [number, number]> = { foreAft: [0, 0], lateral: [0, 0], vertical: [0, 0] };
    let caughtAlone = 0;
    for (let trial = 0; trial < trials; trial++) {
      const readings = pose();
      const k = Math.floor(uniform() * readings.length);
      readings[k] = { ...readings[k], value: readings[k].value + (uniform() < 0.5 ? -10 : 10) };
      const flagged = fitRelativeMotion(six, readings, outline).outliers.map((o) => o.index);
      caught[readings[k].axis][1]++;
      if (flagged.includes(k)) caught[readings[k].axis][0]++;
      if (flagged.length === 1 && flagged[0] === k) caughtAlone++;
    }
    let falseFlags = 0;
    for (let trial = 0; trial < trials; trial++) if (fitRelativeMotion(six, pose(), outline).outliers.length > 0) falseFlags++;
    const all = caught.foreAft[0] + caught.lateral[0] + caught.vertical[0];
    console.log(
      `outlier rule, 6 points, 10 mm misread: caught ${((100 * all) / trials).toFixed(1)} % of ${trials} poses ` +
        `(fore-aft ${((100 * caught.foreAft[0]) / caught.foreAft[1]).toFixed(1)} %, lateral ${((100 * caught.lateral[0]) / caught.lateral[1]).toFixed(1)} %, ` +
        `vertical ${((100 * caught.vertical[0]) / caught.vertical[1]).toFixed(1)} %; alone ${((100 * caughtAlone) / trials).toFixed(1)} %); ` +
        `pure 0.5 mm noise flagged ${((100 * falseFlags) / trials).toFixed(2)} % of ${trials} poses`,
    );
    expect(all / trials).toBeGreaterThanOrEqual(0.95);
    for (const axis of ['foreAft', 'lateral', 'vertical'] as const) expect(caught[axis][0] / caught[axis][1]).toBeGreaterThanOrEqual(0.95);
    expect(falseFlags / trials).toBeLessThanOrEqual(0.01);
  }, 60_000);

  it('keeps only the translation when the points cover a 30 mm patch of the opening, and says why', () => {
    // A ±0.5 mm tape on a true 2 mm at three points 30 mm apart: fitting rotations would carry the
    // tape's error about 50 times over to the far edge of a 700 × 900 mm opening (−31.9 mm here).
    const tri = [
      { id: 'p', y: 300, z: 1450 },
      { id: 'q', y: 270, z: 1450 },
      { id: 'r', y: 285, z: 1424 },
    ];
    const fit = fitRelativeMotion(
      tri,
      [2.5, 2.0, 1.5].map((value, i) => ({ pointId: tri[i].id, axis: 'foreAft' as const, value })),
      outline,
    );
    expect(fit.outOfPlane.status).toBe('translationOnly');
    expect(fit.outOfPlane.reason).toMatch(
      /too close together for this opening: rotations about y and z would carry a reading's error to its edge (\d+)\.\d times over \(the limit is 10\)/,
    );
    expect(Number(/edge (\d+\.\d) times/.exec(fit.outOfPlane.reason ?? '')?.[1])).toBeGreaterThan(40);
    expect(fit.motion.t.x).toBeCloseTo(2, 12);
    expect(perimeterWorst(fit.motion, outline).foreAft.valueMm).toBeCloseTo(2, 12);
    // the same three points in a 60 × 60 mm opening are enough to fit the tilt
    const small = fitRelativeMotion(
      tri,
      [2.5, 2.0, 1.5].map((value, i) => ({ pointId: tri[i].id, axis: 'foreAft' as const, value })),
      {
        width: 60,
        height: 60,
        cornerRadius: 5,
        centreY: 285,
        bottomZ: 1410,
      },
    );
    expect(small.outOfPlane.status).toBe('full');
    expect(small.outOfPlane.edgeErrorRatio).toBeLessThanOrEqual(10);
  });

  it('carries the fit uncertainty to the outline: the covariance gives the textbook prediction variance', () => {
    const fit = fitRelativeMotion(six, readingsOf(motion, six, ['foreAft']), outline);
    // Montgomery, Peck & Vining (5th ed.), ch. 3, prediction of new observations: Var ŷ(x₀) = σ²·x₀ᵀ(XᵀX)⁻¹x₀; at a gauge point that is its leverage,
    // here 1/6 + (z − z̄)²/Σ(z − z̄)² + y²/Σy² = 7/12 at a (hand-checked)
    const c = fit.outOfPlane.covariance;
    const g = [1, 1470, -320];
    let h = 0;
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) h += g[i] * c[i * 3 + j] * g[j];
    expect(h).toBeCloseTo(7 / 12, 9);
  });

  it('falls back to translation only at a single point, with reasons', () => {
    const fit = fitRelativeMotion(points, readingsOf(motion, [points[0]]), outline);
    const d = predictDisplacement(motion, points[0].y, points[0].z);
    expect(fit.motion.t.x).toBeCloseTo(d.dx, 12);
    expect(fit.motion.t.y).toBeCloseTo(d.dy, 12);
    expect(fit.motion.t.z).toBeCloseTo(d.dz, 12);
    expect(fit.motion.omega).toEqual({ x: 0, y: 0, z: 0 });
    expect(fit.outOfPlane.status).toBe('translationOnly');
    expect(fit.outOfPlane.reason).toMatch(/one point/);
    expect(fit.inPlane.status).toBe('translationOnly');
    expect(fit.inPlane.reason).toMatch(/rotation about x not identifiable/);
    expect(fit.outOfPlane.outlierCheck).toBe('skipped');
  });

  it('keeps the along-line tilt when fore-aft points lie on one line', () => {
    const top = points.filter((p) => p.z === 1470);
    const readings = [...readingsOf(motion, top, ['foreAft']), ...readingsOf(motion, points, ['lateral', 'vertical'])];
    const fit = fitRelativeMotion(points, readings, outline);
    expect(fit.outOfPlane.status).toBe('partial');
    expect(fit.outOfPlane.reason).toMatch(/one line: the tilt across that line would carry a reading's error to the opening's edge without limit/);
    // along the top edge the fit reproduces dx exactly
    for (const p of top) expect(predictDisplacement(fit.motion, p.y, p.z).dx).toBeCloseTo(predictDisplacement(motion, p.y, p.z).dx, 9);
    expect(fit.motion.omega.z).toBeCloseTo(motion.omega.z, 12);
    expect(fit.motion.omega.y).toBeCloseTo(0, 12);
    expect(fit.inPlane.status).toBe('full');
  });

  it('reports a missing axis and solves the rest', () => {
    const fit = fitRelativeMotion(points, readingsOf(motion, points, ['lateral']), outline);
    expect(fit.outOfPlane.status).toBe('none');
    expect(fit.inPlane.status).toBe('partial');
    expect(fit.inPlane.reason).toMatch(/no vertical readings/);
    expect(fit.motion.t.y).toBeCloseTo(motion.t.y, 9);
    expect(fit.motion.omega.x).toBeCloseTo(motion.omega.x, 12);
    expect(fit.motion.t.z).toBe(0);
  });

  it('judges four fore-aft readings for three unknowns only together, and names the reading nothing checks', () => {
    const four = six.slice(0, 4);
    const readings = readingsOf(motion, four, ['foreAft']);
    readings[1] = { ...readings[1], value: readings[1].value + 25 };
    const fit = fitRelativeMotion(four, readings, outline);
    expect(fit.outOfPlane.outlierCheck).toBe('misfitOnly');
    expect(fit.outOfPlane.misfit).toBe(true);
    // b, c and d stand on one vertical line, so a alone sets the tilt about z and nothing checks it
    expect(fit.outOfPlane.outlierNote).toBe(
      'fore-aft readings judged together only (4 readings for 3 unknowns; 5 are needed to single out a misread); the fore-aft reading at a alone fixes part of the fit, so nothing checks it',
    );
  });

  it('judges residuals against a larger reading SD when asked', () => {
    const normal = seededNormal(9);
    const readings = readingsOf(motion, points).map((r) => ({ ...r, value: r.value + 2 * normal() }));
    readings[4] = { ...readings[4], value: readings[4].value + 9 };
    expect(fitRelativeMotion(points, readings, outline, { readingSdMm: 6 }).outliers).toHaveLength(0);
    expect(fitRelativeMotion(points, readings, outline, { readingSdMm: 6 }).inPlane.scatterMm).toBe(6);
  });

  it('property: reordering readings does not change the fit', () => {
    const normal = seededNormal(3);
    const readings = readingsOf(motion, points).map((r) => ({ ...r, value: r.value + normal() }));
    const reference = fitRelativeMotion(points, readings, outline);
    fc.assert(
      fc.property(
        fc.shuffledSubarray(
          readings.map((_, i) => i),
          { minLength: readings.length, maxLength: readings.length },
        ),
        (order) => {
          const fit = fitRelativeMotion(
            points,
            order.map((i) => readings[i]),
            outline,
          );
          for (const k of ['x', 'y', 'z'] as const) {
            expectClose(fit.motion.t[k], reference.motion.t[k], 1e-9);
            expectClose(fit.motion.omega[k], reference.motion.omega[k], 1e-9);
          }
          expectClose(fit.residualRms, reference.residualRms, 1e-9);
          expect(fit.outliers.length).toBe(reference.outliers.length);
        },
      ),
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
            const fit = fitRelativeMotion(pts, readings, outline);
            const numbers = [...Object.values(fit.motion.t), ...Object.values(fit.motion.omega), fit.residualRms, ...fit.residuals];
            for (const o of fit.outliers) numbers.push(o.residual, o.predicted, o.score);
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
    expect(() => fitRelativeMotion(points, [], outline)).toThrowError(/fitRelativeMotion: readings/);
    expect(() => fitRelativeMotion(points, [{ pointId: 'Z', axis: 'lateral', value: 1 }], outline)).toThrowError(/readings\[0\].pointId/);
    expect(() => fitRelativeMotion(points, [{ pointId: 'A', axis: 'sideways' as Axis, value: 1 }], outline)).toThrowError(/readings\[0\].axis/);
    expect(() => fitRelativeMotion(points, [{ ...good[0], value: NaN }], outline)).toThrowError(FlexInputError);
    expect(() => fitRelativeMotion([...points, points[0]], good, outline)).toThrowError(/repeats gauge point id/);
    expect(() => fitRelativeMotion([{ id: 'A', y: Infinity, z: 0 }], good.slice(0, 1), outline)).toThrowError(/points\[0\].y/);
    expect(() => fitRelativeMotion(points, [good[0], good[1], good[0]], outline)).toThrowError(
      /readings\[2\] repeats the reading of point 'A' on axis foreAft/,
    );
    expect(() => fitRelativeMotion(points, good, { ...outline, width: -1 })).toThrowError(/fitRelativeMotion: outline.width/);
    expect(() => fitRelativeMotion(points, good, outline, { readingSdMm: 0 })).toThrowError(/options.readingSdMm/);
  });
});
