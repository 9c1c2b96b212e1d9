import { Router } from 'express';
import { endpoint } from '../http';
import { batchInputSchema, batchListQuerySchema } from '../../shared/schemas/batches';
import { idParamsSchema } from '../../shared/schemas/stations';
import { createBatch, exportBatchesCsv, getBatchDetail, listBatches } from '../services/batches';
import { streamCsv } from '../csv';
import { batchCure } from '../services/cure';

export const batchesRouter = Router();

/** One page of batches; `?format=csv` streams every batch the same filters select. */
batchesRouter.get(
  '/',
  endpoint({ access: 'signed-in', query: batchListQuerySchema }, ({ query, res }) =>
    query.format === 'csv' ? streamCsv(res, (sink) => exportBatchesCsv(query, sink)) : listBatches(query),
  ),
);

batchesRouter.post(
  '/',
  endpoint({ access: 'batches.create', body: batchInputSchema, status: 201 }, ({ actor, body }) => createBatch(actor, body)),
);

batchesRouter.get(
  '/:id',
  endpoint({ access: 'signed-in', params: idParamsSchema }, ({ params }) => getBatchDetail(params.id)),
);

batchesRouter.get(
  '/:id/cure',
  endpoint({ access: 'signed-in', params: idParamsSchema }, ({ params }) => batchCure(params.id)),
);
