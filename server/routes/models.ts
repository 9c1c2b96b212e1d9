import { Router } from 'express';
import { endpoint } from '../http';
import { driverModelInputSchema, driverModelPatchSchema, modelListQuerySchema } from '../../shared/schemas/models';
import { idParamsSchema } from '../../shared/schemas/stations';
import { createModel, createRevision, getModel, listModels, makeRevisionCurrent, updateModel } from '../services/models';

export const modelsRouter = Router();

modelsRouter.get(
  '/',
  endpoint({ access: 'signed-in', query: modelListQuerySchema }, ({ query }) => listModels(query)),
);

modelsRouter.post(
  '/',
  endpoint({ access: 'models.edit', body: driverModelInputSchema, status: 201 }, ({ actor, body }) => createModel(actor, body)),
);

modelsRouter.get(
  '/:id',
  endpoint({ access: 'signed-in', params: idParamsSchema }, ({ params }) => getModel(params.id)),
);

modelsRouter.patch(
  '/:id',
  endpoint({ access: 'models.edit', params: idParamsSchema, body: driverModelPatchSchema }, ({ actor, params, body }) =>
    updateModel(actor, params.id, body),
  ),
);

modelsRouter.post(
  '/:id/revisions',
  endpoint({ access: 'recipes.edit', params: idParamsSchema, status: 201 }, ({ actor, params }) => createRevision(actor, params.id)),
);

modelsRouter.post(
  '/:id/make-current',
  endpoint({ access: 'recipes.edit', params: idParamsSchema }, ({ actor, params }) => makeRevisionCurrent(actor, params.id)),
);
