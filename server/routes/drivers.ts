import { Router } from 'express';
import { reworkInputSchema, scrapInputSchema, serialParamsSchema } from '../../shared/schemas/drivers';
import { endpoint } from '../http';
import { finishRework, getDriver, scrapDriver, startRework } from '../services/drivers';

/** /api/drivers/:serial — one unit, its history, rework and scrap. */
export const driversRouter = Router();

driversRouter.get(
  '/:serial',
  endpoint({ access: 'signed-in', params: serialParamsSchema }, ({ params }) => getDriver(params.serial)),
);

driversRouter.post(
  '/:serial/scrap',
  endpoint({ access: 'drivers.scrap', params: serialParamsSchema, body: scrapInputSchema }, ({ actor, params, body }) =>
    scrapDriver(actor, params.serial, body),
  ),
);

driversRouter.post(
  '/:serial/rework/start',
  endpoint({ access: 'drivers.rework', params: serialParamsSchema, body: reworkInputSchema }, ({ actor, params, body }) =>
    startRework(actor, params.serial, body),
  ),
);

driversRouter.post(
  '/:serial/rework/finish',
  endpoint({ access: 'drivers.rework', params: serialParamsSchema, body: reworkInputSchema }, ({ actor, params, body }) =>
    finishRework(actor, params.serial, body),
  ),
);
