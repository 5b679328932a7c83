import { describe, it, expect } from 'vitest';
import { FlexInputError, requireLength, requireProbability } from './errors';

describe('FlexInputError', () => {
  it('names the function, the field and the problem', () => {
    const error = new FlexInputError('rampTravelIndex', 'wheelbase', 'must be greater than 0, got -1');
    expect(error).toBeInstanceOf(Error);
    expect(error.message).toBe('rampTravelIndex: wheelbase must be greater than 0, got -1');
    expect(error.fn).toBe('rampTravelIndex');
    expect(error.field).toBe('wheelbase');
    expect(error.problem).toBe('must be greater than 0, got -1');
  });

  it('bounds lengths and probabilities', () => {
    expect(requireLength('f', 'x', 12.5)).toBe(12.5);
    expect(() => requireLength('f', 'x', 2e6)).toThrowError(/f: x must be within/);
    expect(() => requireProbability('f', 'p', 1)).toThrowError(FlexInputError);
  });
});
