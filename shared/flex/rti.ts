/**
 * Ramp Travel Index (RTI) of a ramp pose.
 *
 * Formula: RTI = 1000 × distance travelled up the ramp ÷ wheelbase (same length unit for both),
 * the distance taken along the ramp at the last point where all tyres still touch. Scores compare
 * only at the same ramp angle (20° usual, 23° and 15° also seen), so record the angle beside it.
 * Source: off-road trade publications.
 *
 * Rounding rule: rampTravelIndex returns the unrounded value (use it for any further arithmetic);
 * roundRti rounds to one decimal, halves away from zero, for display and sheets. Some printed
 * tables truncate instead (659 for 62 in on 94 in); Twistlog rounds (659.6).
 */
import { FlexInputError, requireLength, requirePositiveLength } from './errors';

/**
 * @param distance distance travelled up the ramp (≥ 0). @param wheelbase the wheelbase, same unit (> 0).
 * @returns 1000 × distance ÷ wheelbase, unrounded.
 * @example rampTravelIndex(1500, 2500) // => 600
 */
export function rampTravelIndex(distance: number, wheelbase: number): number {
  requireLength('rampTravelIndex', 'distance', distance);
  if (distance < 0) throw new FlexInputError('rampTravelIndex', 'distance', `must not be negative, got ${distance}`);
  requirePositiveLength('rampTravelIndex', 'wheelbase', wheelbase);
  return (1000 * distance) / wheelbase;
}

/**
 * RTI rounded to one decimal, halves away from zero (RTI is never negative).
 * @param rti an RTI (≥ 0). @returns it to one decimal.
 * @example roundRti(rampTravelIndex(62, 94)) // => 659.6
 */
export function roundRti(rti: number): number {
  if (!Number.isFinite(rti) || rti < 0) {
    throw new FlexInputError('roundRti', 'rti', `must be a finite number ≥ 0, got ${String(rti)}`);
  }
  // The tiny relative nudge keeps a decimal half as written (600.05 is stored as 600.04999…)
  // rounding up, as a person rounding the printed number would.
  return Math.round(rti * 10 * (1 + 1e-12)) / 10;
}
