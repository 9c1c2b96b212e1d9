import { Router } from 'express';
import { auditQuerySchema } from '../../shared/schemas/audit';
import { endpoint } from '../http';
import { exportAuditCsv, listAudit, verifyAuditChainFor } from '../services/audit-chain';
import { streamCsv } from '../csv';

export const auditRouter = Router();

auditRouter.get(
  '/',
  endpoint({ access: 'audit.read', query: auditQuerySchema }, ({ actor, query, res }) =>
    query.format === 'csv' ? streamCsv(res, (sink) => exportAuditCsv(actor, query, sink)) : listAudit(actor, query),
  ),
);
auditRouter.post(
  '/verify',
  endpoint({ access: 'audit.verify' }, ({ actor }) => verifyAuditChainFor(actor)),
);
