import { Router } from 'express';
import { endpoint } from '../http';
import { resolveScan } from '../services/scans';
import { scanInputSchema } from '../../shared/schemas/scans';

export const scansRouter = Router();

scansRouter.post(
  '/resolve',
  endpoint({ access: 'signed-in', body: scanInputSchema }, ({ actor, body }) => resolveScan(actor, body.code)),
);
