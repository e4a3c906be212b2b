import express, { Router } from 'express';
import { z } from 'zod';
import { idSchema, refundSchema, seatPricingSchema } from '../../shared/schemas';
import { currentUser, guard } from '../auth/guard';
import type { AppContext } from '../context';
import { parseBody, parseParams, parseQuery } from '../http/validate';
import { handlePaymentWebhook, listOrders, refundSeats } from '../services/payments';
import { seatPricing, setSeatPricing } from '../services/pricing';

/** The payment webhook needs the raw body to verify its signature: mounted before the JSON parser. */
export function paymentWebhookRoute(ctx: AppContext) {
  const router = Router();
  router.post('/payments/webhook', express.raw({ type: 'application/json', limit: '256kb' }), async (req, res) => {
    await handlePaymentWebhook(ctx, Buffer.isBuffer(req.body) ? req.body : Buffer.alloc(0), req.get('stripe-signature'));
    res.json({ received: true });
  });
  return router;
}

export function paymentRoutes(ctx: AppContext) {
  const router = Router();
  const admin = guard(['admin']);

  // Public: the landing page shows prices.
  router.get('/pricing', async (_req, res) => {
    res.json({ pricing: await seatPricing(ctx) });
  });

  router.put('/pricing', admin, async (req, res) => {
    res.json({ pricing: await setSeatPricing(ctx, parseBody(seatPricingSchema, req)) });
  });

  router.get('/orders', admin, async (req, res) => {
    const { organizationId } = parseQuery(z.strictObject({ organizationId: idSchema.optional() }), req);
    res.json({ items: await listOrders(organizationId) });
  });

  router.post('/orders/:orderId/refunds', admin, async (req, res) => {
    const { orderId } = parseParams(z.strictObject({ orderId: z.uuid({ error: 'Not an order id.' }) }), req);
    res.json({ order: await refundSeats(ctx, currentUser(req), orderId, parseBody(refundSchema, req).quantity) });
  });

  return router;
}
