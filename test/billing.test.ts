import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, isNotNull } from 'drizzle-orm';
import Stripe from 'stripe';
import { addDays } from '../shared/renewals';
import { invoices, payments } from '../server/db/schema';
import { localDate } from '../server/company/company';
import { nextInvoiceNumber } from '../server/billing/invoices';
import { newHousehold, payOnHostedPage, seedAgreement, staff, startHarness, waitFor, type Harness } from './billing-harness';
import { CSRF_HEADER_NAME } from './support/auth';

// The SDK keeps its default retries here (2), as in production, for the fault tests.
let h: Harness;
let today: string;
beforeAll(async () => {
  h = await startHarness({ retries: 2 });
  today = localDate(new Date(), 'America/Chicago');
});
afterAll(() => h.close());

const serviceLines = [
  { description: 'Labor: replace blower motor', kind: 'labor', quantity: 1.5, unitCents: 9500, taxable: false },
  { description: 'Run capacitor 45/5 µF', kind: 'parts', quantity: 1, unitCents: 4399, taxable: true },
];

async function officeInvoice(customerId: string, lines: unknown[] = serviceLines) {
  const office = await staff(h);
  const res = await office.agent.post('/api/invoices').set(CSRF_HEADER_NAME, office.csrf).send({ customerId, lines });
  return { office, res };
}

describe('invoice totals', () => {
  it('takes the plan discount on labor and parts, and sales tax once on the taxable total, half up', async () => {
    const hh = await newHousehold(h, 'totals');
    await seedAgreement(h, hh, { endsOn: addDays(today, 200), status: 'active', planCode: 'two-season' }); // 10 % repair discount
    const { res } = await officeInvoice(hh.customerId);
    expect(res.status).toBe(201);
    // Worked example (shared/money.ts rounding rule; 8.25 % is the demo company's rate):
    // labor 1.5 × $95.00 = $142.50, less 10 % = $128.25 (not taxable)
    // parts $43.99, less 10 % ($4.399 → $4.40) = $39.59 taxable
    // tax 8.25 % × $39.59 = $3.266… → $3.27; total $186.49 − $18.65 + $3.27 = $171.11
    expect(res.body).toMatchObject({ status: 'open', subtotalCents: 18649, discountCents: 1865, taxCents: 327, totalCents: 17111, discountBps: 1000, taxRateBps: 825 });
    expect(res.body.lines.map((l: { netCents: number }) => l.netCents)).toEqual([12825, 3959]);
  });

  it('names the line and field that is wrong', async () => {
    const hh = await newHousehold(h, 'badline');
    const { res } = await officeInvoice(hh.customerId, [{ description: 'Filter', kind: 'parts', quantity: 1.2345, unitCents: 12.5, taxable: true }]);
    expect(res.status).toBe(422);
    expect(Object.keys(res.body.error.fields)).toEqual(expect.arrayContaining(['lines.0.quantity', 'lines.0.unitCents']));
  });
});

describe('invoice numbers', () => {
  it('run in sequence with no gaps, also when issued at the same moment', async () => {
    const hh = await newHousehold(h, 'numbers');
    const office = await staff(h);
    const results = await Promise.all(
      Array.from({ length: 8 }, () => office.agent.post('/api/invoices').set(CSRF_HEADER_NAME, office.csrf).send({ customerId: hh.customerId, lines: serviceLines })),
    );
    const numbers = results.map((r) => r.body.number as number).sort((a, b) => a - b);
    expect(new Set(numbers).size).toBe(8);
    expect(numbers[7]! - numbers[0]!).toBe(7);
  });

  it('a number taken by a transaction that rolls back is handed out again: the issued numbers have no holes', async () => {
    const { db } = h.ctx.database;
    await db
      .transaction(async (tx) => {
        await nextInvoiceNumber(tx);
        throw new Error('roll back');
      })
      .catch(() => {});
    const hh = await newHousehold(h, 'rollback');
    const { res } = await officeInvoice(hh.customerId);
    expect(res.status).toBe(201);
    // The counter row stays locked until commit, so committed numbers always form one unbroken run.
    const rows = await db.select({ n: invoices.number }).from(invoices).where(isNotNull(invoices.number)).orderBy(invoices.number);
    const ns = rows.map((r) => r.n!);
    expect(ns.length).toBeGreaterThan(8);
    expect(ns[ns.length - 1]! - ns[0]!).toBe(ns.length - 1);
  });
});

