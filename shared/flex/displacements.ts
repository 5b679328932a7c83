/**
 * Displacements of one pose from raw gap readings (docs/method.md §1).
 *
 * Formula: displacement = pose reading − baseline reading, per gauge point and axis; the baseline is
 * the reference (usually level) pose. A pose reading with no baseline reading at the same point and
 * axis has no displacement; it is returned in `missingBaseline` for the engineer rather than dropped
 * silently. A point and axis read twice in one pose is refused: which reading counts is unclear.
 * Source: definition of displacement from a reference state.
 */
import { FlexInputError, requireLength } from './errors';
import { isAxis, type GaugeValue } from './types';

export interface DisplacementResult {
  displacements: GaugeValue[];
  missingBaseline: GaugeValue[];
}

const FN = 'computeDisplacements';

function checkReadings(field: string, readings: readonly GaugeValue[]): void {
  if (!Array.isArray(readings)) throw new FlexInputError(FN, field, 'must be an array');
  readings.forEach((reading, i) => {
    if (reading === null || typeof reading !== 'object' || typeof reading.pointId !== 'string') {
      throw new FlexInputError(FN, `${field}[${i}].pointId`, 'must be a string');
    }
    if (!isAxis(reading.axis)) {
      throw new FlexInputError(FN, `${field}[${i}].axis`, `must be 'foreAft', 'lateral' or 'vertical', got '${String(reading.axis)}'`);
    }
    requireLength(FN, `${field}[${i}].value`, reading.value);
  });
  const seen = new Set<string>();
  readings.forEach((reading, i) => {
    const key = `${reading.pointId}\u0000${reading.axis}`;
    if (seen.has(key)) throw new FlexInputError(FN, `${field}[${i}]`, `repeats the reading of point '${reading.pointId}' on axis ${reading.axis}`);
    seen.add(key);
  });
}

/**
 * @param baseline the reference pose's raw gaps. @param pose the pose's raw gaps.
 * @returns the displacements, and the pose readings without a baseline reading.
 * @example computeDisplacements([{ pointId: 'P1', axis: 'foreAft', value: 60 }],
 *   [{ pointId: 'P1', axis: 'foreAft', value: 64.5 }]).displacements[0].value // => 4.5
 */
export function computeDisplacements(baseline: readonly GaugeValue[], pose: readonly GaugeValue[]): DisplacementResult {
  checkReadings('baseline', baseline);
  checkReadings('pose', pose);
  const reference = new Map<string, number>();
  for (const reading of baseline) reference.set(`${reading.pointId}\u0000${reading.axis}`, reading.value);
  const displacements: GaugeValue[] = [];
  const missingBaseline: GaugeValue[] = [];
  for (const reading of pose) {
    const base = reference.get(`${reading.pointId}\u0000${reading.axis}`);
    if (base === undefined) missingBaseline.push(reading);
    else displacements.push({ pointId: reading.pointId, axis: reading.axis, value: reading.value - base });
  }
  return { displacements, missingBaseline };
}
