import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request, { type Agent } from 'supertest';
import Stripe from 'stripe';
import { SeatLedgerEntry, SeatOrder, User } from '../../server/db/models';
import { startStripeStandin, TEST_CARDS, type StripeStandin } from '../../server/fakes/stripe-standin';
import { startWorkers } from '../../server/jobs/workers';
import { createTestApp, mailContaining, resetRateLimits, signedInAgent, tokenFrom, type TestApp } from '../support/api';
import { testEnv } from '../support/test-env';

const WEBHOOK_SECRET = testEnv().STRIPE_WEBHOOK_SECRET ?? 'whsec_driftproof_local_standin';
let t: TestApp;
let listener: Server;
let standin: StripeStandin;

beforeAll(async () => {
  // The stand-in posts webhooks over HTTP, so this file's app listens on a loopback port.
  let appUrl = '';
  standin = await startStripeStandin({ port: 0, webhookUrl: () => `${appUrl}/api/payments/webhook`, webhookSecret: 'whsec_driftproof_local_standin' });
  t = createTestApp({ STRIPE_API_URL: standin.url });
  listener = createServer(t.app);
  await new Promise<void>((r) => listener.listen(0, '127.0.0.1', r));
  appUrl = `http://127.0.0.1:${(listener.address() as AddressInfo).port}`;
  await startWorkers(t.ctx);
});
afterAll(async () => {
  await new Promise((r) => listener.close(r));
  await standin.close();
  await t.close();
});

let counter = 0;
/** A new organization with a confirmed employer, signed in. */
async function newEmployer(): Promise<{ agent: Agent; orgId: number; email: string }> {
  await resetRateLimits(t.ctx);
  const n = ++counter;
  const email = `buyer${n}@firm${n}.example.test`;
  const agent = request.agent(t.app);
  const res = await agent.post('/api/signup').send({ organizationName: `Harbour Freight Test ${n}`, name: `Buyer ${n}`, email, password: 'buyer-password-1' }).expect(201);
  const confirm = await mailContaining(email, '/confirm-email?token=');
  await request(t.app).post('/api/signup/confirm').send({ token: /token=([A-Za-z0-9_-]{43})/.exec(confirm.textBody!)![1] }).expect(204);
  await agent.post('/api/auth/sign-in').send({ email, password: 'buyer-password-1' }).expect(200);
  return { agent, orgId: res.body.user.organizationId, email };
}

async function pay(checkoutUrl: string, card: string) {
  return fetch(checkoutUrl, { method: 'POST', body: new URLSearchParams({ card }), redirect: 'manual' });
}

async function balance(agent: Agent, orgId: number): Promise<number> {
  return (await agent.get(`/api/organizations/${orgId}/seats`).expect(200)).body.balance;
}

async function waitFor(check: () => Promise<boolean>) {
  for (let i = 0; i < 50 && !(await check()); i++) await new Promise((r) => setTimeout(r, 100));
}

describe('employer sign-up', () => {
  it('creates the organization and an employer who must confirm the e-mail before buying', async () => {
    const agent = request.agent(t.app);
    const email = 'new.company@firm.example.test';
    const res = await agent.post('/api/signup').send({ organizationName: 'Kestrel Yard Supplies', name: 'Ada Quill', email, password: 'long-enough-pw' }).expect(201);
    expect(res.body.user).toMatchObject({ role: 'employer', emailConfirmed: false, organizationName: 'Kestrel Yard Supplies' });
    await agent.post('/api/auth/sign-in').send({ email, password: 'long-enough-pw' }).expect(200);
    const blocked = await agent.post(`/api/organizations/${res.body.user.organizationId}/orders`).send({ quantity: 2 }).expect(403);
    expect(blocked.body.error.code).toBe('email_unconfirmed');
    const mail = await mailContaining(email, '/confirm-email?token=');
    const token = /token=([A-Za-z0-9_-]{43})/.exec(mail.textBody!)![1];
    await request(t.app).post('/api/signup/confirm').send({ token }).expect(204);
    await request(t.app).post('/api/signup/confirm').send({ token }).expect(400);
    expect((await agent.get('/api/auth/me')).body.user.emailConfirmed).toBe(true);
    const again = await request(t.app).post('/api/signup').send({ organizationName: 'Kestrel Yard Supplies', name: 'Other', email: 'other@firm.example.test', password: 'long-enough-pw' }).expect(409);
    expect(again.body.error.fields.organizationName).toBeDefined();
  });
});

