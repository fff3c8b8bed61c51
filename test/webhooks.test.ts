import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { eq, inArray } from 'drizzle-orm';
import Stripe from 'stripe';
import request from 'supertest';
import { addDays, termEnd } from '../shared/renewals';
import { agreements, invoices, payments, stripeEvents } from '../server/db/schema';
import { localDate } from '../server/company/company';
import { runRenewals } from '../server/renewals/renewal-engine';
import { newHousehold, payOnHostedPage, seedAgreement, startHarness, waitFor, WEBHOOK_SECRET, type Harness } from './billing-harness';
import { CSRF_HEADER_NAME } from './support/auth';

let h: Harness;
let today: string;
beforeAll(async () => {
  h = await startHarness({ retries: 2 });
  today = localDate(new Date(), 'America/Chicago');
});
afterAll(() => h.close());
beforeEach(() => h.fake.fake.setWebhookBehaviour({ duplicate: false, outOfOrder: false }));

const db = () => h.ctx.database.db;
const agreementRow = async (id: string) => (await db().select().from(agreements).where(eq(agreements.id, id)))[0]!;

async function renewalPaidByWebhookOnly(card = '4242424242424242') {
  const hh = await newHousehold(h, 'hook');
  const endsOn = addDays(today, 20);
  const { agreement } = await seedAgreement(h, hh, { endsOn, status: 'renewal_due', planCode: 'priority-comfort' });
  const mark = h.fake.fake.deliveries().length;
  const start = await hh.homeowner.agent.post(`/api/agreements/${agreement.id}/renew`).set(CSRF_HEADER_NAME, hh.homeowner.csrf).send({}).expect(200);
  const paid = await payOnHostedPage(start.body.checkoutUrl, card);
  expect(paid.status).toBe(303);
  await h.fake.fake.webhooksIdle();
  return { hh, agreement, endsOn, invoiceId: start.body.invoiceId as string, delivered: h.fake.fake.deliveries().slice(mark) };
}

