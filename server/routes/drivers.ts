import { Router } from 'express';
import { scrapInputSchema, serialParamsSchema } from '../../shared/schemas/drivers';
import { endpoint } from '../http';
import { getDriver, scrapDriver } from '../services/drivers';

/** /api/drivers/:serial — one unit, its history, rework and scrap. */
export const driversRouter = Router();

driversRouter.get('/:serial', endpoint({ access: 'signed-in', params: serialParamsSchema }, ({ params }) => getDriver(params.serial)));

driversRouter.post(
  '/:serial/scrap',
  endpoint({ access: ['quality'], params: serialParamsSchema, body: scrapInputSchema }, ({ actor, params, body }) =>
    scrapDriver(actor, params.serial, body),
  ),
);