describe('buying seats', () => {
  it('checkout → hosted page → signed webhook credits the seats once; a receipt PDF is e-mailed', async () => {
    const { agent, orgId, email } = await newEmployer();
    expect(await balance(agent, orgId)).toBe(0);
    const res = await agent.post(`/api/organizations/${orgId}/orders`).send({ quantity: 12 }).expect(201);
    // Volume tier from 10 seats: 44.00 instead of 49.00 (demo pricing).
    expect(res.body.order).toMatchObject({ quantity: 12, unitAmount: 4400, amountTotal: 52800, status: 'pending' });
    expect(res.body.checkoutUrl).toContain(`${standin.url}/pay/cs_test_`);
    expect(await balance(agent, orgId)).toBe(0);

    const paid = await pay(res.body.checkoutUrl, TEST_CARDS.succeeds);
    expect(paid.status).toBe(303);
    expect(paid.headers.get('location')).toContain(`/employer/orders/${res.body.order.id}?checkout=success`);
    expect(await balance(agent, orgId)).toBe(12);
    const order = await SeatOrder.findByPk(res.body.order.id);
    expect(order!.status).toBe('paid');

    const receipt = await mailContaining(email, 'exam seats for 528.00 EUR');
    const attachment = await t.ctx.sequelize.query<{ size_bytes: number }>('SELECT size_bytes FROM mail_messages WHERE id = :id', { replacements: { id: receipt.id }, type: 'SELECT' as never });
    expect(attachment[0].size_bytes).toBeGreaterThan(5000);
    expect(receipt.subject).toBe('Driftproof receipt: 12 exam seats');
  });

  it('a duplicated event credits once; a forged or unsigned one is refused and credits nothing', async () => {
    const { agent, orgId } = await newEmployer();
    const res = await agent.post(`/api/organizations/${orgId}/orders`).send({ quantity: 3 }).expect(201);
    await pay(res.body.checkoutUrl, TEST_CARDS.succeeds);
    expect(await balance(agent, orgId)).toBe(3);
    const session = await t.ctx.stripe.checkout.sessions.retrieve(/pay\/(cs_test_[a-f0-9]+)/.exec(res.body.checkoutUrl)![1]);
    const event = { id: 'evt_test_replayed_once', object: 'event', type: 'checkout.session.completed', data: { object: session } };
    const payload = JSON.stringify(event);
    const signed = Stripe.webhooks.generateTestHeaderString({ payload, secret: WEBHOOK_SECRET });
    for (let i = 0; i < 2; i++) {
      await request(t.app).post('/api/payments/webhook').set('content-type', 'application/json').set('stripe-signature', signed).send(payload).expect(200);
    }
    expect(await balance(agent, orgId)).toBe(3);

    const forged = Stripe.webhooks.generateTestHeaderString({ payload: JSON.stringify({ ...event, id: 'evt_test_forged' }), secret: 'whsec_not_ours' });
    const bad = await request(t.app).post('/api/payments/webhook').set('content-type', 'application/json').set('stripe-signature', forged).send(JSON.stringify({ ...event, id: 'evt_test_forged' })).expect(400);
    expect(bad.body.error.code).toBe('bad_signature');
    await request(t.app).post('/api/payments/webhook').set('content-type', 'application/json').send(JSON.stringify({ ...event, id: 'evt_test_unsigned' })).expect(400);
    expect(await balance(agent, orgId)).toBe(3);
  });

  it('an employer reads one order and can give up a pending checkout', async () => {
    const { agent, orgId } = await newEmployer();
    const res = await agent.post(`/api/organizations/${orgId}/orders`).send({ quantity: 2 }).expect(201);
    const one = await agent.get(`/api/organizations/${orgId}/orders/${res.body.order.id}`).expect(200);
    expect(one.body.order).toMatchObject({ id: res.body.order.id, status: 'pending', quantity: 2 });
    const cancelled = await agent.post(`/api/organizations/${orgId}/orders/${res.body.order.id}/cancel`).expect(200);
    expect(cancelled.body.order.status).toBe('expired');
    const late = await pay(res.body.checkoutUrl, TEST_CARDS.succeeds);
    expect(late.status).toBe(200); // the payment page says the session is over
    expect(await balance(agent, orgId)).toBe(0);
    const other = await newEmployer();
    await other.agent.get(`/api/organizations/${orgId}/orders/${res.body.order.id}`).expect(403);
  });

  it('a declined card or an expired session credits nothing', async () => {
    const { agent, orgId } = await newEmployer();
    const res = await agent.post(`/api/organizations/${orgId}/orders`).send({ quantity: 4 }).expect(201);
    const declined = await pay(res.body.checkoutUrl, TEST_CARDS.declined);
    expect(declined.status).toBe(402);
    expect(await declined.text()).toContain('Your card was declined.');
    expect(await balance(agent, orgId)).toBe(0);
    const sessionId = /pay\/(cs_test_[a-f0-9]+)/.exec(res.body.checkoutUrl)![1];
    await t.ctx.stripe.checkout.sessions.expire(sessionId);
    await waitFor(async () => (await SeatOrder.findByPk(res.body.order.id))!.status === 'expired');
    expect((await SeatOrder.findByPk(res.body.order.id))!.status).toBe('expired');
    expect(await balance(agent, orgId)).toBe(0);
  });

  it('an admin refunds unused seats through the SDK; the ledger and the order follow', async () => {
    const { agent, orgId } = await newEmployer();
    const res = await agent.post(`/api/organizations/${orgId}/orders`).send({ quantity: 5 }).expect(201);
    await pay(res.body.checkoutUrl, TEST_CARDS.succeeds);
    const admin = await signedInAgent(t.app, 'admin');
    await agent.post(`/api/orders/${res.body.order.id}/refunds`).send({ quantity: 1 }).expect(403);
    const partial = await admin.post(`/api/orders/${res.body.order.id}/refunds`).send({ quantity: 2 }).expect(200);
    expect(partial.body.order).toMatchObject({ status: 'partially_refunded', refundedQuantity: 2 });
    expect(await balance(agent, orgId)).toBe(3);
    const tooMany = await admin.post(`/api/orders/${res.body.order.id}/refunds`).send({ quantity: 4 }).expect(409);
    expect(tooMany.body.error.code).toBe('seats_in_use');
    await admin.post(`/api/orders/${res.body.order.id}/refunds`).send({ quantity: 3 }).expect(200);
    expect(await balance(agent, orgId)).toBe(0);
    const kinds = (await SeatLedgerEntry.findAll({ where: { organizationId: orgId }, order: [['id', 'ASC']] })).map((e) => `${e.kind}:${e.delta}`);
    expect(kinds).toEqual(['purchase:5', 'refund:-2', 'refund:-3']);
    await expect(t.ctx.sequelize.query('DELETE FROM seat_ledger WHERE organization_id = :orgId', { replacements: { orgId } })).rejects.toThrow(/append-only/);
  });

  it('a refund retried after its answer was lost is paid once; a retry for another number of seats is refused, not paid', async () => {
    const { agent, orgId } = await newEmployer();
    const res = await agent.post(`/api/organizations/${orgId}/orders`).send({ quantity: 5 }).expect(201);
    await pay(res.body.checkoutUrl, TEST_CARDS.succeeds);
    const order = (await SeatOrder.findByPk(res.body.order.id))!;
    // The payment service refunded 2 seats, but the app's transaction never committed (say the
    // database went away): the order and the ledger know nothing of it.
    const key = `refund-${order.id}-0`;
    const first = await t.ctx.stripe.refunds.create({ payment_intent: order.paymentIntentId!, amount: 2 * order.unitAmount }, { idempotencyKey: key });
    const admin = await signedInAgent(t.app, 'admin');
    // A retry for another number of seats is refused by the service, not paid …
    const other = await admin.post(`/api/orders/${order.id}/refunds`).send({ quantity: 3 }).expect(409);
    expect(other.body.error.code).toBe('refund_pending');
    expect(await balance(agent, orgId)).toBe(5);
    // … the same refund again gets the same refund back from the service, not a new one …
    await admin.post(`/api/orders/${order.id}/refunds`).send({ quantity: 2 }).expect(200);
    const again = await t.ctx.stripe.refunds.create({ payment_intent: order.paymentIntentId!, amount: 2 * order.unitAmount }, { idempotencyKey: key });
    expect(again.id).toBe(first.id);
    // … so the other 3 seats can still be refunded: 5 paid, 5 refunded, not 7.
    await admin.post(`/api/orders/${order.id}/refunds`).send({ quantity: 3 }).expect(200);
    expect(await balance(agent, orgId)).toBe(0);
  });

  it('20 parallel exam starts against 5 seats start exactly 5', async () => {
    const { agent, orgId } = await newEmployer();
    const admin = await signedInAgent(t.app, 'admin');
    await admin.post(`/api/organizations/${orgId}/seat-grants`).send({ count: 5 }).expect(201);
    await agent.post(`/api/organizations/${orgId}/operators`).send({ email: `racer${orgId}@firm.example.test`, name: 'Race Driver' }).expect(201);
    const operator = await User.findOne({ where: { email: `racer${orgId}@firm.example.test` } });
    await operator!.update({ passwordHash: (await User.findOne({ where: { email: 'operator1@demo.driftproof.test' } }))!.passwordHash });
    const driver = request.agent(t.app);
    await driver.post('/api/auth/sign-in').send({ email: `racer${orgId}@firm.example.test`, password: 'drive-safe-demo' }).expect(200);
    const starts = await Promise.all(Array.from({ length: 20 }, () => driver.post('/api/attempts').send({ trialId: 'long-aisle-run', mode: 'exam' })));
    expect(starts.filter((r) => r.status === 201)).toHaveLength(5);
    expect(starts.filter((r) => r.status === 402)).toHaveLength(15);
    expect(await balance(agent, orgId)).toBe(0);
  });

  it("only the organization's own employers (and admins) reach it", async () => {
    const first = await newEmployer();
    const second = await newEmployer();
    await second.agent.get(`/api/organizations/${first.orgId}/seats`).expect(403);
    await second.agent.post(`/api/organizations/${first.orgId}/orders`).send({ quantity: 1 }).expect(403);
    await (await signedInAgent(t.app, 'operator1')).get(`/api/organizations/1/operators`).expect(403);
    await (await signedInAgent(t.app, 'admin')).get(`/api/organizations/${first.orgId}/seats`).expect(200);
    await request(t.app).get('/api/pricing').expect(200);
  });
});

