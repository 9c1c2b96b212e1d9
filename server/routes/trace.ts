import { Router } from 'express';
import { serialParamsSchema } from '../../shared/schemas/drivers';
import { lotStatsQuerySchema, lotTraceParamsSchema } from '../../shared/schemas/trace';
import { endpoint } from '../http';
import { sendCsv } from '../csv';
import { lotContainmentCsv, lotStats, traceDriver, traceLot } from '../services/trace';

/**
 * Genealogy traces: backward from a driver, forward from a lot (and its containment CSV).
 * Mounted at /api itself, before the lots router, so /lots/:id/trace is ours.
 */
export const traceRouter = Router();

traceRouter.get(
  '/drivers/:serial/trace',
  endpoint({ access: 'signed-in', params: serialParamsSchema }, ({ params }) => traceDriver(params.serial)),
);

// Before the lots router's /lots/:id.
traceRouter.get(
  '/lots/stats',
  endpoint({ access: 'signed-in', query: lotStatsQuerySchema }, ({ query }) => lotStats(query)),
);

traceRouter.get(
  '/lots/:id/trace',
  endpoint({ access: 'signed-in', params: lotTraceParamsSchema }, ({ params }) => traceLot(params.id)),
);

traceRouter.get(
  '/lots/:id/trace.csv',
  endpoint({ access: 'signed-in', params: lotTraceParamsSchema }, async ({ params, res }) => {
    return sendCsv(res, await lotContainmentCsv(params.id));
  }),
);
