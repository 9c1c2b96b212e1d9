import { Router } from 'express';
import { mailListQuerySchema, mailParamsSchema } from '../../shared/schemas/mail';
import { endpoint } from '../http';
import { getMail, listMail } from '../services/mail/mailbox';

/** The Mailbox: an administrator reads all mail (mail.readAll), everyone else their own. */
export const mailRouter = Router();

mailRouter.get(
  '/',
  endpoint({ access: 'signed-in', query: mailListQuerySchema }, ({ actor, query }) => listMail(actor, query)),
);

mailRouter.get(
  '/:id',
  endpoint({ access: 'signed-in', params: mailParamsSchema }, async ({ actor, params }) => ({ message: await getMail(actor, params.id) })),
);
