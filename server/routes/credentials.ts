import { Router } from 'express';
import { z } from 'zod';
import { idParamsSchema, revokeCredentialSchema } from '../../shared/schemas';
import { currentUser, guard } from '../auth/guard';
import type { AppContext } from '../context';
import { createLimiter } from '../http/rate-limit';
import { readUpload } from '../http/upload';
import { parseBody, parseParams, parseQuery } from '../http/validate';
import { bulkResultsCsv, bulkVerify, credentialPdfFor, listCredentials, revokeCredential, verifyCredential } from '../services/credentials';

export function credentialRoutes(ctx: AppContext) {
  const router = Router();
  const verifyLimit = createLimiter(ctx.sequelize, { name: 'verify', limit: 60, windowMinutes: 1, message: 'Too many checks from your network. Wait a minute and try again.' });

  router.get('/credentials', guard('signed-in'), async (req, res) => {
    const { expiringWithinDays } = parseQuery(z.strictObject({ expiringWithinDays: z.coerce.number().int().min(1).max(366).optional() }), req);
    res.json({ items: await listCredentials(ctx, currentUser(req), { expiringWithinDays }) });
  });

  router.get('/credentials/:id/pdf', guard(['operator', 'employer', 'admin']), async (req, res) => {
    const { number, pdf } = await credentialPdfFor(ctx, currentUser(req), parseParams(idParamsSchema, req).id);
    res.type('application/pdf').attachment(`driftproof-${number}.pdf`).send(pdf);
  });

  router.post('/credentials/:id/revoke', guard(['admin', 'assessor']), async (req, res) => {
    const { reason } = parseBody(revokeCredentialSchema, req);
    res.json({ credential: await revokeCredential(ctx, currentUser(req), parseParams(idParamsSchema, req).id, reason) });
  });

  // Public, no sign-in: anyone holding a number (or the QR link) can check it.
  router.get('/verify/:number', verifyLimit, async (req, res) => {
    const { number } = parseParams(z.strictObject({ number: z.string().max(40) }), req);
    const { s } = parseQuery(z.strictObject({ s: z.string().max(200).optional() }), req);
    const result = await verifyCredential(ctx, number, s);
    res.status(result.found ? 200 : 404).json(result.found ? { credential: result } : { error: { code: 'not_found', message: 'No credential has this number.' } });
  });

  router.post('/verify/bulk', guard(['hr', 'employer', 'admin']), verifyLimit, async (req, res) => {
    const { format } = parseQuery(z.strictObject({ format: z.enum(['json', 'csv']).default('json') }), req);
    const results = await bulkVerify(ctx, await readUpload(req, res, 'numbers', 1024 * 1024, 'A file of numbers'));
    if (format === 'csv') res.type('text/csv').attachment('driftproof-verification.csv').send(bulkResultsCsv(results));
    else res.json({ items: results });
  });

  return router;
}
