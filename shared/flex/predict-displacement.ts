/**
 * Displacement of the cab relative to the body at a point (y, z) of the front wall (x = 0),
 * from a small-angle rigid motion.
 *
 * Formula: d = t + omega × r with r = (0, y, z):
 *   dx = tx + wy·z − wz·y ;  dy = ty − wx·z ;  dz = tz + wx·y.
 * Source: small-rotation kinematics of a rigid body (e.g. Goldstein, Classical Mechanics, §4.8).
 *
 * Example: predictDisplacement({ t: { x: 0, y: 2, z: 0 }, omega: { x: 0.01, y: 0, z: 0 } }, 500, 1000)
 *   // => { dx: 0, dy: -8, dz: 5 }
 */
import type { Displacement, RigidMotion } from './types';

export function predictDisplacement(motion: RigidMotion, y: number, z: number): Displacement {
  const { t, omega } = motion;
  return {
    dx: t.x + omega.y * z - omega.z * y,
    dy: t.y - omega.x * z,
    dz: t.z + omega.x * y,
  };
}

/** The same motion scaled by a factor (e.g. design twist ÷ pose twist, under the proportional model). */
export function scaleMotion(motion: RigidMotion, factor: number): RigidMotion {
  const { t, omega } = motion;
  return {
    t: { x: t.x * factor, y: t.y * factor, z: t.z * factor },
    omega: { x: omega.x * factor, y: omega.y * factor, z: omega.z * factor },
  };
}
