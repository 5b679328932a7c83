// A ramp pose's angle, distance and wheel, and the lift that follows from them. Every change to
// any of the three is written with the wheel's lift in the same patch, so the stored pose always
// agrees with the shared schema's rule (lift = distance × sin(angle), shared/schemas/pose.ts).
import { liftKeyOf, type Pose, type Wheel } from '@shared/schemas';
import { rampLiftMm } from '@shared/flex/ramp-lift';

export type RampState = Pick<Pose, 'rampAngleDeg' | 'rampDistanceMm' | 'rampWheel'>;

/** The usual ramp (see the RTI's definition in shared/flex/rti.ts). */
export const USUAL_RAMP_DEG = 20;

/**
 * The patch from `before` to `after`: the ramp fields, the lift of the wheel on the ramp, and a
 * wheel that left the ramp back on the ground (lift 0).
 */
export function rampPatch(before: RampState, after: RampState): Partial<Pose> {
  const patch: Partial<Pose> = { rampAngleDeg: after.rampAngleDeg, rampDistanceMm: after.rampDistanceMm, rampWheel: after.rampWheel };
  if (before.rampWheel && before.rampWheel !== after.rampWheel) patch[liftKeyOf[before.rampWheel]] = 0;
  if (after.rampWheel && after.rampAngleDeg != null && after.rampDistanceMm != null) {
    patch[liftKeyOf[after.rampWheel]] = rampLiftMm(after.rampDistanceMm, after.rampAngleDeg);
  }
  return patch;
}

export const rampWheelLift = (pose: Pose, wheel: Wheel) => pose[liftKeyOf[wheel]];
