import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { linearRegression, rSquared } from 'simple-statistics';
import { linearFit } from './linear-fit';
import { studentTQuantile } from './student-t';
import { FlexInputError } from './errors';
import { expectClose } from './expect-close';

// NIST StRD 'Norris' (public domain), copied into the repository with its source in the header.
const norrisPath = path.join(path.dirname(fileURLToPath(import.meta.url)), 'testdata', 'nist-strd-norris.csv');

function readNorris(): { xs: number[]; ys: number[] } {
  const rows = readFileSync(norrisPath, 'utf8')
    .split('\n')
    .map((line) => line.trim())
    .filter((line) => line !== '' && !line.startsWith('#') && line !== 'y,x');
  const ys = rows.map((row) => Number(row.split(',')[0]));
  const xs = rows.map((row) => Number(row.split(',')[1]));
  return { xs, ys };
}

describe('linearFit', () => {
  it('reproduces the NIST StRD Norris certified values', () => {
    const { xs, ys } = readNorris();
    expect(xs).toHaveLength(36);
    const fit = linearFit(xs, ys, { throughOrigin: false });
    // NIST StRD linear least squares, dataset Norris, certified values (itl.nist.gov/div898/strd)
    expect(Math.abs(fit.intercept - -0.262323073774029)).toBeLessThan(1e-9);
    expect(Math.abs(fit.slope - 1.00211681802045)).toBeLessThan(1e-9);
    expect(Math.abs(fit.residualSd - 0.884796396144373)).toBeLessThan(1e-9);
    expect(Math.abs(fit.rSquared - 0.999993745883712)).toBeLessThan(1e-9);
    expect(fit.df).toBe(34); // NIST StRD Norris: residual df 34
  });

  it('agrees with simple-statistics least squares on random data', () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.double({ min: -50, max: 50, noNaN: true }), fc.double({ min: -500, max: 500, noNaN: true })), {
          minLength: 3,
          maxLength: 40,
        }),
        (pairs) => {
          const xs = pairs.map((p) => p[0]);
          const ys = pairs.map((p) => p[1]);
          const spread = Math.max(...xs) - Math.min(...xs);
          fc.pre(spread > 1e-3);
          const fit = linearFit(xs, ys, { throughOrigin: false });
          // simple-statistics linearRegression / rSquared (independent implementation)
          const reference = linearRegression(pairs);
          expectClose(fit.slope, reference.m, 1e-6);
          expectClose(fit.intercept, reference.b, 1e-6);
          const r2 = rSquared(pairs, (x) => reference.b + reference.m * x);
          if (Number.isFinite(r2)) expectClose(fit.rSquared, Math.max(0, r2), 1e-6);
        },
      ),
    );
  });

  it('fits through the origin by default with the textbook leverage and bound', () => {
    const xs = [2, 4, 6, 8];
    const ys = [9, 21, 29, 41];
    const fit = linearFit(xs, ys);
    // hand-checked: Σxy = 18 + 84 + 174 + 328 = 604, Σx² = 120, slope = 5.0333…
    expect(fit.slope).toBeCloseTo(604 / 120, 12);
    expect(fit.intercept).toBe(0);
    expect(fit.df).toBe(3);
    const ssr = xs.reduce((sum, x, i) => sum + (ys[i] - fit.slope * x) ** 2, 0);
    expect(fit.residualSd).toBeCloseTo(Math.sqrt(ssr / 3), 12);
    expect(fit.leverage(10)).toBeCloseTo(100 / 120, 12);
    // Draper & Smith §3.1: ŷ + t(0.95, df)·s·√(1 + h)
    expect(fit.upperPredictionBound(10, 0.95)).toBeCloseTo(fit.slope * 10 + studentTQuantile(0.95, 3) * fit.residualSd * Math.sqrt(1 + 100 / 120), 12);
    expect(fit.upperPredictionBound(10, 0.95)).toBeGreaterThan(fit.predict(10));
  });

  it('reports R² = 1 and a zero-width bound for exact data', () => {
    const fit = linearFit([1, 2, 3], [3, 6, 9]);
    expect(fit.slope).toBe(3);
    expect(fit.rSquared).toBe(1);
    expect(fit.upperPredictionBound(5, 0.99)).toBeCloseTo(15, 12);
  });

  it('weights each point by 1/x² for scatter proportional to x: the fit of the ratios, by hand and by transformed least squares', () => {
    const xs = [4, 8, 12, 16, 20];
    const ys = [37, 70, 111, 141, 183];
    const fit = linearFit(xs, ys, { scatter: 'proportional' });
    const r = ys.map((y, i) => y / xs[i]);
    const mean = r.reduce((a, b) => a + b, 0) / 5;
    // Montgomery, Peck & Vining (5th ed.), ch. 5, weighted least squares: dividing y = βx + ε, Var ε ∝ x², by x gives y/x = β + ε/x with constant variance
    expect(fit.slope).toBeCloseTo(mean, 12);
    expect(fit.residualSd).toBeCloseTo(Math.sqrt(r.reduce((a, v) => a + (v - mean) ** 2, 0) / 4), 12);
    expect(fit.df).toBe(4);
    // with an intercept: y/x = β + α·(1/x), an ordinary line in u = 1/x (simple-statistics, independent)
    const withIntercept = linearFit(xs, ys, { scatter: 'proportional', throughOrigin: false });
    const reference = linearRegression(xs.map((x, i) => [1 / x, ys[i] / x]));
    expectClose(withIntercept.slope, reference.b, 1e-9);
    expectClose(withIntercept.intercept, reference.m, 1e-9);
  });

  it('refuses x ≤ 0 with proportional scatter, and an unknown scatter model', () => {
    expect(() => linearFit([0, 1, 2], [0, 1, 2], { scatter: 'proportional' })).toThrowError(
      /linearFit: xs\[0\] must be greater than 0 with proportional scatter/,
    );
    expect(() => linearFit([1, 2, 3], [1, 2, 3], { scatter: 'cubic' as never })).toThrowError(/options.scatter/);
  });

  it('throws FlexInputError for unusable input', () => {
    expect(() => linearFit([1], [2])).toThrowError(/linearFit: xs needs at least 2 points/);
    expect(() => linearFit([1, 2], [2, 3], { throughOrigin: false })).toThrowError(FlexInputError);
    expect(() => linearFit([0, 0, 0], [1, 2, 3])).toThrowError(/all 0/);
    expect(() => linearFit([1, 1, 1], [1, 2, 3], { throughOrigin: false })).toThrowError(/all equal/);
    expect(() => linearFit([1, 2, NaN], [1, 2, 3])).toThrowError(/xs\[2\]/);
    expect(() => linearFit([1, 2], [1, 2, 3])).toThrowError(/ys must have the same length/);
    expect(() => linearFit([1, 2, 3], [1, 2, 3]).predict(NaN)).toThrowError(FlexInputError);
  });
});
