import { describe, expect, it } from 'vitest';
import { formatDeg, formatLength, formatLengthValue, formatPercent, formatRatio, formatSlope, formatSlopeValue, formatTimestamp } from './format';

describe('format', () => {
  it('prints lengths with 1 decimal in mm and 2 in inches (1 in = 25.4 mm exactly, NIST SP 811 B.8)', () => {
    expect(formatLength(95, 'mm')).toBe('95.0 mm');
    expect(formatLengthValue(95, 'in')).toBe('3.74'); // 95 / 25.4 = 3.7402
    expect(formatLengthValue(6.35, 'in')).toBe('0.25');
    expect(formatLengthValue(-12.34, 'mm')).toBe('-12.3');
  });

  it('never prints a negative zero', () => {
    expect(formatLengthValue(-0.04, 'mm')).toBe('0.0');
    expect(formatDeg(-0.01)).toBe('0.0°');
  });

  it('prints slopes, percentages, ratios and timestamps', () => {
    expect(formatSlope(7.456, 'mm')).toBe('7.46 mm/°');
    expect(formatSlopeValue(25.4, 'in')).toBe('1.000');
    expect(formatSlopeValue(null, 'mm')).toBe('—');
    expect(formatPercent(0.15)).toBe('15 %');
    expect(formatRatio(1.2345)).toBe('1.23');
    expect(formatRatio(null)).toBe('—');
    expect(formatTimestamp('2026-11-20T15:30:00.000Z')).toBe('2026-11-20 15:30 UTC');
  });
});

describe('inches as a tape reads them', () => {
  it('gives the nearest 1/16 in (1 in = 25.4 mm exactly, NIST SP 811 B.8)', async () => {
    const { formatInchFraction, formatBuildLength } = await import('./format');
    expect(formatInchFraction(184.15)).toBe('7 1/4 in'); // 7.25 in
    expect(formatInchFraction(7.9375)).toBe('5/16 in'); // 0.3125 in
    expect(formatInchFraction(-34.925)).toBe('−1 3/8 in'); // 1.375 in
    expect(formatInchFraction(25.4)).toBe('1 in');
    expect(formatInchFraction(0.5)).toBe('0 in'); // 0.0197 in rounds to 0/16
    // 185 mm = 7.283 in; 7.283 × 16 = 116.5 → 117/16 = 7 5/16 in (by hand)
    expect(formatInchFraction(185)).toBe('7 5/16 in');
    expect(formatBuildLength(185, 'in')).toBe('7.28 in (7 5/16 in)');
    expect(formatBuildLength(185, 'mm')).toBe('185.0 mm');
  });

  it('writes an increment as it was chosen: a fraction for inches, mm for mm', async () => {
    const { formatIncrement } = await import('./format');
    expect(formatIncrement(6.35, 'in')).toBe('1/4 in');
    expect(formatIncrement(5, 'in')).toBe('5 mm (0.20 in)');
    expect(formatIncrement(25.4, 'in')).toBe('1 in');
    expect(formatIncrement(5, 'mm')).toBe('5 mm');
    expect(formatIncrement(6.35, 'mm')).toBe('6.35 mm (1/4 in)');
  });
});
