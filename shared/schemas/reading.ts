import * as z from 'zod';
import { axis, id, mm, syncedFields, text } from './common';

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
