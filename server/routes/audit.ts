import { Router } from 'express';
import { auditQuerySchema } from '../../shared/schemas/audit';
import { endpoint } from '../http';
import { listAudit, verifyAuditChainFor } from '../services/audit-chain';

export const auditRouter = Router();

auditRouter.get(
  '/',
  endpoint({ access: 'audit.read', query: auditQuerySchema }, ({ actor, query }) => listAudit(actor, query)),
);
auditRouter.post(
  '/verify',
  endpoint({ access: 'audit.verify' }, ({ actor }) => verifyAuditChainFor(actor)),
);
