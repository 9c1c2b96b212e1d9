import { Router } from 'express';
import { endpoint } from '../http';
import { createSupplier, getSupplier, listSuppliers, retireSupplier, updateSupplier } from '../services/catalogue';
import { supplierInputSchema, supplierListQuerySchema, supplierParamsSchema, supplierPatchSchema } from '../../shared/schemas/suppliers';

export const suppliersRouter = Router();

suppliersRouter.get(
  '/',
  endpoint({ access: 'signed-in', query: supplierListQuerySchema }, ({ query }) => listSuppliers(query)),
);

suppliersRouter.get(
  '/:id',
  endpoint({ access: 'signed-in', params: supplierParamsSchema }, ({ params }) => getSupplier(params.id)),
);

suppliersRouter.post(
  '/',
  endpoint({ access: 'suppliers.edit', body: supplierInputSchema, status: 201 }, ({ actor, body }) => createSupplier(actor, body)),
);

suppliersRouter.patch(
  '/:id',
  endpoint({ access: 'suppliers.edit', params: supplierParamsSchema, body: supplierPatchSchema }, ({ actor, params, body }) =>
    updateSupplier(actor, params.id, body),
  ),
);

suppliersRouter.post(
  '/:id/retire',
  endpoint({ access: 'suppliers.edit', params: supplierParamsSchema }, ({ actor, params }) => retireSupplier(actor, params.id)),
);
