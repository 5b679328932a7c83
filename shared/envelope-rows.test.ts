import { describe, expect, it } from 'vitest';
import { buildSyntheticSession, designEnvelope, syntheticEnvelopeInput } from './flex';
import { envelopeRemarks, envelopeRows } from './envelope-rows';
import type { LegacyEnvelopeResult } from './schemas/envelope';

describe('envelopeRows', () => {
  it('prints the same rows for a format-1 snapshot (one fore-aft envelope) and a format-2 one (opening and closing apart)', () => {
    const legacy: LegacyEnvelopeResult = {
      axes: {
        foreAft: { measuredWorstMm: -12, upperBoundMm: 14, governing: 'upperBound', envelopeMm: 30, reasons: ['a'] },
        lateral: { measuredWorstMm: 80, upperBoundMm: null, governing: 'measured', envelopeMm: 105, reasons: ['b'] },
        vertical: { measuredWorstMm: 9, upperBoundMm: 8, governing: 'measured', envelopeMm: 25, reasons: ['c'] },
      },
      notes: [],
    };
    expect(envelopeRows(legacy).map((r) => [r.key, r.sign, r.measuredWorstMm, r.governs, r.envelopeMm])).toEqual([
      ['foreAft', '±', 12, 'upper bound', 30],
      ['lateral', '±', 80, 'measured', 105],
      ['vertical', '±', 9, 'measured', 25],
    ]);
    const rows = envelopeRows(designEnvelope(syntheticEnvelopeInput(buildSyntheticSession({ seed: 3 }), { designTwistDeg: 40 })));
    expect(rows.map((r) => [r.key, r.sign])).toEqual([
      ['foreAftOpening', '+'],
      ['foreAftClosing', '−'],
      ['lateral', '±'],
      ['vertical', '±'],
    ]);
    expect(rows[2].governs).toMatch(/^upper bound, F[LR]–R[LR] twist/);
  });

  it('keeps the remarks on the readings apart from the remarks on the bound (format 1 had one list)', () => {
    const result = designEnvelope(syntheticEnvelopeInput(buildSyntheticSession({ seed: 3, poses: 2 }), { designTwistDeg: 40 }));
    expect(envelopeRemarks(result)).toEqual({ readings: result.readingNotes, bound: result.notes });
    expect(envelopeRemarks({ axes: {} as LegacyEnvelopeResult['axes'], notes: ['old'] })).toEqual({ readings: [], bound: ['old'] });
  });
});

describe('envelope rows in the reader’s unit', () => {
  it('writes "Why these values" and the remarks in inches for a person who chose inches', () => {
    const result = designEnvelope(syntheticEnvelopeInput(buildSyntheticSession({ seed: 3, noiseSdMm: 2 }), { designTwistDeg: 40, incrementMm: 6.35 }));
    const text = [...envelopeRows(result, 'in').flatMap((r) => r.reasons), ...envelopeRemarks(result, 'in').readings].join(' ');
    expect(text).not.toMatch(/\bmm\b/);
    expect(text).toMatch(/rounded up to the 1\/4 in increment: \d+\.\d\d in\./);
    // The same numbers as the stored mm reasons: the envelope of the lateral row in both.
    const lateral = envelopeRows(result, 'in')[2];
    expect(lateral.reasons.join(' ')).toContain(`${(result.measures.lateral.envelopeMm / 25.4).toFixed(2)} in.`);
  });
});
