import { Router } from 'express';
import { endpoint } from '../http';
import { plantConfig } from '../services/plant';

export const configRouter = Router();

/** The plant's time zone and name: public, so the sign-in page shows times in plant time too. */
configRouter.get(
  '/',
  endpoint({ access: 'public' }, () => plantConfig()),
);
