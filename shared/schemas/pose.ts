import * as z from 'zod';
import { id, isoDateTime, mm, shortText, syncedFields } from './common';

/**
 * One wheel arrangement held still while readings are taken. Lifts are how far each wheel is
 * raised (negative for a dip); a ramp pose records the ramp angle and the distance travelled up it.
 * The level pose (kind 'level', seq 0) is the session's baseline.
 */
export const pose = z
  .object({
    ...syncedFields,
    sessionId: id,
    seq: z.number().int().min(0).max(10_000),
    label: shortText(80),
    kind: z.enum(['level', 'wheels', 'ramp']),
    liftFlMm: mm,
    liftFrMm: mm,
    liftRlMm: mm,
    liftRrMm: mm,
    rampAngleDeg: z.number().finite().gt(0).lt(90).nullable(),
    rampDistanceMm: z.number().finite().min(0).max(20_000).nullable(),
    notes: shortText(2_000),
    recordedAt: isoDateTime,
  })
  .refine((p) => p.kind !== 'ramp' || (p.rampAngleDeg != null && p.rampDistanceMm != null), {
    message: 'a ramp pose needs the ramp angle and the distance travelled',
    path: ['rampDistanceMm'],
  });
export type Pose = z.infer<typeof pose>;
