import { Router } from 'express';
import { endpoint } from '../http';
import { checkDatabase } from '../services/health';

export const healthRouter = Router();

healthRouter.get(
  '/',
  endpoint({ access: 'public' }, async ({ res }) => {
    const up = await checkDatabase();
    if (!up) {
      res.status(503).json({ error: { code: 'DB_DOWN', message: 'The database is not answering.' } });
      return undefined;
    }
    return { ok: true, db: 'up' };
  }),
);
