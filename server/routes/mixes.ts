import { Router } from 'express';
import { endpoint } from '../http';
import { idParamsSchema } from '../../shared/schemas/stations';
import { getMix } from '../services/mixes';

/** Mixes are made at a station (POST /api/stations/:id/mixes); read here. */
export const mixesRouter = Router();

mixesRouter.get(
  '/:id',
  endpoint({ access: 'signed-in', params: idParamsSchema }, ({ params }) => getMix(params.id)),
);
