import { Router } from 'express';
import { endpoint } from '../http';
import { attachSds, createMaterial, getMaterial, listMaterials, retireMaterial, updateMaterial } from '../services/catalogue';
import { getMaterialFefo } from '../services/containers';
import { materialInputSchema, materialListQuerySchema, materialParamsSchema, materialPatchSchema } from '../../shared/schemas/materials';
import { acceptUpload } from './attachments';

export const materialsRouter = Router();

materialsRouter.get(
  '/',
  endpoint({ access: 'signed-in', query: materialListQuerySchema }, ({ query }) => listMaterials(query)),
);

materialsRouter.get(
  '/:id',
  endpoint({ access: 'signed-in', params: materialParamsSchema }, ({ params }) => getMaterial(params.id)),
);

materialsRouter.get(
  '/:id/fefo',
  endpoint({ access: 'signed-in', params: materialParamsSchema }, ({ params }) => getMaterialFefo(params.id)),
);

materialsRouter.post(
  '/',
  endpoint({ access: 'materials.edit', body: materialInputSchema, status: 201 }, ({ actor, body }) => createMaterial(actor, body)),
);

materialsRouter.patch(
  '/:id',
  endpoint({ access: 'materials.edit', params: materialParamsSchema, body: materialPatchSchema }, ({ actor, params, body }) =>
    updateMaterial(actor, params.id, body),
  ),
);

materialsRouter.post(
  '/:id/retire',
  endpoint({ access: 'materials.edit', params: materialParamsSchema }, ({ actor, params }) => retireMaterial(actor, params.id)),
);

/** Safety data sheet: multipart/form-data, PDF (or PNG/JPEG) in the field `file`. */
materialsRouter.post(
  '/:id/sds',
  acceptUpload('materials.edit'),
  endpoint({ access: 'materials.edit', params: materialParamsSchema, status: 201 }, ({ actor, params, req }) =>
    attachSds(actor, params.id, req.file),
  ),
);
