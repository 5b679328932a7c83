// Fixtures shared by the flex tests (not a test itself): a six-point gauge layout, exact readings
// of a rigid motion at given points, and a plain numerical integration to check values by.
import { predictDisplacement } from './predict-displacement';
import { poseBuffer, type PoseBuffer } from './pose-fit';
import { normalCdf } from './normal';
import { regularizedGammaQ } from './special-functions';
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

/**
 * The readings a rigid motion gives at the points, without noise, per point in axis order.
 * @param motion the motion. @param points where to read. @param axes which axes (default all three).
 * @returns the readings.
 * @example readingsAt(still, SIX_POINTS).length // => 18
 */
export function readingsAt(motion: RigidMotion, points: GaugeLocation[], axes: Axis[] = ['foreAft', 'lateral', 'vertical']): GaugeValue[] {
  const readings: GaugeValue[] = [];
  for (const p of points) {
    const d = predictDisplacement(motion, p.y, p.z);
    const byAxis: Record<Axis, number> = { foreAft: d.dx, lateral: d.dy, vertical: d.dz };
    for (const axis of axes) readings.push({ pointId: p.id, axis, value: byAxis[axis] });
  }
  return readings;
}

/**
 * Composite Simpson rule on [a, b] with `panels` (even) panels: the independent numerical integration
 * the distribution tests check published and library values with (Abramowitz & Stegun 25.4.5).
 * @param f the integrand. @param a from. @param b to. @param panels an even number of panels (default 2000).
 * @returns the integral's approximation.
 * @example simpson((x) => x * x, 0, 3) // => 9
 */
export function simpson(f: (x: number) => number, a: number, b: number, panels = 2000): number {
  const h = (b - a) / panels;
  let sum = f(a) + f(b);
  for (let i = 1; i < panels; i++) sum += (i % 2 === 1 ? 4 : 2) * f(a + i * h);
  return (sum * h) / 3;
}

/**
 * P(T' ≤ t), t > 0, for the noncentral t by another route than noncentralTCdf: T' = (Z + δ)/S ≤ t
 * holds when Z ≤ −δ, or else when χ²_df ≥ df·((Z + δ)/t)², so
 *   P = Φ(−δ) + ∫_{−δ}^{∞} φ(z)·Q(df/2, df·(z + δ)²/(2t²)) dz,
 * integrated over z by Simpson (Johnson, Kotz & Balakrishnan vol. 2, ch. 31, definition).
 * @param t > 0. @param df degrees of freedom. @param delta noncentrality.
 * @returns P(T' ≤ t).
 * @example noncentralTCdfByZ(2, 10, 0) // => 0.963306 (Student t)
 */
export function noncentralTCdfByZ(t: number, df: number, delta: number): number {
  const phi = (z: number) => Math.exp(-0.5 * z * z) / Math.sqrt(2 * Math.PI);
  const tail = (z: number) => phi(z) * regularizedGammaQ(df / 2, (df * (z + delta) ** 2) / (2 * t * t));
  return normalCdf(-delta) + simpson(tail, -delta, 12, 20000);
}

/**
 * A pose's fore-aft readings as the fit takes them.
 * @param points (y, z) of each reading's gauge point. @param values the readings, in the same order.
 * @returns the pose buffer. @example foreAftBuffer([[0, 600]], [2]).value[0] // => 2
 */
export function foreAftBuffer(points: [number, number][], values: number[]): PoseBuffer {
  const b = poseBuffer(points.length);
  points.forEach(([y, z], i) => {
    b.axis[i] = 0;
    b.y[i] = y;
    b.z[i] = z;
    b.value[i] = values[i];
  });
  return b;
}
