import { describe, it, expect } from 'vitest';
import { buildSyntheticSession, seededNormal, seededRandom, syntheticEnvelopeInput } from './synthetic-session';
import { crossAxleTwistDeg } from './twist';
import { designEnvelope } from './envelope';

describe('buildSyntheticSession', () => {
  it('is deterministic for a seed and has a level baseline', () => {
    const a = buildSyntheticSession({ poses: 4, seed: 9, mode: 'gap' });
    const b = buildSyntheticSession({ poses: 4, seed: 9, mode: 'gap' });
    expect(a).toEqual(b);
    expect(a.poses).toHaveLength(5);
    expect(a.poses[0].id).toBe(a.baselinePoseId);
    expect(crossAxleTwistDeg(a.poses[0].lifts, a.tracks.frontMm, a.tracks.rearMm)).toBe(0);
    expect(a.poses[1].readings).toHaveLength(12 * 3);
    expect(new Set(a.gaugePoints.map((p) => p.id)).size).toBe(12);
  });

  it('draws seeded noise with mean 0 and SD 1', () => {
    const normal = seededNormal(5);
    const draws = Array.from({ length: 20000 }, () => normal());
    const mean = draws.reduce((s, v) => s + v, 0) / draws.length;
    const sd = Math.sqrt(draws.reduce((s, v) => s + (v - mean) ** 2, 0) / (draws.length - 1));
    // sampling error of 20 000 draws: SE(mean) ≈ 0.007, SE(sd) ≈ 0.005
    expect(Math.abs(mean)).toBeLessThan(0.03);
    expect(Math.abs(sd - 1)).toBeLessThan(0.03);
    const uniform = seededRandom(1);
    for (let i = 0; i < 1000; i++) {
      const u = uniform();
      expect(u >= 0 && u < 1).toBe(true);
    }
  });

  it('poses at given twists on top of a twisted baseline, with an asymmetric response', () => {
    const baselineLifts = { fl: 0, fr: 0, rl: 0, rr: 150 };
    const s = buildSyntheticSession({
      twistsDeg: [6, -9],
      baselineLifts,
      noiseSdMm: 0,
      motionPerDeg: { t: { x: 0, y: 9, z: 0 }, omega: { x: 0, y: 0, z: 0 } },
      motionPerDegNegative: { t: { x: 0, y: 7, z: 0 }, omega: { x: 0, y: 0, z: 0 } },
    });
    const base = crossAxleTwistDeg(baselineLifts, s.tracks.frontMm, s.tracks.rearMm);
    expect(crossAxleTwistDeg(s.poses[1].lifts, s.tracks.frontMm, s.tracks.rearMm) - base).toBeCloseTo(6, 9);
    expect(crossAxleTwistDeg(s.poses[2].lifts, s.tracks.frontMm, s.tracks.rearMm) - base).toBeCloseTo(-9, 9);
    expect(s.poses[1].readings.find((r) => r.axis === 'lateral')?.value).toBeCloseTo(54, 9);
    expect(s.poses[2].readings.find((r) => r.axis === 'lateral')?.value).toBeCloseTo(-63, 9);
    expect(designEnvelope(syntheticEnvelopeInput(s, { designTwistDeg: 10 })).baselineTwistDeg).toBeCloseTo(base, 12);
  });

  it("scatters each pose's response in proportion to it, or by a constant, only when asked", () => {
    const plain = buildSyntheticSession({ seed: 4, poses: 3 });
    const again = buildSyntheticSession({ seed: 4, poses: 3, proportionalScatter: 0, constantScatterMm: 0 });
    expect(again).toEqual(plain);
    const scattered = buildSyntheticSession({ seed: 4, poses: 3, proportionalScatter: 0.05, noiseSdMm: 0 });
    const lateral = (session: typeof plain, i: number) => session.poses[i].readings.find((r) => r.axis === 'lateral')!.value;
    const exact = buildSyntheticSession({ seed: 4, poses: 3, noiseSdMm: 0 });
    expect(lateral(scattered, 1)).not.toBeCloseTo(lateral(exact, 1), 3);
    expect(Math.abs(lateral(scattered, 1) / lateral(exact, 1) - 1)).toBeLessThan(0.25);
  });
});
