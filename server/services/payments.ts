/**
 * Buying seats through the official stripe SDK: a Checkout Session per order, seats credited only
 * by the signed `checkout.session.completed` webhook (each event id processed once), and refunds
 * of unused seats by the admin.
 */
import { randomUUID } from 'node:crypto';
import Stripe from 'stripe';
import { unitPriceFor, type SeatOrderView } from '../../shared/schemas';
import type { AppContext } from '../context';
import { Organization, SeatLedgerEntry, SeatOrder, User } from '../db/models';
import { HttpError, notFound } from '../http/errors';
import { JOBS } from '../jobs/queue';
import { seatPricing } from './pricing';
import { lockOrganization, seatBalance } from './seats';

export function orderView(order: SeatOrder): SeatOrderView {
  return {
    id: order.id,
    quantity: order.quantity,
    unitAmount: order.unitAmount,
    amountTotal: order.amountTotal,
    currency: order.currency,
    status: order.status,
    refundedQuantity: order.refundedQuantity,
    createdAt: order.createdAt.toISOString(),
    paidAt: order.paidAt?.toISOString() ?? null,
  };
}

/** Creates a pending order and its Checkout Session; returns where to send the buyer. */
export async function startCheckout(ctx: AppContext, actor: Express.User, organizationId: number, quantity: number): Promise<{ order: SeatOrderView; checkoutUrl: string }> {
  const buyer = await User.findByPk(actor.id);
  if (!buyer?.emailConfirmedAt) throw new HttpError(403, 'email_unconfirmed', 'Confirm your e-mail address (see the link we sent you) before buying seats.');
  const pricing = await seatPricing(ctx);
  const unitAmount = unitPriceFor(pricing, quantity);
  const order = await SeatOrder.create({
    id: randomUUID(),
    organizationId,
    createdBy: actor.id,
    quantity,
    unitAmount,
    amountTotal: unitAmount * quantity,
    currency: pricing.currency,
    checkoutSessionId: null,
    paymentIntentId: null,
    paidAt: null,
  });
  let session: Stripe.Checkout.Session;
  try {
    session = await ctx.stripe.checkout.sessions.create(
      {
        mode: 'payment',
        line_items: [{ quantity, price_data: { currency: pricing.currency, unit_amount: unitAmount, product_data: { name: 'Driftproof exam seat' } } }],
        client_reference_id: order.id,
        metadata: { orderId: order.id, organizationId: String(organizationId) },
        customer_email: buyer.email,
        success_url: `${ctx.config.appUrl}/employer/orders/${order.id}?checkout=success`,
        cancel_url: `${ctx.config.appUrl}/employer/orders/${order.id}?checkout=cancelled`,
      },
      { idempotencyKey: `order-${order.id}` },
    );
  } catch (error) {
    await order.update({ status: 'expired' });
    console.error('checkout session:', (error as Error).message);
    throw new HttpError(502, 'payment_unavailable', 'The payment service did not answer. Nothing was charged; please try again.');
  }
  await order.update({ checkoutSessionId: session.id });
  return { order: orderView(order), checkoutUrl: session.url! };
}

/** Verifies and applies a webhook. A forged or unsigned one is refused; a repeated event changes nothing. */
export async function handlePaymentWebhook(ctx: AppContext, rawBody: Buffer, signature: string | undefined): Promise<void> {
  let event: Stripe.Event;
  try {
    event = ctx.stripe.webhooks.constructEvent(rawBody, signature ?? '', ctx.config.stripe.webhookSecret);
  } catch {
    throw new HttpError(400, 'bad_signature', 'The webhook signature does not verify.');
  }
  if (event.type !== 'checkout.session.completed' && event.type !== 'checkout.session.expired') return;
  const session = event.data.object as Stripe.Checkout.Session;
  await ctx.sequelize.transaction(async (transaction) => {
    const [, fresh] = await ctx.sequelize.query(`INSERT INTO payment_events (id, type) VALUES (:id, :type) ON CONFLICT (id) DO NOTHING RETURNING id`, {
      replacements: { id: event.id, type: event.type },
      transaction,
    });
    if (!fresh) return; // this event was processed before
    const order = await SeatOrder.findOne({ where: { checkoutSessionId: session.id }, transaction, lock: transaction.LOCK.UPDATE });
    if (!order || order.status !== 'pending') return;
    if (event.type === 'checkout.session.expired') {
      await order.update({ status: 'expired' }, { transaction });
      return;
    }
    if (session.payment_status !== 'paid' || session.amount_total !== order.amountTotal) return;
    await order.update({ status: 'paid', paidAt: new Date(), paymentIntentId: String(session.payment_intent ?? '') }, { transaction });
    await SeatLedgerEntry.create(
      { organizationId: order.organizationId, delta: order.quantity, kind: 'purchase', orderId: order.id, attemptId: null, actorId: order.createdBy },
      { transaction },
    );
    await ctx.jobs.send(JOBS.receiptMail, { orderId: order.id }, { transaction, singletonKey: order.id });
  });
}

