import { describe, expect, it } from 'vitest';
import { listInWords, nounFor, plural } from './plural';

describe('plural', () => {
  it('takes the singular for exactly one and the plural otherwise', () => {
    expect(plural(1, 'record')).toBe('1 record');
    expect(plural(0, 'record')).toBe('0 records');
    expect(plural(2, 'record')).toBe('2 records');
    expect(plural(1.5, 'degree')).toBe('1.5 degrees');
    expect(plural(1, 'copy', 'copies')).toBe('1 copy');
    expect(plural(4, 'copy', 'copies')).toBe('4 copies');
    expect(nounFor(1, 'pose')).toBe('pose');
    expect(nounFor(7, 'pose')).toBe('poses');
  });

  it('lists items as a sentence does', () => {
    expect(listInWords([])).toBe('');
    expect(listInWords(['admins'])).toBe('admins');
    expect(listInWords(['engineers', 'admins'])).toBe('engineers and admins');
    expect(listInWords(['testers', 'engineers', 'admins'])).toBe('testers, engineers and admins');
  });
});
