import * as z from 'zod';
import { id, mm, syncedFields } from './common';

/** A marked spot on the opening where the gap is read, at (y, z) mm on the body's front wall. */
export const gaugePoint = z.object({
  ...syncedFields,
  vehicleId: id,
  label: z.string().trim().min(1).max(20),
  yMm: mm,
  zMm: mm,
});
export type GaugePoint = z.infer<typeof gaugePoint>;
