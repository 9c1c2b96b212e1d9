import { Router } from 'express';
import { endpoint } from '../http';
import { attachCertificate, receiveLot } from '../services/receiving';
import { changeLotStatus, exportLotsCsv, getLotDetail, getLotHistory, getLotStatusChanges, listLots } from '../services/lots';
import { streamCsv } from '../csv';
import { lotListQuerySchema, lotParamsSchema, lotStatusChangeSchema, receiveLotInputSchema } from '../../shared/schemas/lots';
import { certificateFieldsSchema } from '../../shared/schemas/attachments';
import { acceptUpload } from './attachments';

export const lotsRouter = Router();

/** One page of lots; `?format=csv` streams every lot the same filters select (RFC 4180, plant time). */
lotsRouter.get(
  '/',
  endpoint({ access: 'signed-in', query: lotListQuerySchema }, ({ query, res }) =>
    query.format === 'csv' ? streamCsv(res, (sink) => exportLotsCsv(query, sink)) : listLots(query),
  ),
);

lotsRouter.post(
  '/',
  endpoint({ access: 'lots.receive', body: receiveLotInputSchema, status: 201 }, ({ actor, body }) => receiveLot(actor, body)),
);

lotsRouter.get(
  '/:id',
  endpoint({ access: 'signed-in', params: lotParamsSchema }, ({ params }) => getLotDetail(params.id)),
);

/** The full audit trail of a lot and its containers (names, old and new values): quality and admin. */
lotsRouter.get(
  '/:id/history',
  endpoint({ access: 'lots.readHistory', params: lotParamsSchema }, ({ actor, params }) => getLotHistory(actor, params.id)),
);

/** How the lot's status moved, when and why: anyone signed in. */
lotsRouter.get(
  '/:id/status-changes',
  endpoint({ access: 'signed-in', params: lotParamsSchema }, ({ params }) => getLotStatusChanges(params.id)),
);

lotsRouter.post(
  '/:id/status',
  endpoint({ access: 'lots.release', params: lotParamsSchema, body: lotStatusChangeSchema }, ({ actor, params, body }) =>
    changeLotStatus(actor, params.id, body),
  ),
);

/** Certificate of analysis: multipart/form-data, PDF/PNG/JPEG in `file`, optional `expiresOn`. */
lotsRouter.post(
  '/:id/certificate',
  acceptUpload('lots.attachCertificate'),
  endpoint(
    { access: 'lots.attachCertificate', params: lotParamsSchema, body: certificateFieldsSchema, status: 201 },
    ({ actor, params, body, req }) => attachCertificate(actor, params.id, req.file, body),
  ),
);
