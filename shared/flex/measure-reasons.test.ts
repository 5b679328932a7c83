import { describe, expect, it } from 'vitest';
import { measureReasons, type MeasureTerms, type ReasonParameters } from './measure-reasons';
import { lengthWords } from '../format';

// A measure worked by hand: bound 120 mm above the measured 100 mm; × 1.15 = 138; + 9.525 (3/8 in)
// = 147.525; rounded up to 1/4 in (6.35 mm): 24 × 6.35 = 152.4 mm = 6.00 in.
const terms: MeasureTerms = {
  measuredWorstMm: 100,
  measuredWorstPoseId: 'Ramp (#6)',
  directions: {
    positive: { upperBoundMm: 120, unavailable: null },
    negative: { upperBoundMm: null, unavailable: 'needs at least 2 poses twisted this way by 1° or more, has 1' },
  },
  governingDirection: 'positive',
  upperBoundMm: 120,
  governing: 'upperBound',
  fitUncertaintyMm: 1.27,
  withMarginMm: 138,
  withAllowanceMm: 147.525,
  envelopeMm: 152.4,
};
const params: ReasonParameters = {
  method: 'prediction',
  confidence: 0.95,
  coverage: 0.9,
  designTwistDeg: 20,
  margin: 0.15,
  allowanceMm: 9.525,
  incrementMm: 6.35,
};

describe('measureReasons', () => {
  it('reads in mm by default, with the margin in percent', () => {
    expect(measureReasons(terms, params)).toEqual([
      'upper 95 % prediction bound at 20°, FL–RR twist (+) (120.0 mm) is above the measured worst (100.0 mm, Ramp (#6))',
      '+ margin 15 % = 138.0 mm',
      '+ allowance 9.5 mm = 147.5 mm',
      'rounded up to the 6.35 mm increment: 152.4 mm.',
      'FR–RL twist (−): no bound, needs at least 2 poses twisted this way by 1° or more, has 1.',
      "The fit is uncertain by up to ±1.3 mm (1 SD) at the opening's edge in a pose; the bound's scatter includes it.",
    ]);
  });

  it('reads in inches for a person who chose inches: no mm anywhere, the increment as a fraction', () => {
    const reasons = measureReasons(terms, params, lengthWords('in'));
    expect(reasons.join(' ')).not.toMatch(/\bmm\b/);
    expect(reasons[0]).toBe('upper 95 % prediction bound at 20°, FL–RR twist (+) (4.72 in) is above the measured worst (3.94 in, Ramp (#6))');
    expect(reasons[1]).toBe('+ margin 15 % = 5.43 in');
    expect(reasons[2]).toBe('+ allowance 0.38 in = 5.81 in');
    expect(reasons[3]).toBe('rounded up to the 1/4 in increment: 6.00 in.');
  });
});
