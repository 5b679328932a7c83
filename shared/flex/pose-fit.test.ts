import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { fitPoseParts, poseBuffer } from './pose-fit';
import { foreAftBuffer as foreAft } from './test-fixtures';
import { outlineCorners } from './perimeter';
import { expectClose } from './expect-close';

const outline = { width: 700, height: 900, cornerRadius: 80, centreY: 0, bottomZ: 600 };
const corners = outlineCorners(outline);

/** Independent reference: ordinary least squares by the normal equations, solved by Gauss–Jordan elimination. */
function referenceFit(rows: number[][], values: number[]): { beta: number[]; inverse: number[][] } {
  const p = rows[0].length;
  const a = Array.from({ length: p }, (_, i) => [
    ...Array.from({ length: p }, (_, j) => rows.reduce((s, r) => s + r[i] * r[j], 0)),
    ...Array.from({ length: p }, (_, j) => (i === j ? 1 : 0)),
  ]);
  for (let c = 0; c < p; c++) {
    let pivot = c;
    for (let r = c + 1; r < p; r++) if (Math.abs(a[r][c]) > Math.abs(a[pivot][c])) pivot = r;
    [a[c], a[pivot]] = [a[pivot], a[c]];
    const d = a[c][c];
    for (let j = 0; j < 2 * p; j++) a[c][j] /= d;
    for (let r = 0; r < p; r++) {
      if (r === c) continue;
      const f = a[r][c];
      for (let j = 0; j < 2 * p; j++) a[r][j] -= f * a[c][j];
    }
  }
  const inverse = a.map((row) => row.slice(p));
  const xty = Array.from({ length: p }, (_, i) => rows.reduce((s, r, k) => s + r[i] * values[k], 0));
  return { beta: inverse.map((row) => row.reduce((s, v, j) => s + v * xty[j], 0)), inverse };
}

function quad(m: number[][], g: number[]): number {
  return g.reduce((s, gi, i) => s + gi * g.reduce((t, gj, j) => t + m[i][j] * gj, 0), 0);
}

const coordinate = fc.tuple(fc.double({ min: -340, max: 340, noNaN: true }), fc.double({ min: 620, max: 1480, noNaN: true }));

