/**
 * Cross-axle twist imposed at the wheels by a pose, in degrees (docs/method.md §1).
 *
 * Formula: front roll phiF = atan((liftFL − liftFR) / trackFront),
 *          rear roll  phiR = atan((liftRL − liftRR) / trackRear),
 *          twist = phiF − phiR.
 * Source: axle roll angle = atan(difference in wheel height ÷ track width), as in suspension-analysis
 * software documentation; the twist is the front axle's roll relative to the rear axle's, both
 * rotations about the vehicle's x axis (ISO 8855), so they subtract.
 * Positive twist: front axle rolled left-side-up relative to the rear axle (FL or RR raised).
 * The value is the geometry of the lifts as typed; designEnvelope refuses a twist beyond ±90°.
 */
import { FlexInputError, isLength, requireLength, requirePositiveLength } from './errors';
import type { WheelLifts } from './types';

const FN = 'crossAxleTwistDeg';

function radToDeg(rad: number): number {
  return (rad * 180) / Math.PI;
}

/**
 * Roll of one axle in degrees.
 * @param liftLeft lift of the left wheel (mm). @param liftRight lift of the right wheel (mm). @param track the axle's track (mm, > 0).
 * @returns atan((left − right) / track) in degrees; positive when the left side is up.
 * @example axleRollDeg(300, 0, 1800) // => 9.4623
 */
export function axleRollDeg(liftLeft: number, liftRight: number, track: number): number {
  return radToDeg(Math.atan((liftLeft - liftRight) / track));
}

/**
 * Cross-axle twist of a pose.
 * @param lifts wheel lifts in mm (negative for a dip): fl, fr, rl, rr.
 * @param trackFront front track (mm, > 0). @param trackRear rear track (mm, > 0).
 * @returns front roll minus rear roll, degrees.
 * @example crossAxleTwistDeg({ fl: 300, fr: 0, rl: 0, rr: 0 }, 1800, 1800) // => 9.4623 (atan(1/6))
 */
export function crossAxleTwistDeg(lifts: WheelLifts, trackFront: number, trackRear: number): number {
  if (lifts === null || typeof lifts !== 'object') {
    throw new FlexInputError(FN, 'lifts', 'must be an object {fl, fr, rl, rr}');
  }
  if (!(isLength(lifts.fl) && isLength(lifts.fr) && isLength(lifts.rl) && isLength(lifts.rr))) {
    for (const wheel of ['fl', 'fr', 'rl', 'rr'] as const) requireLength(FN, `lifts.${wheel}`, lifts[wheel]);
  }
  requirePositiveLength(FN, 'trackFront', trackFront);
  requirePositiveLength(FN, 'trackRear', trackRear);
  return axleRollDeg(lifts.fl, lifts.fr, trackFront) - axleRollDeg(lifts.rl, lifts.rr, trackRear);
}