describe('paying an invoice in the portal', () => {
  it('a double-clicked Pay opens one payment page and makes one charge', async () => {
    const hh = await newHousehold(h, 'double');
    const { res } = await officeInvoice(hh.customerId);
    const { agent, csrf } = hh.homeowner;
    const [a, b] = await Promise.all([
      agent.post(`/api/invoices/${res.body.id}/checkout`).set(CSRF_HEADER_NAME, csrf).send({ returnPath: '/portal/invoices' }),
      agent.post(`/api/invoices/${res.body.id}/checkout`).set(CSRF_HEADER_NAME, csrf).send({ returnPath: '/portal/invoices' }),
    ]);
    expect(a.status).toBe(200);
    expect(b.status).toBe(200);
    expect(a.body.checkoutUrl).toBe(b.body.checkoutUrl);
    // Two form posts from a double click on the hosted page's Pay button.
    const [p1, p2] = await Promise.all([payOnHostedPage(a.body.checkoutUrl, '4242424242424242'), payOnHostedPage(a.body.checkoutUrl, '4242424242424242')]);
    expect([p1.status, p2.status].sort()).toEqual([303, 410]);
    await h.fake.fake.webhooksIdle();
    const paid = await waitFor('paid invoice', async () => {
      const [inv] = await h.ctx.database.db.select().from(invoices).where(eq(invoices.id, res.body.id));
      return inv!.status === 'paid' ? inv : null;
    });
    expect(paid.paidCents).toBe(paid.totalCents);
    const charges = (await h.stripe.paymentIntents.list({ limit: 100 })).data.filter((p) => p.metadata['invoiceId'] === res.body.id);
    expect(charges).toHaveLength(1);
    const pays = await h.ctx.database.db.select().from(payments).where(eq(payments.invoiceId, res.body.id));
    expect(pays.filter((p) => p.status === 'succeeded')).toHaveLength(1);
  });

  it('the processor answering 500 twice and then succeeding ends in one payment page (the SDK retries with the same key)', async () => {
    const hh = await newHousehold(h, 'faults');
    const { res } = await officeInvoice(hh.customerId);
    h.fake.fake.addFault({ path: '/v1/checkout/sessions', method: 'POST', status: 500, times: 2 });
    const before = h.fake.fake.requests().length;
    const start = await hh.homeowner.agent.post(`/api/invoices/${res.body.id}/checkout`).set(CSRF_HEADER_NAME, hh.homeowner.csrf).send({});
    expect(start.status).toBe(200);
    const posts = h.fake.fake
      .requests()
      .slice(before)
      .filter((r) => r.method === 'POST' && r.path === '/v1/checkout/sessions');
    expect(posts.map((p) => p.status)).toEqual([500, 500, 200]);
    expect(new Set(posts.map((p) => p.idempotencyKey)).size).toBe(1);
    const sessions = (await h.stripe.checkout.sessions.list({ limit: 100 })).data.filter((s) => s.metadata?.['invoiceId'] === res.body.id);
    expect(sessions).toHaveLength(1);
    const paid = await payOnHostedPage(start.body.checkoutUrl, '4242424242424242');
    expect(paid.status).toBe(303);
  });

  it('the processor down for good answers 503 with a clear message and records nothing', async () => {
    const hh = await newHousehold(h, 'down');
    const { res } = await officeInvoice(hh.customerId);
    await hh.homeowner.agent.get(`/api/invoices/${res.body.id}`).expect(200); // warm the customer record
    h.fake.fake.addFault({ path: '/v1/', status: 500, times: 20 });
    const start = await hh.homeowner.agent.post(`/api/invoices/${res.body.id}/checkout`).set(CSRF_HEADER_NAME, hh.homeowner.csrf).send({});
    await fetch(`${h.fake.url}/_test/faults`, { method: 'DELETE' });
    expect(start.status).toBe(503);
    expect(start.body.error.code).toBe('payments_unavailable');
    const pays = await h.ctx.database.db.select().from(payments).where(eq(payments.invoiceId, res.body.id));
    expect(pays).toHaveLength(0);
  });

  it("a homeowner sees only their own household's invoices, and the PDF", async () => {
    const a = await newHousehold(h, 'list-a');
    const b = await newHousehold(h, 'list-b');
    const { res } = await officeInvoice(a.customerId);
    const listA = await a.homeowner.agent.get('/api/invoices').expect(200);
    expect(listA.body.rows.map((r: { id: string }) => r.id)).toEqual([res.body.id]);
    const listB = await b.homeowner.agent.get('/api/invoices').expect(200);
    expect(listB.body.rows).toEqual([]);
    await b.homeowner.agent.get(`/api/invoices/${res.body.id}`).expect(404);
    const pdf = await a.homeowner.agent
      .get(`/api/invoices/${res.body.id}/pdf`)
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(pdf.status).toBe(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    expect((pdf.body as Buffer).subarray(0, 5).toString('latin1')).toBe('%PDF-');
  });
});

describe('office payments and refunds', () => {
  it('records a check and cash against the balance, then refunds part and the rest of a card payment through the processor', async () => {
    const hh = await newHousehold(h, 'refund');
    const { office, res } = await officeInvoice(hh.customerId);
    const total = res.body.totalCents as number;

    const tooMuch = await office.agent
      .post(`/api/invoices/${res.body.id}/payments`)
      .set(CSRF_HEADER_NAME, office.csrf)
      .send({ method: 'check', amountCents: total + 1 });
    expect(tooMuch.status).toBe(422);
    expect(tooMuch.body.error.fields).toHaveProperty('amountCents');
    const part = await office.agent.post(`/api/invoices/${res.body.id}/payments`).set(CSRF_HEADER_NAME, office.csrf).send({ method: 'cash', amountCents: 5000 }).expect(201);
    expect(part.body).toMatchObject({ status: 'open', paidCents: 5000, balanceCents: total - 5000 });

    // The rest by card in the portal.
    const start = await hh.homeowner.agent.post(`/api/invoices/${res.body.id}/checkout`).set(CSRF_HEADER_NAME, hh.homeowner.csrf).send({}).expect(200);
    const paid = await payOnHostedPage(start.body.checkoutUrl, '5555555555554444');
    const sessionId = new URL(paid.headers.get('location')!).searchParams.get('checkout')!;
    const back = await hh.homeowner.agent.post('/api/invoices/checkout-return').set(CSRF_HEADER_NAME, hh.homeowner.csrf).send({ sessionId }).expect(200);
    expect(back.body.state).toBe('paid');
    const inv = await hh.homeowner.agent.get(`/api/invoices/${res.body.id}`).expect(200);
    expect(inv.body).toMatchObject({ status: 'paid', paidCents: total, balanceCents: 0 });
    const card = inv.body.payments.find((p: { method: string }) => p.method === 'card');
    expect(card).toMatchObject({ amountCents: total - 5000, cardLast4: '4444' });

    const r1 = await office.agent
      .post(`/api/invoices/${res.body.id}/refunds`)
      .set(CSRF_HEADER_NAME, office.csrf)
      .set('Idempotency-Key', 'refund-one-aaaa')
      .send({ amountCents: 2000, paymentId: card.id, reason: 'Part returned' })
      .expect(201);
    expect(r1.body).toMatchObject({ status: 'partially_refunded', refundedCents: 2000 });
    // Same click again (same key): no second refund.
    await office.agent
      .post(`/api/invoices/${res.body.id}/refunds`)
      .set(CSRF_HEADER_NAME, office.csrf)
      .set('Idempotency-Key', 'refund-one-aaaa')
      .send({ amountCents: 2000, paymentId: card.id })
      .expect(201);
    const pay = (await h.ctx.database.db.select().from(payments).where(eq(payments.id, card.id)))[0]!;
    // The refunded amount is on the Charge (expand latest_charge), as the processor reports it.
    const pi = await h.stripe.paymentIntents.retrieve(pay.stripePaymentIntentId!, { expand: ['latest_charge'] });
    expect((pi.latest_charge as Stripe.Charge).amount_refunded).toBe(2000);

    const over = await office.agent.post(`/api/invoices/${res.body.id}/refunds`).set(CSRF_HEADER_NAME, office.csrf).send({ amountCents: total, paymentId: card.id });
    expect(over.status).toBe(422);
    const rest = await office.agent
      .post(`/api/invoices/${res.body.id}/refunds`)
      .set(CSRF_HEADER_NAME, office.csrf)
      .send({ amountCents: total - 5000 - 2000, paymentId: card.id })
      .expect(201);
    expect(rest.body.status).toBe('partially_refunded'); // the cash part is still kept
    const cash = await office.agent.post(`/api/invoices/${res.body.id}/refunds`).set(CSRF_HEADER_NAME, office.csrf).send({ amountCents: 5000 }).expect(201);
    expect(cash.body).toMatchObject({ status: 'refunded', refundedCents: total });
    expect(((await h.stripe.paymentIntents.retrieve(pay.stripePaymentIntentId!, { expand: ['latest_charge'] })).latest_charge as Stripe.Charge).refunded).toBe(true);

    await hh.homeowner.agent.post(`/api/invoices/${res.body.id}/refunds`).set(CSRF_HEADER_NAME, hh.homeowner.csrf).send({ amountCents: 100 }).expect(403);
  });

  it('voids an open invoice but keeps its number', async () => {
    const hh = await newHousehold(h, 'void');
    const { office, res } = await officeInvoice(hh.customerId);
    const v = await office.agent.post(`/api/invoices/${res.body.id}/void`).set(CSRF_HEADER_NAME, office.csrf).send({}).expect(200);
    expect(v.body).toMatchObject({ status: 'void', number: res.body.number });
    await hh.homeowner.agent.post(`/api/invoices/${res.body.id}/checkout`).set(CSRF_HEADER_NAME, hh.homeowner.csrf).send({}).expect(409);
  });
});

describe('processor errors by class', () => {
  it('card, invalid request, idempotency and API errors each map to a clear answer', async () => {
    const { providerError } = await import('../server/billing/checkout');
    const hh = await newHousehold(h, 'errors');
    const customer = await h.stripe.customers.create({ email: hh.email });
    // Card error: 4000 0000 0000 0002 declines (Stripe testing docs)
    const card = await h.stripe.paymentIntents
      .create({ amount: 1000, currency: 'usd', customer: customer.id, payment_method: 'pm_card_chargeDeclined', confirm: true })
      .catch((e: unknown) => e);
    expect(card).toBeInstanceOf(Stripe.errors.StripeCardError);
    expect(providerError(card)).toMatchObject({ status: 402, code: 'card_declined' });
    // Invalid request: amount below the 50-cent minimum (Stripe API reference, amount)
    const invalid = await h.stripe.paymentIntents.create({ amount: 10, currency: 'usd' }).catch((e: unknown) => e);
    expect(invalid).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(providerError(invalid)).toMatchObject({ status: 409, code: 'payment_refused' });
    // Idempotency: the same key with other parameters
    await h.stripe.paymentIntents.create({ amount: 1000, currency: 'usd' }, { idempotencyKey: `err-${hh.customerId}` });
    const idem = await h.stripe.paymentIntents.create({ amount: 2000, currency: 'usd' }, { idempotencyKey: `err-${hh.customerId}` }).catch((e: unknown) => e);
    expect(idem).toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
    expect(providerError(idem)).toMatchObject({ status: 409, code: 'payment_conflict' });
    // API error: a 500 that outlasts the SDK's retries
    h.fake.fake.addFault({ path: '/v1/customers', status: 500, times: 3 });
    const api = await h.stripe.customers.create({}).catch((e: unknown) => e);
    expect(api).toBeInstanceOf(Stripe.errors.StripeAPIError);
    expect(providerError(api)).toMatchObject({ status: 503, code: 'payments_unavailable' });
  });
});
