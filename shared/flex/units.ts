/**
 * Length conversion between millimetres (how Twistlog stores and computes) and inches.
 *
 * Formula: 1 in = 25.4 mm exactly.
 * Source: NIST SP 811 (2008), Appendix B.8 (the 1959 international yard and pound).
 *
 * Example: inToMm(8) // => 203.2 ; mmToIn(203.2) // => 8
 */
const MM_PER_INCH = 25.4;

export function mmToIn(mm: number): number {
  return mm / MM_PER_INCH;
}

export function inToMm(inches: number): number {
  return inches * MM_PER_INCH;
}
