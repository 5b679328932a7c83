/**
 * Cross-axle twist imposed at the wheels by a pose, in degrees.
 *
 * Formula: front roll phiF = atan((liftFL − liftFR) / trackFront),
 *          rear roll  phiR = atan((liftRL − liftRR) / trackRear),
 *          twist = phiF − phiR.
 * Source: axle roll angle = atan(difference in wheel height ÷ track width), as in suspension-analysis
 * software documentation; cross-axle articulation as front roll minus rear roll (from memory).
 * Positive twist: front axle rolled left-side-up relative to the rear axle.
 *
 * Example: crossAxleTwistDeg({ fl: 300, fr: 0, rl: 0, rr: 0 }, 1800, 1800) // => 9.4623 (atan(1/6))
 */
import { FlexInputError, requireLength, requirePositiveLength } from './errors';
import type { WheelLifts } from './types';

const FN = 'crossAxleTwistDeg';

function radToDeg(rad: number): number {
  return (rad * 180) / Math.PI;
}

/** Roll of one axle in degrees: atan(lift difference left − right ÷ track). */
export function axleRollDeg(liftLeft: number, liftRight: number, track: number): number {
  return radToDeg(Math.atan((liftLeft - liftRight) / track));
}

export function crossAxleTwistDeg(lifts: WheelLifts, trackFront: number, trackRear: number): number {
  if (lifts === null || typeof lifts !== 'object') {
    throw new FlexInputError(FN, 'lifts', 'must be an object {fl, fr, rl, rr}');
  }
  for (const wheel of ['fl', 'fr', 'rl', 'rr'] as const) requireLength(FN, `lifts.${wheel}`, lifts[wheel]);
  requirePositiveLength(FN, 'trackFront', trackFront);
  requirePositiveLength(FN, 'trackRear', trackRear);
  return axleRollDeg(lifts.fl, lifts.fr, trackFront) - axleRollDeg(lifts.rl, lifts.rr, trackRear);
}
