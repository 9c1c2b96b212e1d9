import { Router } from 'express';
import { endpoint } from '../http';
import {
  getContainer,
  emptyContainer,
  moveContainer,
  openContainer,
  returnToStorage,
  scrapContainer,
  takeOutOfStorage,
  thawContainer,
} from '../services/containers';
import { containerLocationInputSchema, containerParamsSchema, containerScrapInputSchema } from '../../shared/schemas/containers';

export const containersRouter = Router();

containersRouter.get(
  '/:id',
  endpoint({ access: 'signed-in', params: containerParamsSchema }, ({ params }) => getContainer(params.id)),
);

containersRouter.post(
  '/:id/open',
  endpoint({ access: 'containers.handle', params: containerParamsSchema }, ({ actor, params }) => openContainer(actor, params.id)),
);

containersRouter.post(
  '/:id/thaw',
  endpoint({ access: 'containers.handle', params: containerParamsSchema }, ({ actor, params }) => thawContainer(actor, params.id)),
);

containersRouter.post(
  '/:id/location',
  endpoint({ access: 'containers.handle', params: containerParamsSchema, body: containerLocationInputSchema }, ({ actor, params, body }) =>
    moveContainer(actor, params.id, body.location),
  ),
);

containersRouter.post(
  '/:id/empty',
  endpoint({ access: 'containers.empty', params: containerParamsSchema }, ({ actor, params }) => emptyContainer(actor, params.id)),
);

containersRouter.post(
  '/:id/scrap',
  endpoint({ access: 'containers.scrap', params: containerParamsSchema, body: containerScrapInputSchema }, ({ actor, params, body }) =>
    scrapContainer(actor, params.id, body.reason),
  ),
);

containersRouter.post(
  '/:id/out-of-storage',
  endpoint({ access: 'containers.handle', params: containerParamsSchema }, ({ actor, params }) => takeOutOfStorage(actor, params.id)),
);

containersRouter.post(
  '/:id/return-to-storage',
  endpoint({ access: 'containers.handle', params: containerParamsSchema }, ({ actor, params }) => returnToStorage(actor, params.id)),
);
