import * as z from 'zod';
import { id, role, unitSystem } from './common';

export const team = z.object({ id, name: z.string().trim().min(1).max(120), unitSystem });
export type Team = z.infer<typeof team>;

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
  email: z.email().max(254).transform((e) => e.toLowerCase()),
  password: z.string().min(1).max(256),
});
export type SignInInput = z.infer<typeof signInInput>;
