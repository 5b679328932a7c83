import { describe, it, expect } from 'vitest';
import { computeDisplacements } from './displacements';
import { FlexInputError } from './errors';
import type { Axis } from './types';

describe('computeDisplacements', () => {
  it('subtracts the baseline per point and axis', () => {
    const baseline = [
      { pointId: 'P1', axis: 'foreAft' as const, value: 60 },
      { pointId: 'P1', axis: 'lateral' as const, value: 12 },
    ];
    const pose = [
      { pointId: 'P1', axis: 'lateral' as const, value: 9.5 },
      { pointId: 'P1', axis: 'foreAft' as const, value: 64.5 },
      { pointId: 'P2', axis: 'foreAft' as const, value: 61 },
    ];
    const result = computeDisplacements(baseline, pose);
    expect(result.displacements).toEqual([
      { pointId: 'P1', axis: 'lateral', value: -2.5 },
      { pointId: 'P1', axis: 'foreAft', value: 4.5 },
    ]);
    expect(result.missingBaseline).toEqual([pose[2]]);
  });

  it('throws FlexInputError for ambiguous or bad readings', () => {
    const twice = [
      { pointId: 'P1', axis: 'foreAft' as const, value: 60 },
      { pointId: 'P1', axis: 'foreAft' as const, value: 61 },
    ];
    expect(() => computeDisplacements(twice, [])).toThrowError(/computeDisplacements: baseline\[1\] repeats/);
    expect(() => computeDisplacements([], [{ pointId: 'P1', axis: 'up' as Axis, value: 1 }])).toThrowError(/pose\[0\].axis/);
    expect(() => computeDisplacements([], [{ pointId: 'P1', axis: 'lateral', value: NaN }])).toThrowError(FlexInputError);
  });
});
