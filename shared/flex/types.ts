/**
 * Shared types of the flex computation. Lengths in mm, angles in degrees unless a name says rad.
 *
 * Axes follow ISO 8855 vehicle axes: x forward, y left, z up. Gauge points sit on the body's front
 * wall (plane x = 0), located by y from the vehicle centreline and z from the top of the frame rail.
 * A reading is the cab's displacement relative to the body: fore-aft dx (+ = gap opens),
 * lateral dy (+ = cab moves left), vertical dz (+ = cab moves up).
 */
export type Axis = 'foreAft' | 'lateral' | 'vertical';

export const AXES: readonly Axis[] = ['foreAft', 'lateral', 'vertical'];

/** Where a gauge point sits on the front wall (named apart from the gauge point record of shared/schemas). */
export interface GaugeLocation {
  id: string;
  /** mm from the vehicle centreline, + to the left. */
  y: number;
  /** mm above the top of the frame rail. */
  z: number;
}

/** One value at one gauge point on one axis: a raw gap or a displacement, in mm (named apart from the reading record of shared/schemas). */
export interface GaugeValue {
  pointId: string;
  axis: Axis;
  value: number;
}

/** How much of one part of a relative-motion fit (out-of-plane or in-plane) the readings determine. */
export type FitPartStatus = 'full' | 'partial' | 'translationOnly' | 'none';

export interface Vec3 {
  x: number;
  y: number;
  z: number;
}

/** Small-angle rigid motion of the cab relative to the body: translation t (mm), rotation omega (rad). */
export interface RigidMotion {
  t: Vec3;
  omega: Vec3;
}

/** Wheel lifts in mm (negative for a dip): front left, front right, rear left, rear right. */
export interface WheelLifts {
  fl: number;
  fr: number;
  rl: number;
  rr: number;
}

export interface Displacement {
  dx: number;
  dy: number;
  dz: number;
}

/**
 * Whether a value names one of the three axes.
 * @param value anything, e.g. a field of parsed input.
 * @returns true for 'foreAft', 'lateral' or 'vertical'.
 * @example isAxis('lateral') // => true ; isAxis('x') // => false
 */
export function isAxis(value: unknown): value is Axis {
  return value === 'foreAft' || value === 'lateral' || value === 'vertical';
}
