// Fixtures shared by the flex tests (not a test itself): a six-point gauge layout and exact
// readings of a rigid motion at given points.
import { predictDisplacement } from './predict-displacement';
import type { Axis, GaugeLocation, GaugeValue, RigidMotion } from './types';

/** Six gauge points two columns by three rows, 30 mm inside a 700 × 900 mm opening 600 mm above the rail. */
export const SIX_POINTS: GaugeLocation[] = [
  { id: 'a', y: 320, z: 1470 },
  { id: 'b', y: -320, z: 1470 },
  { id: 'c', y: -320, z: 1050 },
  { id: 'd', y: -320, z: 630 },
  { id: 'e', y: 320, z: 630 },
  { id: 'f', y: 320, z: 1050 },
];

/** The readings a rigid motion gives at the points, without noise, per point in axis order. */
export function readingsAt(motion: RigidMotion, points: GaugeLocation[], axes: Axis[] = ['foreAft', 'lateral', 'vertical']): GaugeValue[] {
  const readings: GaugeValue[] = [];
  for (const p of points) {
    const d = predictDisplacement(motion, p.y, p.z);
    const byAxis: Record<Axis, number> = { foreAft: d.dx, lateral: d.dy, vertical: d.dz };
    for (const axis of axes) readings.push({ pointId: p.id, axis, value: byAxis[axis] });
  }
  return readings;
}
