import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { bootSpan, sealCompressionPercent } from './boot';
import { FlexInputError } from './errors';
import type { RigidMotion } from './types';

const outline = { width: 700, height: 900, cornerRadius: 80, bottomZ: 600 };

function motion(t: Partial<RigidMotion['t']>, omega: Partial<RigidMotion['omega']> = {}): RigidMotion {
  return { t: { x: 0, y: 0, z: 0, ...t }, omega: { x: 0, y: 0, z: 0, ...omega } };
}

describe('sealCompressionPercent', () => {
  it('follows the seal makers’ formula', () => {
    // seal makers' guidance: compression % = (free − compressed) / free × 100
    expect(sealCompressionPercent(20, 15)).toBe(25);
    expect(sealCompressionPercent(40, 20)).toBe(50);
    expect(() => sealCompressionPercent(0, 1)).toThrowError(/sealCompressionPercent: freeHeightMm/);
  });
});

describe('bootSpan', () => {
  it('measures shear as the 3D span across the gap', () => {
    const result = bootSpan({ outline, nominalGapMm: 40, motions: [motion({ y: 30 })] });
    for (const side of ['top', 'bottom', 'left', 'right'] as const) {
      // hand-checked: √(40² + 30²) = 50 at full shear, 40 at rest
      expect(result[side].longestMm).toBeCloseTo(50, 12);
      expect(result[side].shortestMm).toBeCloseTo(40, 12);
      expect(result[side].extensionRatio).toBeCloseTo(1.25, 12);
      expect(result[side].largestShearMm).toBeCloseTo(30, 12);
      expect(result[side].contact).toBe(false);
    }
  });

  it('checks a seal against the fore-aft range with the 25–50 % rule (common practice)', () => {
    const closing = [motion({ x: -10 })];
    // gap 40 → 30 mm. Free height 50: 20 % at 40 mm, below the 25 % minimum (common practice, seal makers' guidance)
    const loose = bootSpan({ outline, nominalGapMm: 40, motions: closing, seal: { freeHeightMm: 50 } });
    expect(loose.top.seal?.follows).toBe(false);
    expect(loose.top.seal?.compressionAtWidestPercent).toBeCloseTo(20, 12);
    expect(loose.top.seal?.reason).toMatch(/compressed only 20 %/);
    // Free height 56: 28.6 % at 40 mm and 46.4 % at 30 mm, inside 25–50 %
    const good = bootSpan({ outline, nominalGapMm: 40, motions: closing, seal: { freeHeightMm: 56 } });
    expect(good.top.seal?.follows).toBe(true);
    expect(good.top.seal?.compressionAtNarrowestPercent).toBeCloseTo((26 / 56) * 100, 12);
    // hand-checked range: [40 / 0.75, 30 / 0.5] = [53.33, 60]
    expect(good.top.sealFreeHeightRangeMm?.min).toBeCloseTo(53.333333, 5);
    expect(good.top.sealFreeHeightRangeMm?.max).toBeCloseTo(60, 12);
  });

  it('says in words when a seal is too small to reach across the gap, never a negative compression', () => {
    // gap 40 → 50 mm (opening by 10). A 15 mm seal cannot touch both faces at any gap: at 50 mm it
    // would be "compressed" (15 − 50) / 15 = −233 %, which means nothing to anyone.
    const small = bootSpan({ outline, nominalGapMm: 40, motions: [motion({ x: 10 })], seal: { freeHeightMm: 15 } });
    expect(small.top.seal?.follows).toBe(false);
    expect(small.top.seal?.reason).not.toMatch(/−|-\d/);
    expect(small.top.seal?.reason).toBe(
      'the seal (free height 15.0 mm) is shorter than the gap it must fill (40.0 mm to 50.0 mm): it does not touch both faces; choose a free height of 66.7 mm to 80.0 mm',
    );
  });

  it('separates the sides under a pitch of the cab', () => {
    // dx = wy·z: the top (z = 1500) opens more than the bottom, whose corner arcs reach z = 680
    const result = bootSpan({ outline, nominalGapMm: 40, motions: [motion({}, { y: 0.01 })] });
    expect(result.top.gapMaxMm).toBeCloseTo(55, 9);
    expect(result.bottom.gapMaxMm).toBeCloseTo(46.8, 9);
    // the left side's top corner arc, sampled every 10 mm, comes within 0.6 mm of the top edge
    expect(result.left.gapMaxMm).toBeCloseTo(55, 1);
    expect(result.top.gapMinMm).toBe(40);
  });

  it('reports contact when the gap closes', () => {
    const result = bootSpan({ outline, nominalGapMm: 20, motions: [motion({ x: -25 })], seal: { freeHeightMm: 30 } });
    expect(result.left.contact).toBe(true);
    expect(result.left.sealFreeHeightRangeMm).toBeNull();
    expect(result.left.seal?.follows).toBe(false);
    expect(result.left.extensionRatio).not.toBeNull();
  });

  it('property: no NaN for any small motion', () => {
    const shift = fc.double({ min: -100, max: 100, noNaN: true });
    const turn = fc.double({ min: -0.05, max: 0.05, noNaN: true });
    fc.assert(
      fc.property(shift, shift, shift, turn, turn, turn, fc.double({ min: 1, max: 200, noNaN: true }), (x, y, z, wx, wy, wz, g) => {
        const result = bootSpan({
          outline,
          nominalGapMm: g,
          motions: [motion({ x, y, z }, { x: wx, y: wy, z: wz })],
          seal: { freeHeightMm: 2 * g },
          stepMm: 25,
        });
        for (const side of Object.values(result)) {
          const numbers = [side.shortestMm, side.longestMm, side.gapMinMm, side.gapMaxMm, side.largestShearMm, side.extensionRatio ?? 0];
          numbers.push(side.seal?.compressionAtWidestPercent ?? 0, side.seal?.compressionAtNarrowestPercent ?? 0);
          expect(numbers.every(Number.isFinite)).toBe(true);
          expect(side.longestMm).toBeGreaterThanOrEqual(side.shortestMm);
        }
      }),
      { numRuns: 30 },
    );
  });

  it('throws FlexInputError for bad input', () => {
    expect(() => bootSpan({ outline, nominalGapMm: 0, motions: [] })).toThrowError(/bootSpan: nominalGapMm/);
    expect(() => bootSpan({ outline, nominalGapMm: 40, motions: [motion({ x: NaN })] })).toThrowError(/motions\[0\].t.x/);
    expect(() => bootSpan({ outline, nominalGapMm: 40, motions: [motion({}, { z: 2 })] })).toThrowError(/small angles/);
    expect(() => bootSpan({ outline, nominalGapMm: 40, motions: [], seal: { freeHeightMm: 50, minCompressionPercent: 60 } })).toThrowError(FlexInputError);
  });
});
