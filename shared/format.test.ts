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
