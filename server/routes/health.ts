import { Router } from 'express';
import { endpoint } from '../http';
import { AppError } from '../errors';
import { checkDatabase } from '../services/health';

export const healthRouter = Router();

healthRouter.get(
  '/',
  endpoint({ access: 'public' }, async () => {
    const up = await checkDatabase();
    if (!up) throw new AppError('DB_DOWN', 'The database is not answering.');
    return { ok: true, db: 'up' };
  }),
);
