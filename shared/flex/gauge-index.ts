/**
 * Checks a list of gauge point locations and indexes them by id, so readings can find their point.
 *
 * Rules: a non-empty array; each point an object with a string id, unique in the list, and y and z
 * lengths in mm (finite, within ±1 km). Errors name the caller's function and field path.
 * Source: definition (input validation).
 */
import { FlexInputError, requireLength } from './errors';
import type { GaugeLocation } from './types';

/**
 * @param fn the calling function, for the error. @param field the list's field name, e.g. 'gaugePoints'.
 * @param points the gauge point locations.
 * @returns a map from point id to its index in the list.
 * @example indexGaugeLocations('f', 'points', [{ id: 'A', y: 0, z: 700 }]).get('A') // => 0
 */
export function indexGaugeLocations(fn: string, field: string, points: readonly GaugeLocation[]): Map<string, number> {
  if (!Array.isArray(points) || points.length === 0) throw new FlexInputError(fn, field, 'must be a non-empty array');
  const byId = new Map<string, number>();
  points.forEach((point, i) => {
    if (point === null || typeof point !== 'object' || typeof point.id !== 'string') throw new FlexInputError(fn, `${field}[${i}].id`, 'must be a string');
    if (byId.has(point.id)) throw new FlexInputError(fn, `${field}[${i}].id`, `repeats gauge point id '${point.id}'`);
    requireLength(fn, `${field}[${i}].y`, point.y);
    requireLength(fn, `${field}[${i}].z`, point.z);
    byId.set(point.id, i);
  });
  return byId;
}
