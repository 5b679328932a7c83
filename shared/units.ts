// Display units: everything is stored and computed in millimetres; inches only at the edges.
// 1 in = 25.4 mm exactly (NIST SP 811, 2008, Appendix B.8).
import type { UnitSystem } from './schemas/common';

export const MM_PER_IN = 25.4;

export function toDisplay(mm: number, unit: UnitSystem): number {
  return unit === 'in' ? mm / MM_PER_IN : mm;
}

export function fromDisplay(value: number, unit: UnitSystem): number {
  return unit === 'in' ? value * MM_PER_IN : value;
}

export function formatLength(mm: number, unit: UnitSystem, digits = unit === 'in' ? 2 : 1): string {
  return `${toDisplay(mm, unit).toFixed(digits)} ${unit}`;
}
