import { Router } from 'express';
import { endpoint } from '../http';
import { listLabelLayouts, renderLabels } from '../services/labels';
import { labelRenderQuerySchema } from '../../shared/schemas/labels';

export const labelsRouter = Router();

labelsRouter.get('/layouts', endpoint({ access: 'signed-in' }, () => listLabelLayouts()));

/** text/html to open in a browser tab and print at 100 %. */
labelsRouter.get(
  '/render',
  endpoint({ access: 'labels.print', query: labelRenderQuerySchema }, async ({ actor, query, res }) => {
    const html = await renderLabels(actor, query);
    res.status(200).type('html').setHeader('Cache-Control', 'no-store').send(html);
    return undefined;
  }),
);
