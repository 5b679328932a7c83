/**
 * Displacements of one pose from raw gap readings (brief step 1).
 *
 * Formula: displacement = pose reading − baseline reading, per gauge point and axis; the baseline is
 * the level pose. A pose reading with no baseline reading at the same point and axis has no
 * displacement; it is returned in `missingBaseline` for the engineer rather than dropped silently.
 * Source: definition of displacement from a reference state.
 *
 * Example: computeDisplacements([{ pointId: 'P1', axis: 'foreAft', value: 60 }],
 *   [{ pointId: 'P1', axis: 'foreAft', value: 64.5 }]).displacements[0].value // => 4.5
 */
import { FlexInputError, requireLength } from './errors';
import { isAxis, type Reading } from './types';

export interface DisplacementResult {
  displacements: Reading[];
  missingBaseline: Reading[];
}

const FN = 'computeDisplacements';

function checkReadings(field: string, readings: readonly Reading[]): void {
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
}

export function computeDisplacements(baseline: readonly Reading[], pose: readonly Reading[]): DisplacementResult {
  checkReadings('baseline', baseline);
  checkReadings('pose', pose);
  const reference = new Map<string, number>();
  baseline.forEach((reading, i) => {
    const key = `${reading.pointId}\u0000${reading.axis}`;
    if (reference.has(key)) {
      throw new FlexInputError(FN, `baseline[${i}]`, `repeats the reading of point '${reading.pointId}' on axis ${reading.axis}`);
    }
    reference.set(key, reading.value);
  });
  const displacements: Reading[] = [];
  const missingBaseline: Reading[] = [];
  for (const reading of pose) {
    const base = reference.get(`${reading.pointId}\u0000${reading.axis}`);
    if (base === undefined) missingBaseline.push(reading);
    else displacements.push({ pointId: reading.pointId, axis: reading.axis, value: reading.value - base });
  }
  return { displacements, missingBaseline };
}
