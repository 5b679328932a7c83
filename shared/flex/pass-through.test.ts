import { describe, expect, it } from 'vitest';
import { DEFAULT_PASS_THROUGH_ALLOWANCES, passThroughOptions, sealFollowRange, startingSealFreeHeight, type PassThroughInput } from './pass-through';
import { FlexInputError } from './errors';

// Worked by hand (calculator), the example the desk's comparison follows:
// Opening 600 × 800 mm, corner radius 50 mm; nominal fore-aft gap 80 mm. Envelope: the gap opens by
// 20 and closes by 10, lateral ±60, vertical ±15. Allowances (common practice defaults): overlap
// margin 10, slack 10 %, seam 15, flange 40, fold depth 25; minimum clear opening 450 × 500.
//
// Frames: overlap left/right = 60 + 10 = 70, top/bottom = 15 + 10 = 25.
//   clear width 600 − 2·70 = 460, height 800 − 2·25 = 750; lost = 1 − 460·750 / (600·800)
//   = 1 − 345 000 / 480 000 = 28.125 %. Meets 450 × 500.
//   Gap 80 − 10 = 70 to 80 + 20 = 100. Seal at 25–50 %: free heights 100 / 0.75 = 133.33 to
//   70 / 0.5 = 140; middle 136.67 → 135 (nearest 5, inside). A 135 mm seal: (135 − 100)/135 = 25.93 %
//   at the widest gap, (135 − 70)/135 = 48.15 % at the narrowest: it follows.
// Boot: shortest 80 − 10 = 70; longest √(100² + 60² + 15²) = √13 825 = 117.57976; ratio 1.679711.
//   Fabric across the gap 117.57976 × 1.1 = 129.33774; flat length + 2·40 = 209.3377.
//   Top panel edge (600 − 2·50) + π·50/2 = 500 + 78.5398 = 578.5398; flat width + 2·15 = 608.5398.
//   Left panel edge (800 − 100) + 78.5398 = 778.5398; flat width 808.5398.
//   Fold up 129.3377 − 70 = 59.3377; one 25 mm fold takes 50 → ⌈1.187⌉ = 2 folds.
//   Clear passage (600 − 60) × (800 − 15) = 540 × 785; lost 1 − 423 900 / 480 000 = 11.6875 %.
// Both: boot inside the frames' clear opening 460 × 750 (corner radius 50 − 70 → 0):
//   top panel edge 460, flat width 490; left edge 750, flat width 780.
//   Clear passage (460 − 60) × (750 − 15) = 400 × 735; lost 1 − 294 000 / 480 000 = 38.75 %;
//   50 mm narrower than the 450 mm minimum.
const example: PassThroughInput = {
  opening: { widthMm: 600, heightMm: 800, cornerRadiusMm: 50 },
  nominalGapMm: 80,
  movement: { foreAftOpeningMm: 20, foreAftClosingMm: 10, lateralMm: 60, verticalMm: 15 },
  allowances: DEFAULT_PASS_THROUGH_ALLOWANCES,
  seal: null,
};

describe('passThroughOptions', () => {
  it('gives the frames’ overlap, clear opening, % lost and seal range of the hand-worked example', () => {
    const { frames } = passThroughOptions(example);
    expect(frames.overlapMm).toEqual({ top: 25, bottom: 25, left: 70, right: 70 });
    expect(frames.clear).toMatchObject({ widthMm: 460, heightMm: 750, meetsMinimum: true, shortOfWidthMm: 0 });
    expect(frames.clear.lostPercent).toBeCloseTo(28.125, 9);
    expect([frames.gapMinMm, frames.gapMaxMm]).toEqual([70, 100]);
    expect(frames.sealFreeHeightRangeMm!.min).toBeCloseTo(133.3333, 4);
    expect(frames.sealFreeHeightRangeMm!.max).toBeCloseTo(140, 9);
    expect(startingSealFreeHeight(frames.sealFreeHeightRangeMm)).toBe(135);
    expect(frames.seal).toBeNull();

    const sealed = passThroughOptions({ ...example, seal: { freeHeightMm: 135, minCompressionPercent: 25, maxCompressionPercent: 50 } }).frames.seal!;
    expect(sealed.compressionAtWidestPercent).toBeCloseTo(25.926, 3);
    expect(sealed.compressionAtNarrowestPercent).toBeCloseTo(48.148, 3);
    expect(sealed.follows).toBe(true);
    // A 120 mm seal is compressed only 16.7 % at the widest gap: it leaves the far face.
    expect(passThroughOptions({ ...example, seal: { freeHeightMm: 120, minCompressionPercent: 25, maxCompressionPercent: 50 } }).frames.seal!.follows).toBe(
      false,
    );
  });

  it('gives the boot’s spans, extension ratio, cut panels and folds of the hand-worked example', () => {
    const { boot } = passThroughOptions(example);
    const top = boot.panels.top;
    expect(top.shortestSpanMm).toBe(70);
    expect(top.longestSpanMm).toBeCloseTo(117.5798, 4);
    expect(top.extensionRatio!).toBeCloseTo(1.67971, 5);
    expect(top.flatLengthMm).toBeCloseTo(209.3377, 4);
    expect(top.edgeLengthMm).toBeCloseTo(578.5398, 4);
    expect(top.flatWidthMm).toBeCloseTo(608.5398, 4);
    expect(boot.panels.left.flatWidthMm).toBeCloseTo(808.5398, 4);
    expect(top.foldUpMm).toBeCloseTo(59.3377, 4);
    expect(top.folds).toBe(2);
    expect(boot.clear).toMatchObject({ widthMm: 540, heightMm: 785, meetsMinimum: true });
    expect(boot.clear.lostPercent).toBeCloseTo(11.6875, 9);
    expect(boot.contact).toBe(false);
  });

  it('puts the boot inside the frames for both, and says the clear passage is below the minimum', () => {
    const { both } = passThroughOptions(example);
    expect(both.boot.panels.top.edgeLengthMm).toBeCloseTo(460, 9);
    expect(both.boot.panels.top.flatWidthMm).toBeCloseTo(490, 9);
    expect(both.boot.panels.left.flatWidthMm).toBeCloseTo(780, 9);
    expect(both.boot.clear).toMatchObject({ widthMm: 400, heightMm: 735, meetsMinimum: false, shortOfWidthMm: 50, shortOfHeightMm: 0 });
    expect(both.boot.clear.lostPercent).toBeCloseTo(38.75, 9);
  });

  it('says where the gap closes fully and where no seal can follow', () => {
    const closed = passThroughOptions({ ...example, movement: { ...example.movement, foreAftClosingMm: 80 } });
    expect(closed.boot.contact).toBe(true);
    expect(closed.boot.panels.top.extensionRatio).toBeNull();
    expect(closed.frames.sealFreeHeightRangeMm).toBeNull();
    // Gap 50 to 100: 133.3 needed at the widest, at most 100 at the narrowest.
    expect(sealFollowRange(50, 100, 25, 50)).toBeNull();
    expect(startingSealFreeHeight(null)).toBeNull();
  });

  it('refuses input it cannot use, naming the field', () => {
    expect(() => passThroughOptions({ ...example, nominalGapMm: 0 })).toThrow(FlexInputError);
    expect(() => passThroughOptions({ ...example, movement: { ...example.movement, lateralMm: -1 } })).toThrow(/movement\.lateralMm/);
    expect(() => passThroughOptions({ ...example, allowances: { ...example.allowances, foldDepthMm: 0 } })).toThrow(/allowances\.foldDepthMm/);
  });
});
