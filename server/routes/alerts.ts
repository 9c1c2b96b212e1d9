import { Router } from 'express';
import { alertListQuerySchema, alertParamsSchema, alertResolveInputSchema } from '../../shared/schemas/alerts';
import { endpoint } from '../http';
import { acknowledgeAlert, exportAlertsCsv, listAlerts, resolveAlert } from '../services/alerts';
import { streamCsv } from '../csv';
import { runComplianceNow } from '../services/compliance';

export const alertsRouter = Router();

/** One page of alerts; `?format=csv` streams every alert the same filters select. */
alertsRouter.get(
  '/',
  endpoint({ access: 'signed-in', query: alertListQuerySchema }, ({ actor, query, res }) =>
    query.format === 'csv' ? streamCsv(res, (sink) => exportAlertsCsv(actor, query, sink)) : listAlerts(actor, query),
  ),
);

alertsRouter.post(
  '/:id/acknowledge',
  endpoint({ access: 'alerts.acknowledge', params: alertParamsSchema }, async ({ actor, params }) => ({
    alert: await acknowledgeAlert(actor, params.id),
  })),
);

alertsRouter.post(
  '/:id/resolve',
  endpoint({ access: 'alerts.resolve', params: alertParamsSchema, body: alertResolveInputSchema }, async ({ actor, params, body }) => ({
    alert: await resolveAlert(actor, params.id, body.resolution),
  })),
);

export const complianceRouter = Router();

complianceRouter.post(
  '/run',
  endpoint({ access: 'compliance.run' }, ({ actor }) => runComplianceNow(actor)),
);
