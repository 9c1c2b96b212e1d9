import { Router } from 'express';
import { endpoint } from '../http';
import { attachCertificate, receiveLot } from '../services/receiving';
import { changeLotStatus, getLotDetail, getLotHistory, listLots } from '../services/lots';
import { lotListQuerySchema, lotParamsSchema, lotStatusChangeSchema, receiveLotInputSchema } from '../../shared/schemas/lots';
import { certificateFieldsSchema } from '../../shared/schemas/attachments';
import { acceptUpload } from './attachments';

export const lotsRouter = Router();

lotsRouter.get('/', endpoint({ access: 'signed-in', query: lotListQuerySchema }, ({ query }) => listLots(query)));

lotsRouter.post(
  '/',
  endpoint({ access: ['receiving', 'admin'], body: receiveLotInputSchema, status: 201 }, ({ actor, body }) => receiveLot(actor, body)),
);

lotsRouter.get('/:id', endpoint({ access: 'signed-in', params: lotParamsSchema }, ({ params }) => getLotDetail(params.id)));

lotsRouter.get('/:id/history', endpoint({ access: 'signed-in', params: lotParamsSchema }, ({ params }) => getLotHistory(params.id)));

lotsRouter.post(
  '/:id/status',
  endpoint({ access: ['quality'], params: lotParamsSchema, body: lotStatusChangeSchema }, ({ actor, params, body }) => changeLotStatus(actor, params.id, body)),
);

/** Certificate of analysis: multipart/form-data, PDF/PNG/JPEG in `file`, optional `expiresOn`. */
lotsRouter.post(
  '/:id/certificate',
  acceptUpload(['receiving', 'quality']),
  endpoint(
    { access: ['receiving', 'quality'], params: lotParamsSchema, body: certificateFieldsSchema, status: 201 },
    ({ actor, params, body, req }) => attachCertificate(actor, params.id, req.file, body),
  ),
);
