import { z } from 'zod';
import { listOf } from './common';
import { userSchema } from './auth';

/** A person with an account, as the admin's user list shows it. */
export const userListItemSchema = userSchema.extend({ active: z.boolean() });
export type UserListItem = z.infer<typeof userListItemSchema>;

/** GET /api/users → {items: [UserListItem]} (admin only). */
export const userListSchema = listOf(userListItemSchema);
export type UserList = z.infer<typeof userListSchema>;
