import { Router } from 'express';
import { serialParamsSchema } from '../../shared/schemas/drivers';
import { lotTraceParamsSchema } from '../../shared/schemas/trace';
import { endpoint } from '../http';
import { lotContainmentCsv, traceDriver, traceLot } from '../services/trace';

/**
 * Genealogy traces: backward from a driver, forward from a lot (and its containment CSV).
 * Mounted at /api itself, before the lots router, so /lots/:id/trace is ours.
 */
export const traceRouter = Router();

traceRouter.get(
  '/drivers/:serial/trace',
  endpoint({ access: 'signed-in', params: serialParamsSchema }, ({ params }) => traceDriver(params.serial)),
);

traceRouter.get('/lots/:id/trace', endpoint({ access: 'signed-in', params: lotTraceParamsSchema }, ({ params }) => traceLot(params.id)));

traceRouter.get(
  '/lots/:id/trace.csv',
  endpoint({ access: 'signed-in', params: lotTraceParamsSchema }, async ({ params, res }) => {
    const csv = await lotContainmentCsv(params.id);
    res
      .status(200)
      .type('text/csv; charset=utf-8; header=present')
      .attachment(csv.filename)
      .set('Cache-Control', 'no-store')
      .send(csv.body);
    return undefined;
  }),
);
