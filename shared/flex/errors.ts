/**
 * FlexInputError: the one error the flex computation throws for bad input, and the checks that
 * raise it.
 *
 * Every check names the function and the field, so a caller (a form, an API route, a test) can
 * show the message as-is or map `field` onto the input that needs fixing.
 *
 * Example: new FlexInputError('rampTravelIndex', 'wheelbase', 'must be greater than 0, got -1')
 *   .message // => 'rampTravelIndex: wheelbase must be greater than 0, got -1'
 */
import type { RigidMotion } from './types';

export class FlexInputError extends Error {
  readonly fn: string;
  readonly field: string;
  /** What was wrong, without the function and field: lets a caller re-raise under its own names. */
  readonly problem: string;

  /**
   * @param fn the function that refused its input, e.g. 'designEnvelope'.
   * @param field the path of the bad field inside that function's input, e.g. 'poses[2].lifts.fl'.
   * @param problem what is wrong with it, e.g. 'must be a finite number, got NaN'.
   * @example new FlexInputError('linearFit', 'xs', 'are all 0').message // => 'linearFit: xs are all 0'
   */
  constructor(fn: string, field: string, problem: string) {
    super(`${fn}: ${field} ${problem}`);
    this.name = 'FlexInputError';
    this.fn = fn;
    this.field = field;
    this.problem = problem;
  }
}

/**
 * Largest magnitude accepted for a length in mm (1 km). Larger values are typing errors, and
 * bounding inputs keeps every square and sum finite, so no result can overflow to NaN.
 */
export const MAX_ABS_MM = 1e6;

/** Rotations beyond half a radian are far outside the small-angle model of a rigid motion. */
export const MAX_ROTATION_RAD = 0.5;

/**
 * The fast test behind requireLength, for hot loops that name a field only once a value fails.
 * @param value anything. @returns true for a finite number within ±MAX_ABS_MM.
 * @example isLength(60) // => true ; isLength('60') // => false
 */
export function isLength(value: unknown): value is number {
  return typeof value === 'number' && Math.abs(value) <= MAX_ABS_MM;
}

/**
 * @param fn function name for the error. @param field field path for the error.
 * @param value the number to check.
 * @returns value, when it is a finite number.
 * @example requireFinite('f', 'x', 2) // => 2 ; requireFinite('f', 'x', NaN) throws
 */
export function requireFinite(fn: string, field: string, value: number): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new FlexInputError(fn, field, `must be a finite number, got ${String(value)}`);
  }
  return value;
}

/**
 * A length in mm: finite and within ±MAX_ABS_MM.
 * @param fn function name for the error. @param field field path for the error. @param value the number to check.
 * @returns value. @example requireLength('f', 'gap', 60) // => 60
 */
export function requireLength(fn: string, field: string, value: number): number {
  requireFinite(fn, field, value);
  if (Math.abs(value) > MAX_ABS_MM) {
    throw new FlexInputError(fn, field, `must be within ±${MAX_ABS_MM} mm, got ${value}`);
  }
  return value;
}

/**
 * A length in mm greater than 0.
 * @param fn function name for the error. @param field field path for the error. @param value the number to check.
 * @returns value. @example requirePositiveLength('f', 'track', 1900) // => 1900
 */
export function requirePositiveLength(fn: string, field: string, value: number): number {
  requireLength(fn, field, value);
  if (value <= 0) throw new FlexInputError(fn, field, `must be greater than 0, got ${value}`);
  return value;
}

/**
 * A finite number ≥ 0.
 * @param fn function name for the error. @param field field path for the error. @param value the number to check.
 * @returns value. @example requireNonNegative('f', 'margin', 0.15) // => 0.15
 */
export function requireNonNegative(fn: string, field: string, value: number): number {
  requireFinite(fn, field, value);
  if (value < 0) throw new FlexInputError(fn, field, `must not be negative, got ${value}`);
  return value;
}

/**
 * A probability for a quantile. Values closer than 1e-10 to 0 or 1 have no use in design and
 * would push the quantile searches towards infinity.
 * @param fn function name for the error. @param field field path for the error. @param value the probability.
 * @returns value. @example requireProbability('f', 'p', 0.975) // => 0.975
 */
export function requireProbability(fn: string, field: string, value: number): number {
  requireFinite(fn, field, value);
  if (value < 1e-10 || value > 1 - 1e-10) {
    throw new FlexInputError(fn, field, `must be strictly between 0 and 1, got ${value}`);
  }
  return value;
}

/**
 * A confidence or coverage of a design bound: at least 0.5 and below 1. Below 0.5 a "bound" would
 * sit under the expected value (a negative tolerance factor), which no design can use.
 * @param fn function name for the error. @param field field path for the error. @param value the probability.
 * @returns value. @example requireDesignProbability('f', 'confidence', 0.95) // => 0.95
 */
export function requireDesignProbability(fn: string, field: string, value: number): number {
  requireFinite(fn, field, value);
  if (value < 0.5 || value > 1 - 1e-10) {
    throw new FlexInputError(fn, field, `must be at least 0.5 and below 1 (e.g. 0.95), got ${value}`);
  }
  return value;
}

function isSmallRotation(w: unknown): boolean {
  return typeof w === 'number' && Math.abs(w) <= MAX_ROTATION_RAD;
}

/**
 * A small-angle rigid motion: translations are lengths, rotations finite and within
 * ±MAX_ROTATION_RAD.
 * @param fn function name for the error. @param field field path of the motion, e.g. 'motion'.
 * @returns the motion.
 * @example requireMotion('f', 'motion', { t: { x: 0, y: 5, z: 0 }, omega: { x: 0, y: 0, z: 0 } })
 */
export function requireMotion(fn: string, field: string, motion: RigidMotion): RigidMotion {
  if (motion === null || typeof motion !== 'object' || motion.t == null || motion.omega == null) {
    throw new FlexInputError(fn, field, 'must have t and omega');
  }
  const { t, omega } = motion;
  // The common case passes without building a field name; a failure is named below.
  if (isLength(t.x) && isLength(t.y) && isLength(t.z) && isSmallRotation(omega.x) && isSmallRotation(omega.y) && isSmallRotation(omega.z)) return motion;
  for (const k of ['x', 'y', 'z'] as const) {
    requireLength(fn, `${field}.t.${k}`, motion.t[k]);
    requireFinite(fn, `${field}.omega.${k}`, motion.omega[k]);
    if (Math.abs(motion.omega[k]) > MAX_ROTATION_RAD) {
      throw new FlexInputError(fn, `${field}.omega.${k}`, `must be within ±${MAX_ROTATION_RAD} rad (small angles), got ${motion.omega[k]}`);
    }
  }
  return motion;
}
