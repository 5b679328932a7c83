import { describe, expect, it } from 'vitest';
import { DEFAULT_DRAFT_PARAMS } from '@shared/schemas/envelope';
import { fromFormState, toFormState } from './params-form-state';

describe('envelope form state', () => {
  it('round-trips the parameters and the pass-through design, in inches too', () => {
    const params = { ...DEFAULT_DRAFT_PARAMS, design: { ...DEFAULT_DRAFT_PARAMS.design, option: 'boot' as const, flangeWidthMm: 50.8 } };
    for (const unit of ['mm', 'in'] as const) {
      const back = fromFormState(toFormState(params, unit), unit);
      expect(back.problems).toEqual([]);
      expect(back.params!.design.option).toBe('boot');
      expect(back.params!.design.flangeWidthMm).toBeCloseTo(50.8, 9);
      expect(back.params!.margin).toBeCloseTo(0.15, 12);
    }
    expect(toFormState(params, 'in').design.flangeWidth).toBe('2');
  });

  it('says a range in percent and in the person’s unit, never as a fraction', () => {
    const form = toFormState(DEFAULT_DRAFT_PARAMS, 'in');
    const { problems } = fromFormState(
      { ...form, marginPct: '250', confidencePct: '40', design: { ...form.design, slackPct: '300', flangeWidth: '20', foldDepth: 'x' } },
      'in',
    );
    expect(problems).toContain('Margin must be between 0 and 200 %');
    expect(problems).toContain('Confidence must be between 50 and 100 %');
    expect(problems).toContain('Boot slack must be between 0 and 200 %');
    // 300 mm = 11.811 in
    expect(problems).toContain('Flange width must be between 0 and 11.811 in');
    expect(problems).toContain('Fold depth: enter a number');
    expect(problems.join(' ')).not.toMatch(/expected number/);
  });

  it('leaves the seal’s free height empty until a seal is checked', () => {
    expect(toFormState(DEFAULT_DRAFT_PARAMS, 'mm').sealFreeHeight).toBe('');
  });
});
