/**
 * Displacement of the cab relative to the body at a point (y, z) of the front wall (x = 0), from a
 * small-angle rigid motion; and the same motion scaled by a factor.
 *
 * Formula: d = t + omega × r with r = (0, y, z):
 *   dx = tx + wy·z − wz·y ;  dy = ty − wx·z ;  dz = tz + wx·y.
 * Source: small-rotation kinematics of a rigid body (e.g. Goldstein, Classical Mechanics, §4.8).
 */
import { requireFinite, requireLength, requireMotion } from './errors';
import type { Displacement, RigidMotion } from './types';

/**
 * @param motion translation t (mm) and small rotation omega (rad) of the cab relative to the body.
 * @param y mm from the vehicle centreline (+ left). @param z mm above the top of the frame rail.
 * @returns the displacement (dx, dy, dz) in mm at (y, z).
 * @example predictDisplacement({ t: { x: 0, y: 2, z: 0 }, omega: { x: 0.01, y: 0, z: 0 } }, 500, 1000)
 *   // => { dx: 0, dy: -8, dz: 5 }
 */
export function predictDisplacement(motion: RigidMotion, y: number, z: number): Displacement {
  requireMotion('predictDisplacement', 'motion', motion);
  requireLength('predictDisplacement', 'y', y);
  requireLength('predictDisplacement', 'z', z);
  const { t, omega } = motion;
  return {
    dx: t.x + omega.y * z - omega.z * y,
    dy: t.y - omega.x * z,
    dz: t.z + omega.x * y,
  };
}

/**
 * The same motion scaled by a factor (e.g. design twist ÷ pose twist, under the proportional model).
 * @param motion the motion to scale. @param factor a finite number.
 * @returns factor × every translation and rotation.
 * @example scaleMotion({ t: { x: 1, y: 2, z: 3 }, omega: { x: 0, y: 0, z: 0.001 } }, 2).t.y // => 4
 */
export function scaleMotion(motion: RigidMotion, factor: number): RigidMotion {
  requireFinite('scaleMotion', 'factor', factor);
  const { t, omega } = requireMotion('scaleMotion', 'motion', motion);
  return {
    t: { x: t.x * factor, y: t.y * factor, z: t.z * factor },
    omega: { x: omega.x * factor, y: omega.y * factor, z: omega.z * factor },
  };
}
