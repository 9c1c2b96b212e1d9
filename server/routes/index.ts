import { Router } from 'express';
import { authRouter } from './auth';
import { healthRouter } from './health';
import { traceRouter } from './trace';
import { defectsRouter } from './defects';
import { testsRouter } from './tests';
import { driversRouter } from './drivers';

/** Every API router, mounted under /api. Add a domain's router here. */
export const apiRouter = Router();

apiRouter.use('/health', healthRouter);
apiRouter.use('/auth', authRouter);
// Genealogy traces (/drivers/:serial/trace, /lots/:id/trace…) before the /lots and /drivers routers.
apiRouter.use(traceRouter);
apiRouter.use('/defect-codes', defectsRouter);
apiRouter.use('/tests', testsRouter);
apiRouter.use('/drivers', driversRouter);
