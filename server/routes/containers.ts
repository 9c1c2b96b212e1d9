import { Router } from 'express';
import { endpoint } from '../http';
import {
  getContainer, emptyContainer, moveContainer, openContainer, returnToStorage, scrapContainer, takeOutOfStorage, thawContainer,
} from '../services/containers';
import { containerLocationInputSchema, containerParamsSchema, containerScrapInputSchema } from '../../shared/schemas/containers';

export const containersRouter = Router();

const handlers = ['receiving', 'assembler', 'quality'] as const;

containersRouter.get('/:id', endpoint({ access: 'signed-in', params: containerParamsSchema }, ({ params }) => getContainer(params.id)));

containersRouter.post('/:id/open', endpoint({ access: handlers, params: containerParamsSchema }, ({ actor, params }) => openContainer(actor, params.id)));

containersRouter.post('/:id/thaw', endpoint({ access: handlers, params: containerParamsSchema }, ({ actor, params }) => thawContainer(actor, params.id)));

containersRouter.post(
  '/:id/location',
  endpoint({ access: handlers, params: containerParamsSchema, body: containerLocationInputSchema }, ({ actor, params, body }) => moveContainer(actor, params.id, body.location)),
);

containersRouter.post('/:id/empty', endpoint({ access: handlers, params: containerParamsSchema }, ({ actor, params }) => emptyContainer(actor, params.id)));

containersRouter.post(
  '/:id/scrap',
  endpoint({ access: ['quality', 'receiving'], params: containerParamsSchema, body: containerScrapInputSchema }, ({ actor, params, body }) => scrapContainer(actor, params.id, body.reason)),
);

containersRouter.post(
  '/:id/out-of-storage',
  endpoint({ access: handlers, params: containerParamsSchema }, ({ actor, params }) => takeOutOfStorage(actor, params.id)),
);

containersRouter.post(
  '/:id/return-to-storage',
  endpoint({ access: handlers, params: containerParamsSchema }, ({ actor, params }) => returnToStorage(actor, params.id)),
);
