// A reading: one value at one gauge point on one axis in one pose.
import * as z from 'zod';
import { axis, id, mm, syncedFields, text } from '../schemas/common';
import { defineRecord } from './define';

/** One value at one gauge point on one axis in one pose, in millimetres. */
export const reading = z
  .object({
    ...syncedFields,
    poseId: id,
    gaugePointId: id,
    axis,
    valueMm: mm,
    excluded: z.boolean(),
    excludeReason: text(500).nullable(),
    flagNote: text(500).nullable(),
  })
  .refine((r) => !r.excluded || (r.excludeReason ?? '').length > 0, {
    message: 'excluding a reading needs a reason',
    path: ['excludeReason'],
  });
export type Reading = z.infer<typeof reading>;

export const readingRecord = defineRecord({
  entity: 'reading',
  schema: reading,
  table: 'readings',
  columns: {
    poseId: 'uuid',
    gaugePointId: 'uuid',
    axis: 'text',
    valueMm: 'float8',
    excluded: 'bool',
    excludeReason: 'text',
    flagNote: 'text',
  },
  references: { poseId: 'pose', gaugePointId: 'gaugePoint' },
  createdBy: 'enteredBy',
  serverColumns: {},
  dexie: { table: 'readings', indexes: ['poseId', '[poseId+gaugePointId+axis]'] },
  pullKey: 'readings',
});

/** A new reading in one slot (pose, gauge point, axis), not excluded or flagged. */
export function newReading(fields: Pick<Reading, 'poseId' | 'gaugePointId' | 'axis' | 'valueMm'> & Partial<Reading>): Reading {
  return { id: crypto.randomUUID(), version: 1, excluded: false, excludeReason: null, flagNote: null, ...fields };
}
