import type { GaugePoint } from '@shared/schemas';

/**
 * The label a new gauge point gets: the first free letter A–Z, then P27, P28… (the crew marks the
 * opening with the same labels). `nextPointLabel([{ label: 'A' }, { label: 'C' }]) // => 'B'`
 */
export function nextPointLabel(points: Pick<GaugePoint, 'label'>[]): string {
  for (let i = 0; i < 64; i++) {
    const l = i < 26 ? String.fromCharCode(65 + i) : `P${i + 1}`;
    if (!points.some((p) => p.label === l)) return l;
  }
  return `P${points.length + 1}`;
}
