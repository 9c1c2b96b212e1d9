import { Router } from 'express';
import { authRouter } from './auth';
import { healthRouter } from './health';
import { usersRouter } from './users';
import { traceRouter } from './trace';
import { defectsRouter } from './defects';
import { testsRouter } from './tests';
import { driversRouter } from './drivers';
import { stationsRouter } from './stations';
import { modelsRouter } from './models';
import { batchesRouter } from './batches';
import { stepsRouter } from './steps';
import { mixesRouter } from './mixes';
import { deviationsRouter } from './deviations';
import { readingsRouter } from './readings';
import { cureRouter } from './cure';

/** Every API router, mounted under /api. Add a domain's router here. */
export const apiRouter = Router();

apiRouter.use('/health', healthRouter);
apiRouter.use('/auth', authRouter);
apiRouter.use('/users', usersRouter);
// Genealogy traces (/drivers/:serial/trace, /lots/:id/trace…) before the /lots and /drivers routers.
apiRouter.use(traceRouter);
apiRouter.use('/defect-codes', defectsRouter);
apiRouter.use('/tests', testsRouter);
apiRouter.use('/drivers', driversRouter);
apiRouter.use('/stations', stationsRouter);
apiRouter.use('/models', modelsRouter);
apiRouter.use('/batches', batchesRouter);
apiRouter.use('/batches', stepsRouter);
apiRouter.use('/mixes', mixesRouter);
apiRouter.use('/deviations', deviationsRouter);
apiRouter.use('/readings', readingsRouter);
apiRouter.use('/cure', cureRouter);
