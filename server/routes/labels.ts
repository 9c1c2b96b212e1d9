import { Router } from 'express';
import { endpoint } from '../http';
import { listLabelLayouts, renderLabels, renderStationLabels } from '../services/labels';
import { labelRenderQuerySchema, stationLabelQuerySchema } from '../../shared/schemas/labels';

export const labelsRouter = Router();

labelsRouter.get(
  '/layouts',
  endpoint({ access: 'signed-in' }, () => listLabelLayouts()),
);

/** text/html to open in a browser tab and print at 100 %. */
labelsRouter.get(
  '/render',
  endpoint({ access: 'labels.print', query: labelRenderQuerySchema }, async ({ actor, query, res }) => {
    const html = await renderLabels(actor, query);
    res.status(200).type('html').setHeader('Cache-Control', 'no-store').send(html);
    return undefined;
  }),
);

/** A station's code label (QR + code + name), text/html like /render. */
labelsRouter.get(
  '/stations',
  endpoint({ access: 'labels.print', query: stationLabelQuerySchema }, async ({ actor, query, res }) => {
    const html = await renderStationLabels(actor, query);
    res.status(200).type('html').setHeader('Cache-Control', 'no-store').send(html);
    return undefined;
  }),
);
