import { describe, it, expect } from 'vitest';
import { buildSyntheticSession, seededNormal, seededRandom } from './synthetic-session';
import { crossAxleTwistDeg } from './twist';

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
});
