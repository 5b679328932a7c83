import * as z from 'zod';
import { id, isoDateTime, syncedFields, text } from './common';

/** A photo as the server describes it after upload (the file itself travels separately). */
export const photo = z.object({
  ...syncedFields,
  sessionId: id,
  poseId: id.nullable(),
  caption: text(500),
  mime: z.string(),
  width: z.number().int(),
  height: z.number().int(),
  bytes: z.number().int(),
  capturedAt: isoDateTime.nullable(),
  hasGps: z.boolean(),
});
export type Photo = z.infer<typeof photo>;
