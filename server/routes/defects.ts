import { Router } from 'express';
import {
  defectCodeCreateSchema,
  defectCodeListQuerySchema,
  defectCodeParamsSchema,
  defectCodeUpdateSchema,
} from '../../shared/schemas/defects';
import { endpoint } from '../http';
import { createDefectCode, listDefectCodes, updateDefectCode } from '../services/defects';

/** /api/defect-codes — the editable list of final-test defect codes. */
export const defectsRouter = Router();

defectsRouter.get(
  '/',
  endpoint({ access: 'signed-in', query: defectCodeListQuerySchema }, ({ query }) => listDefectCodes(query)),
);

defectsRouter.post(
  '/',
  endpoint({ access: 'defects.edit', body: defectCodeCreateSchema, status: 201 }, ({ actor, body }) => createDefectCode(actor, body)),
);

defectsRouter.patch(
  '/:code',
  endpoint({ access: 'defects.edit', params: defectCodeParamsSchema, body: defectCodeUpdateSchema }, ({ actor, params, body }) =>
    updateDefectCode(actor, params.code, body),
  ),
);
