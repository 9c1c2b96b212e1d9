import { Router } from 'express';
import { endpoint } from '../http';
import { idParamsSchema, stationInputSchema, stationListQuerySchema, stationPatchSchema } from '../../shared/schemas/stations';
import { loadInputSchema, stationLoadedQuerySchema, unloadInputSchema } from '../../shared/schemas/station-loads';
import { mixInputSchema } from '../../shared/schemas/mixes';
import { createStation, getStation, listStations, retireStation, updateStation } from '../services/stations';
import { listLoaded, loadAtStation, unloadAtStation } from '../services/loading';
import { runClaimingItself } from '../middleware/idempotency';
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
  endpoint({ access: 'stations.load', params: idParamsSchema, body: loadInputSchema }, ({ actor, params, body, req, res }) =>
    // The load claims its Idempotency-Key in its first statement (server/middleware/idempotency.ts).
    runClaimingItself(req, res, () => loadAtStation(actor, params.id, body, req.idempotency)),
  ),
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
