/**
 * Rounds a length up to the next whole multiple of a fabrication increment (e.g. 5 mm, or 6.35 mm
 * = 1/4 in), so the envelope on the fabrication sheet is never below the computed value.
 *
 * Formula: ⌈value / increment⌉ × increment, with a 1e-9 relative tolerance so that a value already on
 * a multiple (203.2 mm on 6.35 mm, stored as 32.000000000000004 increments) stays there, and the
 * result cleaned of binary noise to 1e-9 mm.
 * Source: definition (ceiling to a grid).
 */
import { FlexInputError, requireLength, requirePositiveLength } from './errors';

/**
 * @param value a length in mm (≥ 0). @param increment the fabrication increment in mm (> 0).
 * @returns the smallest whole multiple of the increment at or above the value.
 * @example roundUpToIncrement(181.2, 5) // => 185 ; roundUpToIncrement(203.2, 6.35) // => 203.2
 */
export function roundUpToIncrement(value: number, increment: number): number {
  requireLength('roundUpToIncrement', 'value', value);
  requirePositiveLength('roundUpToIncrement', 'increment', increment);
  if (value < 0) throw new FlexInputError('roundUpToIncrement', 'value', `must not be negative, got ${value}`);
  const steps = Math.max(0, Math.ceil(value / increment - 1e-9));
  return Math.round(steps * increment * 1e9) / 1e9;
}
