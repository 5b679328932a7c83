// The one number formatting of the desk: the screen, the fabrication sheet (PDF) and the CSV exports
// all print through these functions, so the same value reads the same everywhere.
// Lengths arrive in mm and are shown in the team's or user's unit (1 in = 25.4 mm exactly, see
// units.ts): 1 decimal in mm, 2 in inches (a 0.5 mm reading resolution is about 0.02 in).
import type { UnitSystem } from './schemas/common';
import type { LengthWords } from './flex/length-words';
import { MM_PER_IN, toDisplay } from './units';

const LENGTH_DIGITS: Record<UnitSystem, number> = { mm: 1, in: 2 };

function fixed(value: number, digits: number): string {
  // Never print "-0.0": a value that rounds to zero has no direction.
  const text = value.toFixed(digits);
  return Number(text) === 0 ? (0).toFixed(digits) : text;
}

/** A length as a bare number in the display unit: `formatLengthValue(95, 'in') // => '3.74'`. */
export function formatLengthValue(mm: number, unit: UnitSystem): string {
  return fixed(toDisplay(mm, unit), LENGTH_DIGITS[unit]);
}

/** A length with its unit: `formatLength(95, 'mm') // => '95.0 mm'`. */
export function formatLength(mm: number, unit: UnitSystem): string {
  return `${formatLengthValue(mm, unit)} ${unit}`;
}

/** Sixteenths of an inch: the finest mark on a workshop tape in inches (common practice). */
const SIXTEENTHS = 16;

function gcd(a: number, b: number): number {
  return b === 0 ? a : gcd(b, a % b);
}

/**
 * A length as the nearest 1/16 in, as a tape reads it: `formatInchFraction(184.15) // => '7 1/4 in'`,
 * `formatInchFraction(7.9375) // => '5/16 in'`, `formatInchFraction(-34.925) // => '−1 3/8 in'`.
 */
export function formatInchFraction(mm: number): string {
  const sixteenths = Math.round((Math.abs(mm) / MM_PER_IN) * SIXTEENTHS);
  if (sixteenths === 0) return '0 in';
  const whole = Math.floor(sixteenths / SIXTEENTHS);
  const rest = sixteenths % SIXTEENTHS;
  const d = gcd(rest, SIXTEENTHS);
  const fraction = rest === 0 ? '' : `${rest / d}/${SIXTEENTHS / d}`;
  return `${mm < 0 ? '−' : ''}${[whole > 0 ? String(whole) : '', fraction].filter(Boolean).join(' ')} in`;
}

/** Whether a length is a whole number of sixteenths of an inch (an increment chosen in inches). */
function isInchFraction(mm: number): boolean {
  const n = (mm / MM_PER_IN) * SIXTEENTHS;
  return Math.abs(n - Math.round(n)) < 1e-6;
}

/**
 * A figure to build to, as the sheet prints it: in inches the decimal and the nearest 1/16 in
 * (`formatBuildLength(184.15, 'in') // => '7.25 in (7 1/4 in)'`), in mm as on screen.
 */
export function formatBuildLength(mm: number, unit: UnitSystem): string {
  return unit === 'in' ? `${formatLength(mm, 'in')} (${formatInchFraction(mm)})` : formatLength(mm, 'mm');
}

/**
 * A fabrication increment as the engineer chose it: an increment chosen in inches reads as a
 * fraction (`1/4 in`), one chosen in mm as mm, with its inch value beside it for an inch reader
 * (`5 mm (0.20 in)`), never as a bare "0.20 in" that nobody would choose.
 */
export function formatIncrement(mm: number, unit: UnitSystem): string {
  const inMm = `${Number(mm.toFixed(3))} mm`;
  if (unit === 'in') return isInchFraction(mm) ? formatInchFraction(mm) : `${inMm} (${formatLength(mm, 'in')})`;
  const chosenInInches = isInchFraction(mm) && !Number.isInteger(Number(mm.toFixed(6)));
  return chosenInInches ? `${inMm} (${formatInchFraction(mm)})` : inMm;
}

/** How the computation's sentences write lengths for a reader of `unit` (see shared/flex/length-words.ts). */
export function lengthWords(unit: UnitSystem): LengthWords {
  return {
    length: (mm) => formatLength(mm, unit),
    fine: (mm) => `${fixed(toDisplay(mm, unit), unit === 'mm' ? 2 : 3)} ${unit}`,
    increment: (mm) => formatIncrement(mm, unit),
  };
}

/** The unit in words, for a sentence: "Lengths in inches". */
export const UNIT_WORDS: Record<UnitSystem, string> = { mm: 'millimetres (mm)', in: 'inches (in)' };

/** An angle in degrees, bare: `formatDegValue(8.94) // => '8.9'`. */
export function formatDegValue(deg: number): string {
  return fixed(deg, 1);
}

export function formatDeg(deg: number): string {
  return `${formatDegValue(deg)}°`;
}

/** Slope of displacement on twist, bare, per degree: mm/° with 2 decimals, in/° with 3. */
export function formatSlopeValue(mmPerDeg: number | null, unit: UnitSystem): string {
  if (mmPerDeg === null) return '—';
  return fixed(toDisplay(mmPerDeg, unit), unit === 'mm' ? 2 : 3);
}

export function formatSlope(mmPerDeg: number | null, unit: UnitSystem): string {
  return mmPerDeg === null ? '—' : `${formatSlopeValue(mmPerDeg, unit)} ${unit}/°`;
}

/** A fraction as a percentage: `formatPercent(0.15) // => '15 %'`. */
export function formatPercent(fraction: number, digits = 0): string {
  return `${fixed(fraction * 100, digits)} %`;
}

/** A ratio such as a boot's extension ratio: `formatRatio(1.234) // => '1.23'`. */
export function formatRatio(ratio: number | null): string {
  return ratio === null ? '—' : fixed(ratio, 2);
}

/** A timestamp for people: ISO date and UTC time to the minute, the same in every output. */
export function formatTimestamp(iso: string): string {
  return `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`;
}

export const AXIS_NAMES = { foreAft: 'fore-aft', lateral: 'lateral', vertical: 'vertical' } as const;
export const SIDE_NAMES = { top: 'top', bottom: 'bottom', left: 'left (+y)', right: 'right (−y)' } as const;
/** The envelope's measures: the fore-aft gap's opening and closing apart, then shear and vertical. */
export const MEASURE_NAMES = {
  foreAftOpening: 'fore-aft, gap opening',
  foreAftClosing: 'fore-aft, gap closing',
  lateral: 'lateral',
  vertical: 'vertical',
} as const;
/** How a measure's envelope reads: the gap opens by up to +x, closes by up to −x; shear goes either way. */
export const MEASURE_SIGNS = { foreAftOpening: '+', foreAftClosing: '−', lateral: '±', vertical: '±' } as const;
