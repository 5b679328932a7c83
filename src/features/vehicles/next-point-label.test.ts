import { describe, expect, it } from 'vitest';
import { nextPointLabel } from './next-point-label';

const labels = (...ls: string[]) => ls.map((label) => ({ label }));

describe('nextPointLabel', () => {
  it('takes the first free letter, filling a gap left by a deleted point', () => {
    expect(nextPointLabel([])).toBe('A');
    expect(nextPointLabel(labels('A', 'B'))).toBe('C');
    expect(nextPointLabel(labels('A', 'C'))).toBe('B');
  });

  it('goes on with P27 once A–Z are taken, and never repeats a label', () => {
    const az = labels(...Array.from({ length: 26 }, (_, i) => String.fromCharCode(65 + i)));
    expect(nextPointLabel(az)).toBe('P27');
    expect(nextPointLabel([...az, ...labels('P27')])).toBe('P28');
  });
});
