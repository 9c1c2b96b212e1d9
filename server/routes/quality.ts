import { Router } from 'express';
import { baselineOverrideInputSchema, qualityOverviewQuerySchema } from '../../shared/schemas/quality';
import { endpoint } from '../http';
import { overrideBaseline } from '../services/quality/baseline';
import { qualityOverview } from '../services/quality/overview';

export const qualityRouter = Router();

qualityRouter.get(
  '/overview',
  endpoint({ access: 'quality.overview', query: qualityOverviewQuerySchema }, ({ actor, query }) => qualityOverview(actor, query)),
);
qualityRouter.post(
  '/baseline',
  endpoint({ access: 'quality.overrideBaseline', body: baselineOverrideInputSchema }, ({ actor, body }) => overrideBaseline(actor, body)),
);
