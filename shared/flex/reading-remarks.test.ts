import { describe, expect, it } from 'vitest';
import { designEnvelope } from './envelope';
import { readingRemarks } from './reading-remarks';
import { buildSyntheticSession, syntheticEnvelopeInput } from './synthetic-session';
import { lengthWords } from '../format';

describe('readingRemarks', () => {
  it('are the remarks the computation stores, and read in inches for a person who chose inches', () => {
    // A session scattering 2 mm (more than a gauge is read to) with one 25 mm misread.
    const input = syntheticEnvelopeInput(buildSyntheticSession({ seed: 12, poses: 8, noiseSdMm: 2 }), { designTwistDeg: 20 });
    const misread = input.poses[3].readings.find((r) => r.axis === 'lateral')!;
    misread.value += 25;
    const result = designEnvelope(input);
    expect(readingRemarks(result)).toEqual(result.readingNotes);
    const inInches = readingRemarks(result, lengthWords('in'));
    expect(inInches).toHaveLength(result.readingNotes.length);
    expect(inInches.join(' ')).not.toMatch(/\bmm\b/);
    expect(inInches.some((n) => /scatter about their fits by \d\.\d\d\d in \(robust SD\), more than the 0\.020 in a gauge is read to/.test(n))).toBe(true);
    expect(inInches.some((n) => /is far from the fit \(residual \d+\.\d\d in,/.test(n))).toBe(true);
  });
});
