import { Router } from 'express';
import { endpoint } from '../http';
import { homeQuerySchema } from '../../shared/schemas/home';
import { homeFigures } from '../services/home';

export const homeRouter = Router();

/** The home page's figures: one section per role the caller holds (the map's `home.<role>` actions). */
homeRouter.get(
  '/',
  endpoint({ access: 'signed-in', query: homeQuerySchema }, ({ actor, query, res }) => {
    res.set('Cache-Control', 'no-store');
    return homeFigures(actor, query);
  }),
);
