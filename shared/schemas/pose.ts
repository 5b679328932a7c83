import * as z from 'zod';
import { id, isoDateTime, mm, shortText, syncedFields } from './common';
import { rampLiftMm } from '../flex/ramp-lift';

export const wheels = ['fl', 'fr', 'rl', 'rr'] as const;
export const wheel = z.enum(wheels);
export type Wheel = z.infer<typeof wheel>;

/** The pose field that holds each wheel's lift. */
export const liftKeyOf = { fl: 'liftFlMm', fr: 'liftFrMm', rl: 'liftRlMm', rr: 'liftRrMm' } as const satisfies Record<Wheel, string>;

/** How far the stored lift of the wheel on a ramp may differ from distance × sin(angle): below a tape's reading. */
export const RAMP_LIFT_TOLERANCE_MM = 0.5;

/**
 * One wheel arrangement held still while readings are taken. Lifts are how far each wheel is
 * raised (negative for a dip); a ramp pose records the ramp angle, the distance travelled up it
 * and which wheel is on it, whose lift is then distance × sin(angle) (shared/flex/ramp-lift.ts).
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
    // Poses recorded before the wheel was asked (on a phone, in a waiting batch, on the server)
    // carry no wheel: null, and their lifts stand as typed.
    rampWheel: wheel.nullable().default(null),
    notes: shortText(2_000),
    recordedAt: isoDateTime,
  })
  .refine((p) => p.kind !== 'ramp' || (p.rampAngleDeg != null && p.rampDistanceMm != null), {
    message: 'a ramp pose needs the ramp angle and the distance travelled',
    path: ['rampDistanceMm'],
  })
  .superRefine((p, ctx) => {
    if (p.kind !== 'ramp' || p.rampWheel == null || p.rampAngleDeg == null || p.rampDistanceMm == null) return;
    const key = liftKeyOf[p.rampWheel];
    if (Math.abs(p[key] - rampLiftMm(p.rampDistanceMm, p.rampAngleDeg)) > RAMP_LIFT_TOLERANCE_MM) {
      ctx.addIssue({ code: 'custom', path: [key], message: 'the lift of the wheel on the ramp must be the distance up the ramp × sin(ramp angle)' });
    }
  });
export type Pose = z.infer<typeof pose>;
