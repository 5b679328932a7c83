import { describe, it, expect } from 'vitest';
import * as flex from './index';

describe('shared/flex index', () => {
  it('re-exports the agreed API under its names', () => {
    for (const name of [
      'crossAxleTwistDeg',
      'rampTravelIndex',
      'fitRelativeMotion',
      'predictDisplacement',
      'perimeterWorst',
      'sampleOutline',
      'linearFit',
      'studentTQuantile',
      'oneSidedToleranceFactor',
      'designEnvelope',
      'computeDisplacements',
      'bootSpan',
      'compareSessions',
      'mmToIn',
      'inToMm',
      'FlexInputError',
      'upperPredictionBoundAt',
      'residualScale',
      'normalDensity',
      'outlineCorners',
      'syntheticEnvelopeInput',
    ]) {
      expect(typeof (flex as Record<string, unknown>)[name]).toBe('function');
    }
  });
});