describe('enrolment', () => {
  const csv = (text: string) => Buffer.from(text, 'utf8');

  it('previews a roster with per-row errors and imports nothing from it', async () => {
    const { agent, orgId } = await newEmployer();
    const preview = await agent
      .post(`/api/organizations/${orgId}/roster/preview`)
      .attach('roster', csv('email,name,levels\nok.one@firm.example.test,Olive One,aisle-operator\nnot-an-email,Bad Mail,\nlevel.typo@firm.example.test,Lev Typo,aisle-operater\n'), 'roster.csv')
      .expect(200);
    expect(preview.body).toMatchObject({ errors: 2, toInvite: 1 });
    expect(preview.body.rows[1]).toMatchObject({ line: 3, errors: ['Enter a valid e-mail address.'] });
    expect(preview.body.rows[2].errors).toEqual(['No level "aisle-operater".']);
    const imported = await agent
      .post(`/api/organizations/${orgId}/roster/import`)
      .attach('roster', csv('email,name,levels\nok.one@firm.example.test,Olive One,aisle-operator\nnot-an-email,Bad Mail,\n'), 'roster.csv')
      .expect(400);
    expect(imported.body.error.code).toBe('roster_has_errors');
    expect(await User.count({ where: { organizationId: orgId, role: 'operator' } })).toBe(0);
  });

  it('refuses malformed and oversize files and a wrong header with clear messages', async () => {
    const { agent, orgId } = await newEmployer();
    const malformed = await agent.post(`/api/organizations/${orgId}/roster/preview`).attach('roster', csv('email,name\n"unterminated,Quote\n'), 'r.csv').expect(400);
    expect(malformed.body.error.code).toBe('malformed_csv');
    const header = await agent.post(`/api/organizations/${orgId}/roster/preview`).attach('roster', csv('mail,fullname\na@b.test,A\n'), 'r.csv').expect(400);
    expect(header.body.error.message).toContain('Missing: email, name.');
    const big = await agent.post(`/api/organizations/${orgId}/roster/preview`).attach('roster', Buffer.alloc(5 * 1024 * 1024 + 10, 'a'), 'big.csv').expect(413);
    expect(big.body.error.message).toBe('A roster file is at most 5 MB.');
    const rows = ['email,name', ...Array.from({ length: 2001 }, (_, i) => `p${i}@firm.example.test,Person ${i}`)].join('\n');
    const long = await agent.post(`/api/organizations/${orgId}/roster/preview`).attach('roster', csv(rows), 'r.csv').expect(400);
    expect(long.body.error.code).toBe('roster_too_long');
    await agent.post(`/api/organizations/${orgId}/roster/preview`).expect(400);
  });

  it('imports a good roster, merges duplicates, invites each new operator once, who joins from the e-mail link', async () => {
    const { agent, orgId } = await newEmployer();
    const res = await agent
      .post(`/api/organizations/${orgId}/roster/import`)
      .attach(
        'roster',
        csv('email,name,levels\ncara.lind@firm.example.test,Cara Lind,aisle-operator\nDev.Orme@firm.example.test,Dev Orme,floor-and-dock\ncara.lind@firm.example.test,Cara Lind,drift-judgement\n'),
        'roster.csv',
      )
      .expect(201);
    expect(res.body).toMatchObject({ toInvite: 2, duplicates: 1, errors: 0 });
    const operators = await agent.get(`/api/organizations/${orgId}/operators`).expect(200);
    expect(operators.body.total).toBe(2);
    const cara = operators.body.items.find((o: { email: string }) => o.email === 'cara.lind@firm.example.test');
    expect(cara.invited).toBe(true);
    expect(cara.levels.filter((l: { assigned: boolean }) => l.assigned).map((l: { levelId: string }) => l.levelId).sort()).toEqual(['aisle-operator', 'drift-judgement']);

    const invitation = await mailContaining('cara.lind@firm.example.test', '&invited=1');
    expect(invitation.subject).toMatch(/invites you to Driftproof/);
    await request(t.app).post('/api/auth/password-reset/confirm').send({ token: tokenFrom(invitation), password: 'cara-chose-this' }).expect(204);
    const joined = await request(t.app).post('/api/auth/sign-in').send({ email: 'cara.lind@firm.example.test', password: 'cara-chose-this' }).expect(200);
    expect(joined.body.user).toMatchObject({ role: 'operator', organizationId: orgId });
    await agent.post(`/api/organizations/${orgId}/operators/${cara.id}/invitation`).expect(409);

    const csvExport = await agent.get(`/api/organizations/${orgId}/operators.csv`).expect(200);
    expect(csvExport.headers['content-type']).toContain('text/csv');
    expect(csvExport.text.split('\r\n')[0]).toBe('name,email,status,aisle-operator,floor-and-dock,drift-judgement');
    expect(csvExport.text).toContain('Cara Lind,cara.lind@firm.example.test,joined,assigned; 0/2 trials; not_started');
  });

  it('enrols by form, refuses an operator of another organization, assigns levels and resends invitations', async () => {
    const { agent, orgId } = await newEmployer();
    const added = await agent.post(`/api/organizations/${orgId}/operators`).send({ email: 'form.made@firm.example.test', name: 'Form Made', levelIds: ['aisle-operator'] }).expect(201);
    expect(added.body.invited).toBe(true);
    const taken = await agent.post(`/api/organizations/${orgId}/operators`).send({ email: 'operator1@demo.driftproof.test', name: 'Someone Else' }).expect(409);
    expect(taken.body.error.message).toMatch(/another organization/);
    await agent.post(`/api/organizations/${orgId}/operators`).send({ email: 'x@firm.example.test', name: 'X', levelIds: ['no-such-level'] }).expect(400);
    const levels = await agent.put(`/api/organizations/${orgId}/operators/${added.body.id}/levels`).send({ levelIds: ['floor-and-dock', 'drift-judgement'] }).expect(200);
    expect(levels.body.levelIds).toEqual(['drift-judgement', 'floor-and-dock']);
    await agent.post(`/api/organizations/${orgId}/operators/${added.body.id}/invitation`).expect(202);
    await waitFor(async () => (await t.ctx.sequelize.query(`SELECT 1 FROM mail_messages WHERE envelope_to = 'form.made@firm.example.test'`, { type: 'SELECT' as never })).length >= 2);
    const mails = await t.ctx.sequelize.query(`SELECT id FROM mail_messages WHERE envelope_to = 'form.made@firm.example.test'`, { type: 'SELECT' as never });
    expect(mails.length).toBe(2);
  });
});
