import { Router } from 'express';
import { sendCsv } from '../csv';
import { endpoint } from '../http';
import { expiryOutlook, expiryOutlookCsv, listStock, materialStock, simulateStock, stockCsv, stockToday } from '../services/stock';
import { outlookQuerySchema, simulateInputSchema, stockMaterialParamsSchema, stockQuerySchema } from '../../shared/schemas/stock';

export const stockRouter = Router();

/** One row per material; `?format=csv` sends the same rows as text/csv. */
stockRouter.get(
  '/',
  endpoint({ access: 'stock.read', query: stockQuerySchema }, async ({ actor, query, res }) =>
    query.format === 'csv' ? sendCsv(res, await stockCsv(actor, query)) : listStock(actor, query),
  ),
);

stockRouter.post(
  '/simulate',
  endpoint({ access: 'stock.read', body: simulateInputSchema }, ({ actor, body }) => simulateStock(actor, body)),
);

stockRouter.get(
  '/outlook',
  endpoint({ access: 'stock.read', query: outlookQuerySchema }, async ({ actor, query, res }) =>
    query.format === 'csv' ? sendCsv(res, await expiryOutlookCsv(actor, query.weeks)) : expiryOutlook(actor, query.weeks),
  ),
);

stockRouter.get(
  '/today',
  endpoint({ access: 'stock.read' }, ({ actor }) => stockToday(actor)),
);

stockRouter.get(
  '/materials/:id',
  endpoint({ access: 'stock.read', params: stockMaterialParamsSchema }, ({ actor, params }) => materialStock(actor, params.id)),
);
