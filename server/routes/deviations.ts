import { Router } from 'express';
import { endpoint } from '../http';
import { deviationInputSchema, deviationListQuerySchema } from '../../shared/schemas/deviations';
import { listDeviations, recordDeviation } from '../services/deviations';

export const deviationsRouter = Router();

deviationsRouter.get(
  '/',
  endpoint({ access: 'signed-in', query: deviationListQuerySchema }, ({ query }) => listDeviations(query)),
);

deviationsRouter.post(
  '/',
  endpoint({ access: 'deviations.record', body: deviationInputSchema, status: 201 }, ({ actor, body }) => recordDeviation(actor, body)),
);