/**
 * Asks the payment service for a refund. The idempotency key is the order and how many of its seats
 * were refunded before, so a retry after a lost commit gets the same refund back (paid once), and
 * a retry for another number of seats is refused by the service instead of paid a second time.
 */
async function sendRefund(ctx: AppContext, order: SeatOrder, quantity: number): Promise<void> {
  try {
    await ctx.stripe.refunds.create({ payment_intent: order.paymentIntentId!, amount: quantity * order.unitAmount }, { idempotencyKey: `refund-${order.id}-${order.refundedQuantity}` });
  } catch (error) {
    if (error instanceof Stripe.errors.StripeIdempotencyError) {
      throw new HttpError(
        409,
        'refund_pending',
        'A refund of this order for another number of seats reached the payment service but was not recorded here. Send that refund again to record it; nothing else was refunded.',
      );
    }
    console.error('refund:', (error as Error).message);
    throw new HttpError(502, 'payment_unavailable', 'The payment service did not confirm the refund, so nothing was recorded. Send the same refund again: it is paid once.');
  }
}

/** Refunds unused seats of a paid order through the SDK; the order and the ledger follow. */
export async function refundSeats(ctx: AppContext, actor: Express.User, orderId: string, quantity: number): Promise<SeatOrderView> {
  return ctx.sequelize.transaction(async (transaction) => {
    const order = await SeatOrder.findByPk(orderId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!order) throw notFound('That order');
    await lockOrganization(order.organizationId, transaction);
    if (!order.paymentIntentId || (order.status !== 'paid' && order.status !== 'partially_refunded')) {
      throw new HttpError(409, 'not_refundable', 'Only paid orders can be refunded.');
    }
    const refundable = Math.min(order.quantity - order.refundedQuantity, await seatBalance(order.organizationId, transaction));
    if (quantity > refundable) {
      throw new HttpError(409, 'seats_in_use', `At most ${refundable} seat${refundable === 1 ? '' : 's'} of this order can be refunded: the rest are used or already refunded.`);
    }
    await sendRefund(ctx, order, quantity);
    const refundedQuantity = order.refundedQuantity + quantity;
    await order.update({ refundedQuantity, status: refundedQuantity === order.quantity ? 'refunded' : 'partially_refunded' }, { transaction });
    await SeatLedgerEntry.create({ organizationId: order.organizationId, delta: -quantity, kind: 'refund', orderId: order.id, attemptId: null, actorId: actor.id }, { transaction });
    return orderView(order);
  });
}

/** Orders for the admin, newest first, with the organization's name. */
export async function listOrders(organizationId?: number): Promise<(SeatOrderView & { organizationId: number; organizationName: string })[]> {
  const rows = await SeatOrder.findAll({ where: organizationId ? { organizationId } : {}, order: [['createdAt', 'DESC']], limit: 200 });
  const names = new Map((await Organization.findAll({ where: { id: [...new Set(rows.map((r) => r.organizationId))] } })).map((o) => [o.id, o.name]));
  return rows.map((r) => ({ ...orderView(r), organizationId: r.organizationId, organizationName: names.get(r.organizationId) ?? '' }));
}

export async function orderOf(organizationId: number, orderId: string): Promise<SeatOrderView> {
  const order = await SeatOrder.findOne({ where: { id: orderId, organizationId } });
  if (!order) throw notFound('That order');
  return orderView(order);
}

/** Gives up a pending checkout: the session is expired through the SDK, and its webhook settles the order. */
export async function cancelCheckout(ctx: AppContext, organizationId: number, orderId: string): Promise<SeatOrderView> {
  const order = await SeatOrder.findOne({ where: { id: orderId, organizationId } });
  if (!order) throw notFound('That order');
  if (order.status !== 'pending') return orderView(order);
  if (order.checkoutSessionId) {
    try {
      await ctx.stripe.checkout.sessions.expire(order.checkoutSessionId);
    } catch (error) {
      // Already paid or expired at the payment service: its webhook decides.
      console.error('expire checkout session:', (error as Error).message);
      return orderView(order);
    }
  }
  await SeatOrder.update({ status: 'expired' }, { where: { id: orderId, status: 'pending' } });
  await order.reload();
  return orderView(order);
}

export async function ordersOf(organizationId: number, limit = 50): Promise<SeatOrderView[]> {
  const rows = await SeatOrder.findAll({ where: { organizationId }, order: [['createdAt', 'DESC']], limit });
  return rows.map(orderView);
}
