import { Router } from 'express';
import { z } from 'zod';
import { endpoint } from '../http';
import { createUser, listUsers, sendPasswordReset, updateUser } from '../services/users';
import { createUserInputSchema, updateUserInputSchema } from '../../shared/schemas/users';
import { idSchema } from '../../shared/schemas/common';

export const usersRouter = Router();

const idParams = z.object({ id: idSchema });

usersRouter.get(
  '/',
  endpoint({ access: 'users.manage' }, ({ actor }) => listUsers(actor)),
);

/** A new account; without `password` the answer carries a temporary one, shown this once. */
usersRouter.post(
  '/',
  endpoint({ access: 'users.manage', body: createUserInputSchema, status: 201 }, ({ actor, body }) => createUser(actor, body)),
);

/** Roles, name, active; `active: false` ends the user's sessions at once. */
usersRouter.patch(
  '/:id',
  endpoint({ access: 'users.manage', params: idParams, body: updateUserInputSchema }, ({ actor, params, body }) =>
    updateUser(actor, params.id, body),
  ),
);

/** E-mails the user a one-time link to set a new password (works once, for `passwordResetHours`). */
usersRouter.post(
  '/:id/password-reset',
  endpoint({ access: 'users.manage', params: idParams }, ({ actor, params }) => sendPasswordReset(actor, params.id)),
);
