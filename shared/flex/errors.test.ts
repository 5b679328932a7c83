import { describe, it, expect } from 'vitest';
import { FlexInputError, isLength, requireDesignProbability, requireLength, requireMotion, requireProbability } from './errors';

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

  it("accepts a design probability from 0.5, and names a motion's bad component", () => {
    expect(requireDesignProbability('f', 'confidence', 0.5)).toBe(0.5);
    expect(() => requireDesignProbability('f', 'confidence', 0.4999)).toThrowError('f: confidence must be at least 0.5 and below 1 (e.g. 0.95), got 0.4999');
    const motion = { t: { x: 0, y: 5, z: 0 }, omega: { x: 0, y: 0, z: 0 } };
    expect(requireMotion('f', 'motion', motion)).toBe(motion);
    expect(() => requireMotion('f', 'motions[2]', { ...motion, t: { ...motion.t, z: NaN } })).toThrowError(/f: motions\[2\]\.t\.z must be a finite number/);
    expect(() => requireMotion('f', 'm', { ...motion, omega: { ...motion.omega, y: -0.6 } })).toThrowError(/f: m\.omega\.y must be within ±0\.5 rad/);
    expect(() => requireMotion('f', 'm', { t: motion.t } as never)).toThrowError('f: m must have t and omega');
    expect(isLength(60)).toBe(true);
    expect(isLength('60')).toBe(false);
    expect(isLength(NaN)).toBe(false);
  });
});
