import { describe, it, expect } from 'vitest';
import { judgeOutliers } from './outlier-rule';
import { fitPoseParts } from './pose-fit';
import { foreAftBuffer as foreAft } from './test-fixtures';
import { outlineCorners } from './perimeter';
import { normalQuantile } from './normal';

const corners = outlineCorners({ width: 700, height: 900, cornerRadius: 80, centreY: 0, bottomZ: 600 });
const bonferroni = (tests: number) => normalQuantile(1 - 0.01 / (2 * tests));

const six: [number, number][] = [
  [320, 1470],
  [-320, 1470],
  [-320, 1050],
  [-320, 630],
  [320, 630],
  [320, 1050],
];

describe('judgeOutliers', () => {
  it('scores each reading by its deleted residual over its standard error, the reading SD or s₍ᵢ₎ whichever is larger', () => {
    const b = foreAft(six, [27.3, 1.6, 2.4, 1.8, 2.1, 1.9]);
    const fit = fitPoseParts(b, corners);
    const judgement = judgeOutliers(b, fit, { outOfPlane: 0.5, inPlane: 0.5 }, bonferroni);
    for (let i = 0; i < 6; i++) {
      const expected = Math.abs(b.residual[i]) / (Math.sqrt(1 - b.leverage[i]) * Math.max(0.5, b.deletedSd[i]));
      expect(b.score[i]).toBeCloseTo(expected, 12);
    }
    expect(judgement.flagged).toEqual([0]);
    // 6 readings judged: z(1 − 0.01/12) (Bonferroni outlier test, Kutner, Nachtsheim, Neter & Li §10.2)
    expect(judgement.outOfPlane.limit).toBeCloseTo(normalQuantile(1 - 0.01 / 12), 12);
    expect(judgement.outOfPlane.check).toBe('checked');
  });

  it('does not flag the others with the misread: their s₍ᵢ₎ carries it', () => {
    const b = foreAft(six, [27.3, 1.6, 2.4, 1.8, 2.1, 1.9]);
    judgeOutliers(b, fitPoseParts(b, corners), { outOfPlane: 0.5, inPlane: 0.5 }, bonferroni);
    for (let i = 1; i < 6; i++) expect(b.deletedSd[i]).toBeGreaterThan(5);
  });

  it('judges a part with one reading to spare only as a whole, and one with none not at all', () => {
    const four = foreAft(six.slice(0, 4), [1, 2, 3, 40]);
    const misfit = judgeOutliers(four, fitPoseParts(four, corners), { outOfPlane: 0.5, inPlane: 0.5 }, bonferroni);
    expect(misfit.outOfPlane.check).toBe('misfitOnly');
    expect(misfit.outOfPlane.misfit).toBe(true);
    expect(misfit.flagged).toEqual([]);
    expect(Array.from(four.score).every(Number.isNaN)).toBe(true);
    // with one reading to spare the standardized residuals are all equal in size (one residual direction)
    const sizes = Array.from(four.standardized)
      .filter((r) => !Number.isNaN(r))
      .map(Math.abs);
    for (const size of sizes) expect(size).toBeCloseTo(sizes[0], 9);
    const three = foreAft(six.slice(0, 3), [1, 2, 30]);
    const none = judgeOutliers(three, fitPoseParts(three, corners), { outOfPlane: 0.5, inPlane: 0.5 }, bonferroni);
    expect(none.outOfPlane.check).toBe('skipped');
    expect(none.outOfPlane.limit).toBeNull();
  });

  it('holds the scores against a larger reading SD when the session scatters more', () => {
    const b = foreAft(six, [9.3, 1.6, 2.4, 1.8, 2.1, 1.9]);
    const fit = fitPoseParts(b, corners);
    expect(judgeOutliers(b, fit, { outOfPlane: 0.5, inPlane: 0.5 }, bonferroni).flagged).toEqual([0]);
    expect(judgeOutliers(b, fit, { outOfPlane: 2.5, inPlane: 0.5 }, bonferroni).flagged).toEqual([]);
  });

  it('judges into a reused judgement exactly as into a fresh one: nothing of the previous pose is left', () => {
    const flagged = foreAft(six, [27.3, 1.6, 2.4, 1.8, 2.1, 1.9]);
    const misfit = foreAft(six.slice(0, 4), [1, 2, 3, 40]);
    const skipped = foreAft(six.slice(0, 3), [1, 2, 30]);
    const judgement = judgeOutliers(flagged, fitPoseParts(flagged, corners), { outOfPlane: 0.5, inPlane: 0.5 }, bonferroni);
    const reused = judgeOutliers(misfit, fitPoseParts(misfit, corners), { outOfPlane: 0.7, inPlane: 0.5 }, bonferroni, judgement);
    expect(reused).toBe(judgement);
    expect(reused).toEqual(judgeOutliers(misfit, fitPoseParts(misfit, corners), { outOfPlane: 0.7, inPlane: 0.5 }, bonferroni));
    expect(reused.flagged).toEqual([]);
    expect(reused.outOfPlane.misfit).toBe(true);
    const again = judgeOutliers(skipped, fitPoseParts(skipped, corners), { outOfPlane: 0.5, inPlane: 0.5 }, bonferroni, reused);
    expect(again).toEqual(judgeOutliers(skipped, fitPoseParts(skipped, corners), { outOfPlane: 0.5, inPlane: 0.5 }, bonferroni));
    expect(again.outOfPlane.misfit).toBe(false);
    expect(again.outOfPlane.misfitMm).toBeNull();
  });
});
