/**
 * Length conversion between millimetres (how Twistlog stores and computes) and inches.
 *
 * Formula: 1 in = 25.4 mm exactly.
 * Source: NIST SP 811 (2008), Appendix B.8 (the 1959 international yard and pound).
 */
const MM_PER_INCH = 25.4;

/**
 * @param mm a length in millimetres. @returns it in inches.
 * @example mmToIn(203.2) // => 8
 */
export function mmToIn(mm: number): number {
  return mm / MM_PER_INCH;
}

/**
 * @param inches a length in inches. @returns it in millimetres.
 * @example inToMm(8) // => 203.2
 */
export function inToMm(inches: number): number {
  return inches * MM_PER_INCH;
}
