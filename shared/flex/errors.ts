/**
 * FlexInputError: the one error the flex computation throws for bad input.
 *
 * Every check names the function and the field, so a caller (a form, an API route, a test) can
 * show the message as-is or map `field` onto the input that needs fixing.
 *
 * Example: new FlexInputError('rampTravelIndex', 'wheelbase', 'must be greater than 0, got -1')
 *   .message // => 'rampTravelIndex: wheelbase must be greater than 0, got -1'
 */
export class FlexInputError extends Error {
  readonly fn: string;
  readonly field: string;
  /** What was wrong, without the function and field: lets a caller re-raise under its own names. */
  readonly problem: string;

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

export function requireFinite(fn: string, field: string, value: number): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new FlexInputError(fn, field, `must be a finite number, got ${String(value)}`);
  }
  return value;
}

/** A length in mm: finite and within ±MAX_ABS_MM. */
export function requireLength(fn: string, field: string, value: number): number {
  requireFinite(fn, field, value);
  if (Math.abs(value) > MAX_ABS_MM) {
    throw new FlexInputError(fn, field, `must be within ±${MAX_ABS_MM} mm, got ${value}`);
  }
  return value;
}

export function requirePositiveLength(fn: string, field: string, value: number): number {
  requireLength(fn, field, value);
  if (value <= 0) throw new FlexInputError(fn, field, `must be greater than 0, got ${value}`);
  return value;
}

export function requireNonNegative(fn: string, field: string, value: number): number {
  requireFinite(fn, field, value);
  if (value < 0) throw new FlexInputError(fn, field, `must not be negative, got ${value}`);
  return value;
}

/**
 * A probability for a quantile, confidence or coverage. Values closer than 1e-10 to 0 or 1 have
 * no use in design and would push the quantile searches towards infinity.
 */
export function requireProbability(fn: string, field: string, value: number): number {
  requireFinite(fn, field, value);
  if (value < 1e-10 || value > 1 - 1e-10) {
    throw new FlexInputError(fn, field, `must be strictly between 0 and 1, got ${value}`);
  }
  return value;
}
