import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { compactJsonBytes } from './compact-json';

describe('compactJsonBytes', () => {
  it('drops the whitespace PostgreSQL writes between tokens', () => {
    const pg = '{"id" : "a1", "poses" : [{"seq" : 0, "lift" : null}, \n {"seq" : 1, "lift" : 2.5}], "ok" : true}';
    expect(compactJsonBytes(pg).toString('utf8')).toBe('{"id":"a1","poses":[{"seq":0,"lift":null},{"seq":1,"lift":2.5}],"ok":true}');
  });

  it('keeps strings as they are: spaces, escaped quotes and backslashes, and characters beyond ASCII', () => {
    const text = '{"note" : "chock \\" the \\\\ wheel ,: ", "name" : "Ærø  Väg 🚚", "tab" : "a\\tb"}';
    const out = compactJsonBytes(text).toString('utf8');
    expect(JSON.parse(out)).toEqual(JSON.parse(text));
    expect(out).toBe('{"note":"chock \\" the \\\\ wheel ,: ","name":"Ærø  Väg 🚚","tab":"a\\tb"}');
  });

  it('gives what JSON.stringify gives for any value, however it was indented', () => {
    fc.assert(
      fc.property(fc.jsonValue(), fc.constantFrom(0, 1, 2, '\t', ' \n '), (value, indent) => {
        const spaced = JSON.stringify(value, null, indent as number | string);
        expect(compactJsonBytes(spaced).toString('utf8')).toBe(JSON.stringify(value));
      }),
    );
  });
});
