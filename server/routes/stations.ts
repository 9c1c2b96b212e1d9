import { Router } from 'express';
import { endpoint } from '../http';
import { idParamsSchema, stationInputSchema, stationListQuerySchema, stationPatchSchema } from '../../shared/schemas/stations';
import { loadInputSchema, stationLoadedQuerySchema, unloadInputSchema } from '../../shared/schemas/station-loads';
import { mixInputSchema } from '../../shared/schemas/mixes';
import { createStation, getStation, listStations, retireStation, updateStation } from '../services/stations';
import { KEY_TAKEN, listLoaded, loadAtStation, unloadAtStation } from '../services/loading';
import { answerTakenKey } from '../middleware/idempotency';
import { AppError } from '../errors';
import { createMix } from '../services/mixes';

export const stationsRouter = Router();

stationsRouter.get(
  '/',
  endpoint({ access: 'signed-in', query: stationListQuerySchema }, ({ query }) => listStations(query)),
);

stationsRouter.post(
  '/',
  endpoint({ access: 'stations.edit', body: stationInputSchema, status: 201 }, ({ actor, body }) => createStation(actor, body)),
);

stationsRouter.get(
  '/:id',
  endpoint({ access: 'signed-in', params: idParamsSchema }, ({ params }) => getStation(params.id)),
);

stationsRouter.patch(
  '/:id',
  endpoint({ access: 'stations.edit', params: idParamsSchema, body: stationPatchSchema }, ({ actor, params, body }) =>
    updateStation(actor, params.id, body),
  ),
);

stationsRouter.post(
  '/:id/retire',
  endpoint({ access: 'stations.edit', params: idParamsSchema }, ({ actor, params }) => retireStation(actor, params.id)),
);

stationsRouter.post(
  '/:id/load',
  endpoint({ access: 'stations.load', params: idParamsSchema, body: loadInputSchema }, async ({ actor, params, body, req, res }) => {
    // The load claims its Idempotency-Key in its first statement (server/middleware/idempotency.ts).
    const result = await loadAtStation(actor, params.id, body, req.idempotency);
    if (result !== KEY_TAKEN) return result;
    if ((await answerTakenKey(req, res, req.idempotency!)) === 'answered') return undefined;
    // A key whose first request died was taken over: the load runs after all.
    const again = await loadAtStation(actor, params.id, body, req.idempotency);
    if (again === KEY_TAKEN)
      throw new AppError('IDEMPOTENCY_IN_PROGRESS', 'A request with this Idempotency-Key is running; send it again.', 409);
    return again;
  }),
);

stationsRouter.get(
  '/:id/loaded',
  endpoint({ access: 'signed-in', params: idParamsSchema, query: stationLoadedQuerySchema }, ({ params, query }) =>
    listLoaded(params.id, query.batchId),
  ),
);

stationsRouter.post(
  '/:id/unload',
  endpoint({ access: 'stations.load', params: idParamsSchema, body: unloadInputSchema }, ({ actor, params, body }) =>
    unloadAtStation(actor, params.id, body),
  ),
);

stationsRouter.post(
  '/:id/mixes',
  endpoint({ access: 'mixes.create', params: idParamsSchema, body: mixInputSchema, status: 201 }, ({ actor, params, body }) =>
    createMix(actor, params.id, body),
  ),
);
