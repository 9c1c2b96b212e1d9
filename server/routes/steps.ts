import { Router } from 'express';
import { endpoint } from '../http';
import { stepActionInputSchema, stepParamsSchema } from '../../shared/schemas/steps';
import { finishStep, startStep } from '../services/steps';

/** Mounted at /api/batches beside the batches router. */
export const stepsRouter = Router();

stepsRouter.post(
  '/:id/steps/:stepId/start',
  endpoint({ access: 'steps.run', params: stepParamsSchema, body: stepActionInputSchema }, ({ actor, params, body }) =>
    startStep(actor, { batchId: params.id, stepId: params.stepId, stationId: body.stationId, serial: body.serial }),
  ),
);

stepsRouter.post(
  '/:id/steps/:stepId/finish',
  endpoint({ access: 'steps.run', params: stepParamsSchema, body: stepActionInputSchema }, ({ actor, params, body }) =>
    finishStep(actor, {
      batchId: params.id,
      stepId: params.stepId,
      stationId: body.stationId,
      serial: body.serial,
      exposureSeconds: body.exposureSeconds,
    }),
  ),
);
