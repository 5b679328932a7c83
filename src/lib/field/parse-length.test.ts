// The length parser: what the trade writes is read exactly; everything else is refused with a
// reason, never rounded, cut short or clamped to something else. 1 in = 25.4 mm exactly
// (NIST SP 811, 2008, Appendix B.8).
import { describe, expect, it } from 'vitest';
import { parseAngle, parseLength, showLength, toggleSign, type LengthParse } from './parse-length';

const reading = { minMm: -20_000, maxMm: 20_000 };
const distance = { minMm: 0, maxMm: 20_000 };
const mm = (r: LengthParse) => (r.kind === 'value' ? r.mm : r);
const reason = (r: LengthParse) => (r.kind === 'refused' ? r.reason : `accepted as ${JSON.stringify(r)}`);

describe('parseLength: decimals', () => {
  it.each([
    ['12', 12],
    ['12.5', 12.5],
    ['12,5', 12.5],
    ['.5', 0.5],
    [',5', 0.5],
    ['12.', 12],
    ['  102  ', 102],
    ['007', 7],
    ['0', 0],
  ])('%j mm is %d mm', (text, expected) => {
    expect(mm(parseLength(text, 'mm', reading))).toBe(expected);
  });

  it('reads inches as 25.4 mm each, exactly', () => {
    expect(mm(parseLength('1', 'in', reading))).toBe(25.4);
    expect(mm(parseLength('3,5', 'in', reading))).toBeCloseTo(88.9, 12);
  });

  it('leaves an empty field empty', () => {
    expect(parseLength('', 'mm', reading)).toEqual({ kind: 'empty' });
    expect(parseLength('   ', 'in', reading)).toEqual({ kind: 'empty' });
  });
});

describe('parseLength: signs', () => {
  it.each([
    ['-12', -12],
    ['- 12', -12],
    ['+12', 12],
    ['\u221212.5', -12.5],
    ['-,5', -0.5],
    ['-0', 0],
  ])('%j mm is %d mm', (text, expected) => {
    expect(mm(parseLength(text, 'mm', reading))).toBe(expected);
  });

  it('calls a lone sign unfinished, not wrong', () => {
    expect(parseLength('-', 'mm', reading)).toMatchObject({ kind: 'refused', unfinished: true });
    expect(parseLength('-.', 'in', reading)).toMatchObject({ kind: 'refused', unfinished: true });
  });

  it('refuses a negative value where a length cannot be negative', () => {
    expect(reason(parseLength('-1500', 'mm', distance))).toMatch(/cannot be negative/);
  });
});

describe('parseLength: inch fractions as on a tape', () => {
  it.each([
    ['5/8', 0.625],
    ['3 5/8', 3.625],
    ['3-5/8', 3.625],
    ['3 - 5/8', 3.625],
    ['3  5 / 8', 3.625],
    ['-3 5/8', -3.625],
    ['\u22123-5/8', -3.625],
    ['13/16', 0.8125],
    ['9/8', 1.125],
    ['3½', 3.5],
    ['½', 0.5],
    ['-2¾', -2.75],
    ['12 1/64', 12 + 1 / 64],
    ['12"', 12],
    ['12 in', 12],
    ['3 5/8"', 3.625],
  ])('%j in is %d in', (text, inches) => {
    expect(mm(parseLength(text, 'in', reading))).toBeCloseTo(inches * 25.4, 9);
  });

  it('calls a fraction being typed unfinished', () => {
    for (const text of ['3 ', '3-', '3 5', '3-5', '3 5/', '5/', '-3 5/']) {
      const r = parseLength(text, 'in', reading);
      // "3 " is simply 3: the space is trimmed.
      if (text === '3 ') expect(mm(r)).toBe(76.2);
      else expect(r, text).toMatchObject({ kind: 'refused', unfinished: true });
    }
  });

  it('refuses a fraction with nothing below the line, or an improper one after whole inches', () => {
    expect(reason(parseLength('3/0', 'in', reading))).toMatch(/above 0 below the line/);
    expect(reason(parseLength('3 9/8', 'in', reading))).toMatch(/less than 1/);
  });

  it('refuses fractions in a millimetre field: they are inch readings typed in the wrong unit', () => {
    expect(reason(parseLength('3 5/8', 'mm', reading))).toMatch(/fractions are inch readings/);
    expect(reason(parseLength('5/8', 'mm', reading))).toMatch(/fractions are inch readings/);
    expect(reason(parseLength('3½', 'mm', reading))).toMatch(/fractions are inch readings/);
  });

  it('refuses a unit mark that names the other unit', () => {
    expect(reason(parseLength('12 mm', 'in', reading))).toMatch(/is in millimetres; this field is in inches/);
    expect(reason(parseLength('12"', 'mm', reading))).toMatch(/is in inches; this field is in millimetres/);
    expect(mm(parseLength('12 mm', 'mm', reading))).toBe(12);
  });
});

