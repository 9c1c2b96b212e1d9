import { Router } from 'express';
import { authRouter } from './auth';
import { healthRouter } from './health';

/** Every API router, mounted under /api. Add a domain's router here. */
export const apiRouter = Router();

apiRouter.use('/health', healthRouter);
apiRouter.use('/auth', authRouter);
