import { Router } from 'express';
import { endpoint } from '../http';
import { cureBoardQuerySchema, cureEstimateInputSchema } from '../../shared/schemas/cure';
import { cureBoard, estimateCure } from '../services/cure';

export const cureRouter = Router();

cureRouter.post(
  '/estimate',
  endpoint({ access: 'signed-in', body: cureEstimateInputSchema }, ({ body }) => estimateCure(body)),
);

cureRouter.get(
  '/board',
  endpoint({ access: 'signed-in', query: cureBoardQuerySchema }, ({ query }) => cureBoard(query)),
);
