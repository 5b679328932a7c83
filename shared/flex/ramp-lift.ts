/**
 * Lift of the wheel on a ramp: how high it stands above the ground the other wheels stand on.
 *
 * Formula: lift = distance travelled up the ramp × sin(ramp angle), the height gained along an
 * incline (elementary trigonometry). The distance is the one the RTI uses (along the ramp's
 * surface), so one tape measurement gives both. It assumes a straight ramp from level ground.
 *
 * Example: rampLiftMm(1500, 20) // => 513.03 (1500 × sin 20° = 1500 × 0.342020)
 */
import { FlexInputError, requireLength } from './errors';

export function rampLiftMm(distanceMm: number, angleDeg: number): number {
  requireLength('rampLiftMm', 'distance', distanceMm);
  if (distanceMm < 0) throw new FlexInputError('rampLiftMm', 'distance', `must not be negative, got ${distanceMm}`);
  if (!Number.isFinite(angleDeg) || angleDeg <= 0 || angleDeg >= 90) {
    throw new FlexInputError('rampLiftMm', 'angle', `must be between 0° and 90°, got ${String(angleDeg)}`);
  }
  return distanceMm * Math.sin((angleDeg * Math.PI) / 180);
}
