import * as z from 'zod';
import { positiveMm, shortText, syncedFields, text } from './common';

/**
 * The pass-through opening on the body's front wall (plane x = 0): a rectangle with rounded
 * corners, located by its centre's y (from the vehicle centreline, + = left) and its bottom edge's
 * z (from the top of the frame rail, + = up), ISO 8855 axes.
 */
export const opening = z
  .object({
    widthMm: positiveMm,
    heightMm: positiveMm,
    cornerRadiusMm: z.number().finite().min(0).max(5_000),
    centreYMm: z.number().finite().min(-5_000).max(5_000),
    bottomZMm: z.number().finite().min(-5_000).max(10_000),
  })
  .refine((o) => o.cornerRadiusMm * 2 <= Math.min(o.widthMm, o.heightMm), {
    message: 'corner radius must be at most half the smaller side',
    path: ['cornerRadiusMm'],
  });
export type Opening = z.infer<typeof opening>;

export const vehicle = z.object({
  ...syncedFields,
  name: text(120, 1),
  chassis: shortText(),
  body: shortText(),
  wheelbaseMm: positiveMm,
  trackFrontMm: positiveMm,
  trackRearMm: positiveMm,
  opening,
  nominalGapMm: z.number().finite().min(0).max(2_000),
  notes: shortText(4_000),
});
export type Vehicle = z.infer<typeof vehicle>;
