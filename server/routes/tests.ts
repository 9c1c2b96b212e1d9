import { Router } from 'express';
import { testInputSchema } from '../../shared/schemas/tests';
import { endpoint } from '../http';
import { recordTest } from '../services/testing';

/** /api/tests — final test results. */
export const testsRouter = Router();

testsRouter.post(
  '/',
  endpoint({ access: 'tests.record', body: testInputSchema, status: 201 }, ({ actor, body }) => recordTest(actor, body)),
);
