// Building blocks of every record schema: the one place for ids, roles, axes and limits.
import * as z from 'zod';
import { roles } from '../permissions';

export const id = z.uuid();
export type { Role } from '../permissions';
export const role = z.enum(roles);

export const axes = ['foreAft', 'lateral', 'vertical'] as const;
export const axis = z.enum(axes);
export type Axis = z.infer<typeof axis>;

export const unitSystem = z.enum(['mm', 'in']);
export type UnitSystem = z.infer<typeof unitSystem>;

/** A length in millimetres: finite, within what a truck can physically show (±20 m). */
export const mm = z.number().finite().min(-20_000).max(20_000);
export const positiveMm = z.number().finite().gt(0).max(20_000);
// PostgreSQL's text refuses the NUL character, and its JSON refuses half of a UTF-16 surrogate
// pair (a kept conflict stores records as JSON): both are refused here, on the phone and on the
// server alike, so no batch that passes validation can fail when it is written.
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

/** Text that PostgreSQL can store, trimmed, at most `max` characters. */
export const text = (max: number, min = 0, tooShort?: string) =>
  z
    .string()
    .trim()
    .min(min, tooShort)
    .max(max)
    .refine((s) => !s.includes('\u0000'), 'must not contain the NUL character (0x00), which cannot be stored')
    .refine((s) => !LONE_SURROGATE.test(s), 'contains a broken character (half of a surrogate pair), which cannot be stored');
export const shortText = (max = 200) => text(max);

// Dates PostgreSQL and every browser read the same way: years 1000 to 9999 (PostgreSQL refuses
// year 0000), and a time-zone offset of at most ±15:59 (PostgreSQL refuses more).
const MIN_YEAR = 1000;
const MAX_YEAR = 9999;
const yearOk = (iso: string) => {
  const year = Number(iso.slice(0, 4));
  return year >= MIN_YEAR && year <= MAX_YEAR;
};
const offsetOk = (iso: string) => {
  const m = /([+-])(\d{2}):(\d{2})$/.exec(iso);
  return !m || Number(m[2]) <= 15;
};
const instantOk = (iso: string) => {
  const year = new Date(iso).getUTCFullYear();
  return year >= MIN_YEAR && year <= MAX_YEAR;
};
export const isoDateTime = z.iso
  .datetime({ offset: true })
  .refine(offsetOk, 'time-zone offset must be at most ±15:59')
  .refine((s) => yearOk(s) && instantOk(s), `year must be between ${MIN_YEAR} and ${MAX_YEAR}`);
export const isoDate = z.iso.date().refine(yearOk, `year must be between ${MIN_YEAR} and ${MAX_YEAR}`);

/** A record's version: PostgreSQL's integer column holds at most 2,147,483,647. */
export const version = z.number().int().min(1).max(2_147_483_647);

/** Every record the field client can create or edit carries these. */
export const syncedFields = {
  id,
  version,
  deletedAt: isoDateTime.nullable().optional(),
};

/** One bad field in an error answer: the path (`body.changes.3.record.poseId`) and what was wrong. */
export const fieldError = z.object({ field: z.string(), message: z.string() });
export type FieldError = z.infer<typeof fieldError>;
