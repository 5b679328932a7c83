import { describe, expect, it } from 'vitest';
import { sealReason } from './seal-reason';
import type { LengthWords } from './length-words';

const seal = (freeHeightMm: number) => ({ freeHeightMm, minCompressionPercent: 25, maxCompressionPercent: 50 });
const inches: LengthWords = {
  length: (mm) => `${(mm / 25.4).toFixed(2)} in`,
  fine: (mm) => `${(mm / 25.4).toFixed(3)} in`,
  increment: (mm) => `${mm / 25.4} in`,
};

describe('sealReason', () => {
  it('says a seal follows, with its compression at both ends (by hand: (56 − 40)/56 = 28.6 %, (56 − 30)/56 = 46.4 %)', () => {
    expect(sealReason(seal(56), 30, 40)).toBe('stays within 25–50 % compression over the fore-aft range (29 % at the widest gap, 46 % at the narrowest)');
  });

  it('says a loose or crushed seal in words, with the free heights that would follow ([40/0.75, 30/0.5] = [53.3, 60.0])', () => {
    expect(sealReason(seal(50), 30, 40)).toBe(
      'at the widest gap (40.0 mm) it is compressed only 20 %, less than the 25 % it needs to seal; choose a free height of 53.3 mm to 60.0 mm',
    );
    expect(sealReason(seal(70), 30, 40)).toBe(
      'at the narrowest gap (30.0 mm) it is compressed 57 %, more than the 50 % it takes without damage; choose a free height of 53.3 mm to 60.0 mm',
    );
  });

  it('never prints a negative compression for a seal shorter than the gap, and writes lengths in the reader’s unit', () => {
    const text = sealReason(seal(15), 40, 50, inches);
    expect(text).toBe(
      'the seal (free height 0.59 in) is shorter than the gap it must fill (1.57 in to 1.97 in): it does not touch both faces; choose a free height of 2.62 in to 3.15 in',
    );
  });

  it('says when no seal can follow: the gap closes fully, or the range is wider than the compression allows', () => {
    expect(sealReason(seal(50), -2, 40)).toMatch(/^the gap closes fully \(down to -2\.0 mm\)/);
    // widest 100 needs ≥ 133.3, narrowest 20 allows ≤ 40: nothing between
    expect(sealReason(seal(150), 20, 100)).toMatch(/no free height follows this range at 25–50 % compression$/);
  });
});
