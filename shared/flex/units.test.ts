import { describe, it, expect } from 'vitest';
import { inToMm, mmToIn } from './units';

describe('units', () => {
  it('uses 1 in = 25.4 mm exactly', () => {
    expect(inToMm(1)).toBe(25.4); // NIST SP 811 (2008), Appendix B.8
    expect(mmToIn(203.2)).toBeCloseTo(8, 12); // NIST SP 811 (2008), Appendix B.8
    expect(inToMm(0.25)).toBeCloseTo(6.35, 12); // NIST SP 811: 1/4 in = 6.35 mm
  });

  it('round-trips', () => {
    for (const mm of [0, 1, 12.7, 1500, -42.5]) expect(inToMm(mmToIn(mm))).toBeCloseTo(mm, 10);
  });
});
