import { Router } from 'express';
import { endpoint } from '../http';
import { listUsers } from '../services/users';

export const usersRouter = Router();

usersRouter.get(
  '/',
  endpoint({ access: 'users.manage' }, ({ actor }) => listUsers(actor)),
);
