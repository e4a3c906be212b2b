import { Router, type Request } from 'express';
import { z } from 'zod';
import {
  idSchema,
  levelAssignmentSchema,
  operatorEnrolSchema,
  organizationUpdateSchema,
  ROSTER_MAX_BYTES,
  seatGrantSchema,
  seatOrderSchema,
} from '../../shared/schemas';
import { currentUser, guard } from '../auth/guard';
import type { AppContext } from '../context';
import { readUpload } from '../http/upload';
import { parseBody, parseParams, parseQuery } from '../http/validate';
import { enrolOperator, importRoster, previewRoster, resendInvitation, setLevels } from '../services/enrolment';
import { operatorProgress, operatorProgressCsv, organizationProfile, updateOrganization } from '../services/organizations';
import { cancelCheckout, orderOf, ordersOf, startCheckout } from '../services/payments';
import { grantSeats, ledgerOf, seatBalance } from '../services/seats';

const orgParams = z.strictObject({ orgId: idSchema });
const operatorParams = z.strictObject({ orgId: idSchema, userId: idSchema });
const orderParams = z.strictObject({ orgId: idSchema, orderId: z.uuid({ error: 'Not an order id.' }) });
const orgId = (req: Request) => parseParams(orgParams.loose(), req).orgId;
const operatorsQuery = z.strictObject({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
  q: z.string().trim().max(100).optional(),
});

export function organizationRoutes(ctx: AppContext) {
  const router = Router();
  // Employers of the organization, and admins, for everything under /organizations/:orgId.
  const ownEmployer = guard(['employer', 'admin'], { organizationId: (req) => orgId(req) });

  router.get('/organizations/:orgId', ownEmployer, async (req, res) => {
    res.json({ organization: await organizationProfile(orgId(req)) });
  });

  router.patch('/organizations/:orgId', ownEmployer, async (req, res) => {
    res.json({ organization: await updateOrganization(orgId(req), parseBody(organizationUpdateSchema, req)) });
  });

  router.get('/organizations/:orgId/seats', ownEmployer, async (req, res) => {
    const id = orgId(req);
    res.json({ balance: await seatBalance(id), ledger: await ledgerOf(id), orders: await ordersOf(id) });
  });

  router.post('/organizations/:orgId/orders', guard(['employer'], { organizationId: (req) => orgId(req) }), async (req, res) => {
    const { quantity } = parseBody(seatOrderSchema, req);
    res.status(201).json(await startCheckout(ctx, currentUser(req), orgId(req), quantity));
  });

  router.get('/organizations/:orgId/orders/:orderId', ownEmployer, async (req, res) => {
    res.json({ order: await orderOf(orgId(req), parseParams(orderParams, req).orderId) });
  });

  router.post('/organizations/:orgId/orders/:orderId/cancel', guard(['employer'], { organizationId: (req) => orgId(req) }), async (req, res) => {
    res.json({ order: await cancelCheckout(ctx, orgId(req), parseParams(orderParams, req).orderId) });
  });

  router.post('/organizations/:orgId/seat-grants', guard(['admin']), async (req, res) => {
    const { count } = parseBody(seatGrantSchema, req);
    res.status(201).json({ balance: await grantSeats(orgId(req), count, currentUser(req).id) });
  });

  router.get('/organizations/:orgId/operators', ownEmployer, async (req, res) => {
    const { page, pageSize, q } = parseQuery(operatorsQuery, req);
    res.json(await operatorProgress(ctx, orgId(req), page, pageSize, q));
  });

  router.get('/organizations/:orgId/operators.csv', ownEmployer, async (req, res) => {
    res.type('text/csv').attachment('driftproof-operators.csv').send(await operatorProgressCsv(ctx, orgId(req)));
  });

  router.post('/organizations/:orgId/operators', ownEmployer, async (req, res) => {
    res.status(201).json(await enrolOperator(ctx, currentUser(req), orgId(req), parseBody(operatorEnrolSchema, req)));
  });

  router.put('/organizations/:orgId/operators/:userId/levels', ownEmployer, async (req, res) => {
    const { userId } = parseParams(operatorParams, req);
    res.json({ levelIds: await setLevels(ctx, currentUser(req), orgId(req), userId, parseBody(levelAssignmentSchema, req).levelIds) });
  });

  router.post('/organizations/:orgId/operators/:userId/invitation', ownEmployer, async (req, res) => {
    const { userId } = parseParams(operatorParams, req);
    await resendInvitation(ctx, orgId(req), userId);
    res.status(202).json({ message: 'A new invitation is on its way.' });
  });

  router.post('/organizations/:orgId/roster/preview', ownEmployer, async (req, res) => {
    const file = await readUpload(req, res, 'roster', ROSTER_MAX_BYTES, 'A roster file');
    res.json(await previewRoster(ctx, orgId(req), file));
  });

  router.post('/organizations/:orgId/roster/import', ownEmployer, async (req, res) => {
    const file = await readUpload(req, res, 'roster', ROSTER_MAX_BYTES, 'A roster file');
    res.status(201).json(await importRoster(ctx, currentUser(req), orgId(req), file));
  });

  return router;
}
