import { describe, it, expect } from 'vitest';
import { packFit } from './fit-summary';
import { judgeOutliers } from './outlier-rule';
import { fitPoseParts, poseBuffer } from './pose-fit';
import { outlineCorners } from './perimeter';
import { normalQuantile } from './normal';

const corners = outlineCorners({ width: 700, height: 900, cornerRadius: 80, centreY: 0, bottomZ: 600 });

/** Packs readings [axis code, y, z, value, point id] the way fitRelativeMotion and designEnvelope do. */
function packed(readings: [number, number, number, number, string][], scatter = 0.5) {
  const b = poseBuffer(readings.length);
  readings.forEach(([axis, y, z, value], i) => {
    b.axis[i] = axis;
    b.y[i] = y;
    b.z[i] = z;
    b.value[i] = value;
  });
  const core = fitPoseParts(b, corners);
  const judgement = judgeOutliers(b, core, { outOfPlane: scatter, inPlane: scatter }, (t) => normalQuantile(1 - 0.01 / (2 * t)));
  return packFit(b, core, judgement, (i) => ({ pointId: readings[i][4], axis: (['foreAft', 'lateral', 'vertical'] as const)[readings[i][0]], index: i }));
}

describe('packFit', () => {
  it('says why a part is limited, in the crew’s words, the same for the same layout', () => {
    const onlyLateral = packed([
      [1, 0, 700, 10, 'A'],
      [1, 0, 1400, 3, 'B'],
      [1, 0, 1050, 6.5, 'C'],
    ]);
    expect(onlyLateral.outOfPlane.reason).toBe('no fore-aft readings: out-of-plane motion set to 0');
    expect(onlyLateral.inPlane.status).toBe('partial');
    expect(onlyLateral.inPlane.reason).toBe('no vertical readings: tz set to 0');
    const level = packed([
      [1, -300, 1000, 4, 'A'],
      [1, 300, 1000, 4.2, 'B'],
      [2, -300, 1000, 1, 'A'],
    ]);
    // lateral readings at one height and a single vertical reading: nothing sets the roll
    expect(level.inPlane.reason).toBe(
      'rotation about x not identifiable: needs lateral readings at different heights or vertical readings at different lateral positions; set to 0',
    );
    expect(level.motion.omega.x).toBe(0);
  });

  it('reports residuals in the input order, their RMS per part, the judged scatter and the limit', () => {
    const fit = packed([
      [0, 320, 1470, 27.3, 'a'],
      [0, -320, 1470, 1.6, 'b'],
      [0, -320, 1050, 2.4, 'c'],
      [0, -320, 630, 1.8, 'd'],
      [0, 320, 630, 2.1, 'e'],
      [0, 320, 1050, 1.9, 'f'],
    ]);
    expect(fit.residuals).toHaveLength(6);
    expect(fit.outOfPlane.residualRms).toBeCloseTo(Math.sqrt(fit.residuals.reduce((s, r) => s + r * r, 0) / 6), 12);
    expect(fit.outOfPlane.residualSdMm).toBeCloseTo(Math.sqrt(fit.residuals.reduce((s, r) => s + r * r, 0) / 3), 12);
    expect(fit.outOfPlane.scatterMm).toBe(0.5);
    expect(fit.outOfPlane.outlierLimit).toBeCloseTo(normalQuantile(1 - 0.01 / 12), 12);
    expect(fit.outliers).toEqual([expect.objectContaining({ index: 0, pointId: 'a', axis: 'foreAft', value: 27.3 })]);
    expect(fit.outliers[0].predicted + fit.outliers[0].residual).toBeCloseTo(27.3, 12);
  });
});
