import { Router } from 'express';
import { endpoint } from '../http';
import { readingQuerySchema, readingsPostSchema } from '../../shared/schemas/readings';
import { listReadings, recordReadings } from '../services/readings';

export const readingsRouter = Router();

readingsRouter.get(
  '/',
  endpoint({ access: 'signed-in', query: readingQuerySchema }, ({ query }) => listReadings(query)),
);

/** One reading answers with the Reading; `{readings: [...]}` answers `{items}`. */
readingsRouter.post(
  '/',
  endpoint({ access: 'readings.record', body: readingsPostSchema, status: 201 }, async ({ actor, body }) => {
    const items = await recordReadings(actor, body.items, { single: body.single });
    return body.single ? items[0] : { items };
  }),
);
