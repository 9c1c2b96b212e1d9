import { Router } from 'express';
import { endpoint } from '../http';
import { readingQuerySchema, readingsPostSchema } from '../../shared/schemas/readings';
import { exportReadingsCsv, listReadings, recordReadings } from '../services/readings';
import { streamCsv } from '../csv';

export const readingsRouter = Router();

/** The newest `limit` readings; `?format=csv` streams every reading the same filters select. */
readingsRouter.get(
  '/',
  endpoint({ access: 'signed-in', query: readingQuerySchema }, ({ query, res }) =>
    query.format === 'csv' ? streamCsv(res, (sink) => exportReadingsCsv(query, sink)) : listReadings(query),
  ),
);

/** One reading answers with the Reading; `{readings: [...]}` answers `{items}`. */
readingsRouter.post(
  '/',
  endpoint({ access: 'readings.record', body: readingsPostSchema, status: 201 }, async ({ actor, body }) => {
    const items = await recordReadings(actor, body.items, { single: body.single });
    return body.single ? items[0] : { items };
  }),
);
