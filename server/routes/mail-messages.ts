import { Router } from 'express';
import { idParamsSchema, mailListQuerySchema } from '../../shared/schemas';
import { guard } from '../auth/guard';
import { parseParams, parseQuery } from '../http/validate';
import { getMailMessage, listMailMessages } from '../services/mail-messages';

export function mailMessageRoutes() {
  const router = Router();
  const adminOnly = guard(['admin']);

  router.get('/mail-messages', adminOnly, async (req, res) => {
    res.json(await listMailMessages(parseQuery(mailListQuerySchema, req)));
  });

  router.get('/mail-messages/:id', adminOnly, async (req, res) => {
    res.json({ message: await getMailMessage(parseParams(idParamsSchema, req).id) });
  });

  return router;
}