describe('signed webhooks', () => {
  it('a bad signature gets 400 and changes nothing', async () => {
    const payload = JSON.stringify({
      id: 'evt_forged_1',
      object: 'event',
      type: 'payment_intent.succeeded',
      data: { object: { id: 'pi_forged', object: 'payment_intent', metadata: {} } },
    });
    const forged = Stripe.webhooks.generateTestHeaderString({ payload, secret: 'whsec_someone_else' });
    const res = await request(h.ctx.app).post('/api/webhooks/stripe').set('Stripe-Signature', forged).set('Content-Type', 'application/json').send(payload);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('bad_signature');
    await request(h.ctx.app).post('/api/webhooks/stripe').set('Content-Type', 'application/json').send(payload).expect(400);
    // The body altered after signing fails too.
    const good = Stripe.webhooks.generateTestHeaderString({ payload, secret: WEBHOOK_SECRET });
    await request(h.ctx.app)
      .post('/api/webhooks/stripe')
      .set('Stripe-Signature', good)
      .set('Content-Type', 'application/json')
      .send(payload.replace('pi_forged', 'pi_forgef'))
      .expect(400);
    expect(await db().select().from(stripeEvents).where(eq(stripeEvents.id, 'evt_forged_1'))).toEqual([]);
  });

  it('pays the renewal from the webhook alone (no return call), and stores each event once', async () => {
    const { agreement, endsOn, invoiceId } = await renewalPaidByWebhookOnly();
    const after = await waitFor('renewed', async () => {
      const a = await agreementRow(agreement.id);
      return a.status === 'active' ? a : null;
    });
    expect(after.endsOn).toBe(termEnd(endsOn));
    const [inv] = await db().select().from(invoices).where(eq(invoices.id, invoiceId));
    expect(inv!.status).toBe('paid');
    const delivered = h.fake.fake
      .deliveries()
      .filter((d) => d.status === 200)
      .map((d) => d.eventId);
    const stored = await db().select().from(stripeEvents).where(inArray(stripeEvents.id, delivered));
    expect(stored.length).toBe(new Set(delivered).size);
    expect(stored.every((e) => e.processedAt !== null)).toBe(true);
  });

  it('a webhook delivered three times gives one payment', async () => {
    h.fake.fake.setWebhookBehaviour({ duplicate: true });
    const { agreement, invoiceId } = await renewalPaidByWebhookOnly();
    // A third copy of the completed-session event, signed as the processor signs it.
    const event = h.fake.fake
      .events()
      .find(
        (e) =>
          e.type === 'checkout.session.completed' && (e as unknown as { data: { object: { metadata: Record<string, string> } } }).data.object.metadata['invoiceId'] === invoiceId,
      )!;
    const payload = JSON.stringify(event);
    await request(h.ctx.app)
      .post('/api/webhooks/stripe')
      .set('Stripe-Signature', Stripe.webhooks.generateTestHeaderString({ payload, secret: WEBHOOK_SECRET }))
      .set('Content-Type', 'application/json')
      .send(payload)
      .expect(200);
    const copies = h.fake.fake.deliveries().filter((d) => d.eventId === event.id && d.status === 200);
    expect(copies.length).toBe(2);
    const pays = await db().select().from(payments).where(eq(payments.invoiceId, invoiceId));
    expect(pays.filter((p) => p.status === 'succeeded')).toHaveLength(1);
    expect((await agreementRow(agreement.id)).status).toBe('active');
    const terms = await db().select().from(invoices).where(eq(invoices.agreementId, agreement.id));
    expect(terms).toHaveLength(1);
  });

  it('events out of order (and twice) end in the same state: one payment, agreement active, one term', async () => {
    h.fake.fake.setWebhookBehaviour({ duplicate: true, outOfOrder: true });
    const { agreement, endsOn, invoiceId, delivered } = await renewalPaidByWebhookOnly();
    // The processor raised payment_intent.succeeded first; the completed session arrived before it.
    const order = delivered.map((d) => d.type);
    expect(order.indexOf('checkout.session.completed')).toBeGreaterThanOrEqual(0);
    expect(order.indexOf('checkout.session.completed')).toBeLessThan(order.indexOf('payment_intent.succeeded'));
    const a = await agreementRow(agreement.id);
    expect(a).toMatchObject({ status: 'active', startsOn: endsOn, endsOn: termEnd(endsOn) });
    const pays = await db().select().from(payments).where(eq(payments.invoiceId, invoiceId));
    expect(pays.filter((p) => p.status === 'succeeded')).toHaveLength(1);
  });

  it('a refund made at the processor arrives as charge.refunded and is recorded once', async () => {
    const { invoiceId } = await renewalPaidByWebhookOnly();
    const [pay] = await db().select().from(payments).where(eq(payments.invoiceId, invoiceId));
    h.fake.fake.setWebhookBehaviour({ duplicate: true });
    await h.stripe.refunds.create({ payment_intent: pay!.stripePaymentIntentId!, amount: 1500 });
    await h.fake.fake.webhooksIdle();
    const [inv] = await db().select().from(invoices).where(eq(invoices.id, invoiceId));
    expect(inv).toMatchObject({ status: 'partially_refunded', refundedCents: 1500 });
  });
});

describe('off-session charge with faults', () => {
  it('the processor answering 500 twice then succeeding ends in one charge', async () => {
    const hh = await newHousehold(h, 'fault-charge');
    const endsOn = today;
    const { agreement } = await seedAgreement(h, hh, { endsOn, status: 'renewal_due', card: 'pm_card_visa' });
    h.fake.fake.addFault({ path: '/v1/payment_intents', method: 'POST', status: 500, times: 2 });
    const report = await runRenewals(h.ctx.deps, { today: endsOn, only: [agreement.id] });
    expect(report).toMatchObject({ charged: 1, errors: [] });
    const pis = (await h.stripe.paymentIntents.list({ limit: 100 })).data.filter((p) => p.metadata['agreementId'] === agreement.id);
    expect(pis).toHaveLength(1);
    expect((await agreementRow(agreement.id)).endsOn).toBe(termEnd(endsOn));
  });
});