describe('parseLength: letters and stray characters are refused, never cut off', () => {
  it.each([
    ['3800abc', /letter “a”/],
    ['9o', /letter “o”/],
    ['O9', /letter “O”/],
    ['1e5', /letter “e”/],
    ['Infinity', /letter “I”/],
    ['NaN', /letter “N”/],
    ['0x10', /letter “x”/],
    ['12#', /“#”/],
    ['1.2.3', /more than one decimal mark/],
    ['1.250,5', /more than one decimal mark/],
    ['1 2', /two numbers/],
    ['--5', /Not a length/],
    ['3-', /Not a length/],
  ])('%j', (text, why) => {
    const r = parseLength(text, 'mm', reading);
    expect(r.kind).toBe('refused');
    expect(reason(r)).toMatch(why);
  });

  it('refuses an unfinished fraction once it is clearly not one', () => {
    expect(parseLength('3 5x', 'in', reading)).toMatchObject({ kind: 'refused', unfinished: false });
  });
});

describe('parseLength: out of range', () => {
  it('refuses 9999 in (253,974.6 mm) instead of keeping the 99 typed on the way', () => {
    const r = parseLength('9999', 'in', reading);
    expect(r.kind).toBe('refused');
    expect(reason(r)).toMatch(/Too large: 9999 in is more than the 787.402 in this field takes/);
  });

  it('takes the limits themselves and refuses just beyond them', () => {
    expect(mm(parseLength('20000', 'mm', reading))).toBe(20_000);
    expect(mm(parseLength('-20000', 'mm', reading))).toBe(-20_000);
    expect(parseLength('20000.1', 'mm', reading).kind).toBe('refused');
    expect(reason(parseLength('-20000.1', 'mm', reading))).toMatch(/Too small/);
  });

  it('refuses a number too long to be finite', () => {
    expect(reason(parseLength('9'.repeat(400), 'mm', reading))).toMatch(/Too large/);
  });
});

describe('toggleSign (the ± key)', () => {
  it.each([
    ['', '-'],
    ['12', '-12'],
    ['-12', '12'],
    ['\u221212', '12'],
    ['+12', '12'],
    ['  3 5/8', '-3 5/8'],
    ['- 4', '4'],
  ])('%j becomes %j', (text, expected) => {
    expect(toggleSign(text)).toBe(expected);
  });
});

describe('showLength', () => {
  it('shows mm to 0.1 and inches to 0.001, without trailing zeros', () => {
    expect(showLength(92.075, 'in')).toBe('3.625');
    expect(showLength(90, 'mm')).toBe('90');
    expect(showLength(44.55, 'mm')).toBe('44.5');
  });
});

describe('parseAngle', () => {
  it('reads degrees with a point, a comma or a degree sign', () => {
    expect(parseAngle('20')).toEqual({ kind: 'value', deg: 20 });
    expect(parseAngle('22,5')).toEqual({ kind: 'value', deg: 22.5 });
    expect(parseAngle('23°')).toEqual({ kind: 'value', deg: 23 });
    expect(parseAngle(' ')).toEqual({ kind: 'empty' });
  });

  it('refuses letters and angles a ramp cannot have', () => {
    expect(parseAngle('2o')).toMatchObject({ kind: 'refused', reason: expect.stringMatching(/Not an angle: “2o” has the letter “o”/) });
    expect(parseAngle('0')).toMatchObject({ kind: 'refused' });
    expect(parseAngle('90')).toMatchObject({ kind: 'refused', reason: expect.stringMatching(/below 90°/) });
    expect(parseAngle('-20')).toMatchObject({ kind: 'refused' });
  });
});
