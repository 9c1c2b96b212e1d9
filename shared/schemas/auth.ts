import { z } from 'zod';
import { ROLES } from '../constants';
import { idSchema } from './common';

export const roleSchema = z.enum(ROLES);

export const loginInputSchema = z.object({
  email: z.string().trim().toLowerCase().email('must be an e-mail address'),
  password: z.string().min(1, 'is required').max(200, 'is too long'),
});
export type LoginInput = z.infer<typeof loginInputSchema>;

export const userSchema = z.object({
  id: idSchema,
  email: z.string(),
  name: z.string(),
  roles: z.array(roleSchema),
});
export type User = z.infer<typeof userSchema>;

export const loginResultSchema = z.object({ token: z.string(), user: userSchema });
export type LoginResult = z.infer<typeof loginResultSchema>;

/** The signed-in user with the actions the permission map allows them (`shared/permissions.ts`). */
export const meUserSchema = userSchema.extend({ permissions: z.array(z.string()) });
export const meResultSchema = z.object({ user: meUserSchema });