describe('fitPoseParts', () => {
  it('property: the out-of-plane fit, leverages, deleted SDs and covariance match an independent least squares and refits', () => {
    fc.assert(
      fc.property(
        fc.array(coordinate, { minLength: 6, maxLength: 10 }),
        fc.array(fc.double({ min: -20, max: 20, noNaN: true }), { minLength: 10, maxLength: 10 }),
        (points, noise) => {
          const values = points.map(([y, z], i) => 3 + 0.004 * z - 0.002 * y + noise[i]);
          const b = foreAft(points, values);
          const fit = fitPoseParts(b, corners);
          // the design must be well spread for the full model, and for every leave-one-out refit
          fc.pre(fit.outOfPlane.status === 'full' && Array.from(b.leverage).every((h) => h < 0.95));
          // dx = tx + wy·z − wz·y: columns (1, z, −y)
          const rows = points.map(([y, z]) => [1, z, -y]);
          const ref = referenceFit(rows, values);
          expectClose(fit.tx, ref.beta[0], 1e-7);
          expectClose(fit.wy, ref.beta[1], 1e-7);
          expectClose(fit.wz, ref.beta[2], 1e-7);
          const n = points.length;
          const ssr = values.reduce((s, v, i) => s + (v - ref.beta.reduce((t, bj, j) => t + bj * rows[i][j], 0)) ** 2, 0);
          for (let i = 0; i < n; i++) {
            // Montgomery, Peck & Vining (5th ed.), ch. 3, the hat matrix: h_ii = x_iᵀ(XᵀX)⁻¹x_i
            expectClose(b.leverage[i], quad(ref.inverse, rows[i]), 1e-7);
            // leave-one-out by brute force: refit without reading i (Montgomery, Peck & Vining §4.2.1: s₍ᵢ₎ is the SD of that refit)
            const others = rows.filter((_, k) => k !== i);
            const left = referenceFit(
              others,
              values.filter((_, k) => k !== i),
            );
            const ssrLeft = others.reduce((s, r, k) => s + (values.filter((_, m) => m !== i)[k] - left.beta.reduce((t, bj, j) => t + bj * r[j], 0)) ** 2, 0);
            expectClose(b.deletedSd[i], Math.sqrt(ssrLeft / (n - 1 - 3)), 1e-6);
            // the deleted residual e/(1 − h) is the reading less the prediction of the refit without it
            const deleted = values[i] - left.beta.reduce((t, bj, j) => t + bj * rows[i][j], 0);
            expectClose(b.standardized[i] * Math.sqrt(1 - b.leverage[i]), deleted * (1 - b.leverage[i]), 1e-6);
          }
          expectClose(fit.outOfPlane.ssr, ssr, 1e-6);
          for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) expectClose(fit.outOfPlane.covariance[i * 3 + j], ref.inverse[i][j], 1e-7);
        },
      ),
      { numRuns: 40 },
    );
  });

  it('fits lateral and vertical readings together for ty, tz and the roll wx, with the textbook leverages', () => {
    const b = poseBuffer(6);
    const motion = { ty: 40, tz: 6, wx: 0.01 };
    const layout: [number, number, number][] = [
      [1, 300, 1400],
      [1, -300, 800],
      [1, 0, 1100],
      [2, 300, 1400],
      [2, -300, 800],
      [2, 0, 1100],
    ];
    layout.forEach(([axis, y, z], i) => {
      b.axis[i] = axis;
      b.y[i] = y;
      b.z[i] = z;
      b.value[i] = axis === 1 ? motion.ty - motion.wx * z : motion.tz + motion.wx * y;
    });
    b.value[2] += 1;
    const fit = fitPoseParts(b, corners);
    // columns (ty, tz, wx): lateral (1, 0, −z), vertical (0, 1, y)
    const rows = layout.map(([axis, y, z]) => (axis === 1 ? [1, 0, -z] : [0, 1, y]));
    const ref = referenceFit(rows, Array.from(b.value));
    expectClose(fit.ty, ref.beta[0], 1e-9);
    expectClose(fit.tz, ref.beta[1], 1e-9);
    expectClose(fit.wx, ref.beta[2], 1e-9);
    for (let i = 0; i < 6; i++) expectClose(b.leverage[i], quad(ref.inverse, rows[i]), 1e-9);
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) expectClose(fit.inPlane.covariance[i * 3 + j], ref.inverse[i][j], 1e-9);
    expect(fit.inPlane.status).toBe('full');
    expect(fit.outOfPlane.status).toBe('none');
  });

  it('falls back from the full model to the line, then to the translation, as the points bunch up', () => {
    // three points on one horizontal line: the tilt across it cannot be found
    const line = fitPoseParts(
      foreAft(
        [
          [-300, 1400],
          [0, 1400],
          [300, 1400],
        ],
        [1, 2, 3],
      ),
      corners,
    );
    expect(line.outOfPlane.status).toBe('partial');
    expect(line.outOfPlane.limitation).toBe('line');
    expect(line.outOfPlane.refusedEdgeErrorRatio).toBeNull();
    expect(line.wz).toBeCloseTo(-1 / 300, 12);
    // a 30 mm patch: rotations would magnify a reading's error about 50 times at the far corner
    const patch = fitPoseParts(
      foreAft(
        [
          [300, 1450],
          [270, 1450],
          [285, 1424],
        ],
        [2.5, 2, 1.5],
      ),
      corners,
    );
    expect(patch.outOfPlane.status).toBe('translationOnly');
    expect(patch.outOfPlane.limitation).toBe('spread');
    expect(patch.outOfPlane.refusedEdgeErrorRatio).toBeGreaterThan(40);
    expect(patch.tx).toBeCloseTo(2, 12);
    // one point read twice (it cannot be: the caller refuses duplicates) is still only a translation
    expect(fitPoseParts(foreAft([[0, 1000]], [4]), corners).outOfPlane.limitation).toBe('onePoint');
  });

  it('judges identifiability by the edge leverage at the opening corners: √h ≤ 10', () => {
    const b = foreAft(
      [
        [-320, 1470],
        [320, 1470],
        [-320, 630],
        [320, 630],
      ],
      [0, 0, 0, 0],
    );
    const fit = fitPoseParts(b, corners);
    // hand-checked: 4 corner points, h(q) = 1/4 + a²/Σa² + c²/Σc² at the corner (350, 1500): a = 450, c = −350
    const expected = Math.sqrt(1 / 4 + 450 ** 2 / (4 * 420 ** 2) + 350 ** 2 / (4 * 320 ** 2));
    expect(fit.outOfPlane.edgeErrorRatio).toBeCloseTo(expected, 12);
  });
});
