// The envelope as rows for people: the desk, the fabrication sheet, the CSV and the e-mail print
// the same rows, whether the snapshot was signed with one fore-aft envelope (format 1) or with the
// gap's opening and closing apart (format 2), so an older signed sheet still reads as signed.
// Reasons and remarks are written again from the frozen numbers in the reader's unit.
import { ENVELOPE_MEASURES, TWIST_DIRECTION_NAMES, measureReasons, readingRemarks, type EnvelopeResult } from './flex';
import { AXIS_NAMES, MEASURE_NAMES, MEASURE_SIGNS, lengthWords } from './format';
import type { UnitSystem } from './schemas/common';
import type { LegacyEnvelopeResult } from './schemas/envelope';

export interface EnvelopeRow {
  /** The measure (format 2) or axis (format 1) the row is for, e.g. 'foreAftOpening'. */
  key: string;
  name: string;
  /** '+' the gap opens by up to the envelope, '−' it closes by up to it, '±' either way. */
  sign: '+' | '−' | '±';
  measuredWorstMm: number;
  upperBoundMm: number | null;
  /** Which term decided, in words: "upper bound, FL–RR twist (+)" or "measured". */
  governs: string;
  envelopeMm: number;
  reasons: string[];
}

function isLegacy(result: EnvelopeResult | LegacyEnvelopeResult): result is LegacyEnvelopeResult {
  return 'axes' in result;
}

/** The rows of an envelope, in print order, its reasons in the reader's unit (format 1 kept its own, in mm). */
export function envelopeRows(result: EnvelopeResult | LegacyEnvelopeResult, unit: UnitSystem = 'mm'): EnvelopeRow[] {
  if (isLegacy(result)) {
    return (['foreAft', 'lateral', 'vertical'] as const).map((axis) => {
      const a = result.axes[axis];
      return {
        key: axis,
        name: AXIS_NAMES[axis],
        sign: '±',
        measuredWorstMm: Math.abs(a.measuredWorstMm),
        upperBoundMm: a.upperBoundMm,
        governs: a.governing === 'upperBound' ? 'upper bound' : 'measured',
        envelopeMm: a.envelopeMm,
        reasons: a.reasons,
      };
    });
  }
  return ENVELOPE_MEASURES.map((measure) => {
    const m = result.measures[measure];
    return {
      key: measure,
      name: MEASURE_NAMES[measure],
      sign: MEASURE_SIGNS[measure],
      measuredWorstMm: m.measuredWorstMm,
      upperBoundMm: m.upperBoundMm,
      governs: m.governing === 'upperBound' && m.governingDirection !== null ? `upper bound, ${TWIST_DIRECTION_NAMES[m.governingDirection]}` : 'measured',
      envelopeMm: m.envelopeMm,
      reasons: measureReasons(m, result.parameters, lengthWords(unit)),
    };
  });
}

/** Every remark of an envelope, readings first, in the reader's unit (format 1 kept them in one list). */
export function envelopeRemarks(result: EnvelopeResult | LegacyEnvelopeResult, unit: UnitSystem = 'mm'): { readings: string[]; bound: string[] } {
  return isLegacy(result) ? { readings: [], bound: result.notes } : { readings: readingRemarks(result, lengthWords(unit)), bound: result.notes };
}
