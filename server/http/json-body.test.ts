// The depth check before JSON.parse: brackets inside strings never count, whatever the escapes,
// and the fast scan (strings skipped with indexOf) agrees with reading the text byte by byte.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { nestsDeeperThan } from './json-body';

/** The plain reading: every byte in turn, tracking whether it is inside a string. */
function deepestByteByByte(text: string): number {
  const buf = Buffer.from(text);
  let depth = 0;
  let deepest = 0;
  let inString = false;
  for (let i = 0; i < buf.length; i++) {
    const c = String.fromCharCode(buf[i]);
    if (inString) {
      if (c === '\\') i++;
      else if (c === '"') inString = false;
    } else if (c === '"') inString = true;
    else if (c === '[' || c === '{') deepest = Math.max(deepest, ++depth);
    else if (c === ']' || c === '}') depth--;
  }
  return deepest;
}

const deeper = (text: string, max: number) => nestsDeeperThan(Buffer.from(text), max);

describe('nestsDeeperThan', () => {
  it('counts the brackets between strings only', () => {
    expect(deeper('[[[1]]]', 2)).toBe(true);
    expect(deeper('[[[1]]]', 3)).toBe(false);
    expect(deeper('{"a":"[[[[[["}', 1)).toBe(false);
    // An escaped quote does not end the string; an escaped backslash before a quote does.
    expect(deeper('["a\\"[[[["]', 1)).toBe(false);
    expect(deeper('["a\\\\",[[[1]]]]', 3)).toBe(true);
    expect(deeper('["\\\\\\"[[",1]', 1)).toBe(false);
    // Nothing after an unterminated string can nest (JSON.parse refuses the body anyway).
    expect(deeper('["abc[[[[[[', 1)).toBe(false);
  });

  it('agrees with a byte-by-byte reading on any text of brackets, quotes and backslashes', () => {
    const piece = fc.constantFrom('[', ']', '{', '}', '"', '\\', 'a', ',', 'é');
    fc.assert(
      fc.property(fc.array(piece, { maxLength: 60 }), fc.integer({ min: 0, max: 8 }), (pieces, max) => {
        const text = pieces.join('');
        expect(deeper(text, max)).toBe(deepestByteByByte(text) > max);
      }),
      { numRuns: 2000 },
    );
  });
});
