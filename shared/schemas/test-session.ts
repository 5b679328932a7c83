import * as z from 'zod';
import { id, isoDate, isoDateTime, shortText, syncedFields } from './common';

/** One test outing of one vehicle. `readingMode` says whether readings are raw gaps or displacements. */
export const testSession = z.object({
  ...syncedFields,
  vehicleId: id,
  title: shortText(120),
  testedOn: isoDate,
  conditions: shortText(),
  loadState: shortText(),
  tyrePressures: shortText(),
  crew: shortText(),
  readingMode: z.enum(['gap', 'displacement']),
  safetyAckAt: isoDateTime.nullable(),
  notes: shortText(4_000),
});
export type TestSession = z.infer<typeof testSession>;
