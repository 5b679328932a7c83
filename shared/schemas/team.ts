import * as z from 'zod';
import { id, role, text, unitSystem } from './common';

/** Whether photos keep the GPS position read from their EXIF, or lose it at upload. */
export const photoGps = z.enum(['keep', 'drop']);
export type PhotoGps = z.infer<typeof photoGps>;

export const team = z.object({ id, name: text(120, 1), unitSystem, photoGps });
export type Team = z.infer<typeof team>;

/** The workshop's settings an admin changes on the Team page. */
export const teamSettingsInput = z
  .object({
    photoGps: photoGps.optional(),
    /** The workshop's default units: what members see unless they chose their own on the Account page. */
    unitSystem: unitSystem.optional(),
  })
  .strict()
  .refine((s) => s.photoGps !== undefined || s.unitSystem !== undefined, { message: 'name a setting to change: photoGps or unitSystem' });
export type TeamSettingsInput = z.infer<typeof teamSettingsInput>;

export const member = z.object({
  userId: id,
  name: z.string(),
  email: z.email(),
  role,
});
export type Member = z.infer<typeof member>;

export const me = z.object({
  user: z.object({ id, name: z.string(), email: z.email(), unitSystem: unitSystem.nullable() }),
  team,
  role,
});
export type Me = z.infer<typeof me>;

export const signInInput = z.object({
  email: z
    .email()
    .max(254)
    .transform((e) => e.toLowerCase()),
  password: z.string().min(1).max(256),
});
export type SignInInput = z.infer<typeof signInInput>;
