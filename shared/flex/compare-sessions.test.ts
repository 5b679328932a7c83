import { describe, it, expect } from 'vitest';
import { compareSessions, poseSummaries } from './compare-sessions';
import { designEnvelope } from './envelope';
import { buildSyntheticSession, syntheticEnvelopeInput } from './synthetic-session';
import { FlexInputError } from './errors';

describe('compareSessions', () => {
  it('reports twist reached, worst per axis and the slope through the origin', () => {
    const [first, second] = compareSessions([
      {
        sessionId: 's1',
        vehicleId: 'truck-a',
        poses: [
          { twistDeg: 5, worstMm: { foreAft: 2, lateral: -40, vertical: 10 } },
          { twistDeg: -10, worstMm: { foreAft: -4, lateral: 82, vertical: -21 } },
        ],
      },
      { sessionId: 's2', poses: [{ twistDeg: 0, worstMm: { foreAft: 0, lateral: 1, vertical: 0 } }] },
    ]);
    expect(first.twistReachedDeg).toBe(10);
    expect(first.worstMm).toEqual({ foreAft: -4, lateral: 82, vertical: -21 });
    // hand-checked: (5·40 + 10·82) / (25 + 100) = 8.16 mm/deg (least squares through the origin)
    expect(first.slopeMmPerDeg.lateral).toBeCloseTo(8.16, 12);
    expect(first.vehicleId).toBe('truck-a');
    expect(second.slopeMmPerDeg.lateral).toBeNull();
    expect(second.label).toBeNull();
  });

  it('recovers the per-degree motion of a synthetic session', () => {
    const result = designEnvelope(syntheticEnvelopeInput(buildSyntheticSession({ seed: 3, noiseSdMm: 0 }), { designTwistDeg: 20 }));
    const [comparison] = compareSessions([{ sessionId: 'demo', poses: poseSummaries(result) }]);
    // demo motion per degree: dy = 9 − 0.0012·z, largest at the bottom edge z = 600 → 8.28 mm/deg
    expect(comparison.slopeMmPerDeg.lateral).toBeCloseTo(8.28, 9);
    expect(comparison.poseCount).toBe(8);
  });

  it('throws FlexInputError for bad input', () => {
    expect(() => compareSessions([{ sessionId: 's', poses: [] }])).toThrowError(/compareSessions: sessions\[0\].poses/);
    expect(() => compareSessions([{ sessionId: 's', poses: [{ twistDeg: NaN, worstMm: { foreAft: 0, lateral: 0, vertical: 0 } }] }])).toThrowError(
      FlexInputError,
    );
  });
});
