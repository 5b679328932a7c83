// Building blocks of every record schema: the one place for ids, roles, axes and limits.
import * as z from 'zod';

export const id = z.uuid();
export const roles = ['admin', 'engineer', 'tester', 'viewer'] as const;
export const role = z.enum(roles);
export type Role = z.infer<typeof role>;

export const axes = ['foreAft', 'lateral', 'vertical'] as const;
export const axis = z.enum(axes);
export type Axis = z.infer<typeof axis>;

export const unitSystem = z.enum(['mm', 'in']);
export type UnitSystem = z.infer<typeof unitSystem>;

/** A length in millimetres: finite, within what a truck can physically show (±20 m). */
export const mm = z.number().finite().min(-20_000).max(20_000);
export const positiveMm = z.number().finite().gt(0).max(20_000);
export const shortText = (max = 200) => z.string().trim().max(max);
export const isoDateTime = z.iso.datetime({ offset: true });
export const isoDate = z.iso.date();

/** Every record the field client can create or edit carries these. */
export const syncedFields = {
  id,
  version: z.number().int().min(1),
  deletedAt: isoDateTime.nullable().optional(),
};

/** One bad field in an error answer: the path (`body.changes.3.record.poseId`) and what was wrong. */
export interface FieldError {
  field: string;
  message: string;
}
