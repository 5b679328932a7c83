import * as z from 'zod';
import { id, mm, syncedFields, text } from './common';

/** A marked spot on the opening where the gap is read, at (y, z) mm on the body's front wall. */
export const gaugePoint = z.object({
  ...syncedFields,
  vehicleId: id,
  label: text(20, 1),
  yMm: mm,
  zMm: mm,
});
export type GaugePoint = z.infer<typeof gaugePoint>;
