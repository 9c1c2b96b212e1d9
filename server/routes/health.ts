import { Router } from 'express';
import { endpoint } from '../http';
import { databaseUnavailable } from '../middleware/errors';
import { checkDatabase } from '../services/health';

export const healthRouter = Router();

healthRouter.get(
  '/',
  endpoint({ access: 'public' }, async () => {
    // 503 DB_UNAVAILABLE with Retry-After (the error handler adds the header).
    if (!(await checkDatabase())) throw databaseUnavailable();
    return { ok: true, db: 'up' };
  }),
);
