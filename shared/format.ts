// The one number formatting of the desk: the screen, the fabrication sheet (PDF) and the CSV exports
// all print through these functions, so the same value reads the same everywhere.
// Lengths arrive in mm and are shown in the team's or user's unit (1 in = 25.4 mm exactly, see
// units.ts): 1 decimal in mm, 2 in inches (a 0.5 mm reading resolution is about 0.02 in).
import type { UnitSystem } from './schemas/common';
import { toDisplay } from './units';

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
