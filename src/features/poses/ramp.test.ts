import { describe, expect, it } from 'vitest';
import { pose as poseSchema } from '@shared/schemas';
import { nextPose } from '@/lib/field/pose-actions';
import { rampPatch } from './ramp';

const none = { rampAngleDeg: 20, rampDistanceMm: 0, rampWheel: null };

describe('rampPatch', () => {
  it('gives the wheel on the ramp its lift from the distance and the angle', () => {
    // Python: 1500 * math.sin(math.radians(20)) = 513.0302149885031
    expect(rampPatch(none, { ...none, rampDistanceMm: 1500, rampWheel: 'fl' })).toEqual({
      rampAngleDeg: 20,
      rampDistanceMm: 1500,
      rampWheel: 'fl',
      liftFlMm: 513.0302149885031,
    });
  });

  it('puts a wheel that leaves the ramp back on the ground', () => {
    const before = { rampAngleDeg: 20, rampDistanceMm: 1500, rampWheel: 'fl' as const };
    const patch = rampPatch(before, { ...before, rampWheel: 'rr' });
    expect(patch).toMatchObject({ liftFlMm: 0, rampWheel: 'rr' });
    expect(patch.liftRrMm).toBeCloseTo(513.03, 2);
  });

  it('leaves the lifts alone until the wheel is chosen', () => {
    expect(rampPatch(none, { ...none, rampDistanceMm: 900 })).toEqual({ rampAngleDeg: 20, rampDistanceMm: 900, rampWheel: null });
  });

  it('makes a pose the shared schema accepts, and one with a stale lift it refuses', () => {
    const base = { ...nextPose(crypto.randomUUID(), []), seq: 1, kind: 'ramp' as const, ...none };
    const good = { ...base, ...rampPatch(none, { rampAngleDeg: 23, rampDistanceMm: 1200, rampWheel: 'rl' }) };
    expect(poseSchema.safeParse(good).success).toBe(true);
    const stale = { ...good, rampAngleDeg: 15 };
    const refused = poseSchema.safeParse(stale);
    expect(refused.success).toBe(false);
    expect(refused.error?.issues[0].path).toEqual(['liftRlMm']);
  });
});
