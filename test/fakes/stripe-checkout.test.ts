import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import express from 'express';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import Stripe from 'stripe';
import { startFakeStripe, type StartedFakeStripe } from '../../server/fakes/stripe';

// The hosted test payment page, driven over plain HTTP as a browser would post its form.
// Test card numbers and outcomes: Stripe's testing documentation (docs.stripe.com/testing).

const SECRET = 'whsec_checkout_test';
let started: StartedFakeStripe;
let stripe: Stripe;
let receiver: Server;
let events: Stripe.Event[] = [];

beforeAll(async () => {
  const app = express();
  app.post('/hooks', express.raw({ type: 'application/json' }), (req, res) => {
    events.push(stripe.webhooks.constructEvent(req.body as Buffer, req.get('stripe-signature') ?? '', SECRET));
    res.json({ ok: true });
  });
  receiver = await new Promise<Server>((resolve) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s));
  });
  started = await startFakeStripe({
    port: 0,
    host: '127.0.0.1',
    webhookSecret: SECRET,
    webhookUrl: `http://127.0.0.1:${(receiver.address() as AddressInfo).port}/hooks`,
  });
  stripe = new Stripe('sk_test_checkout123', { host: '127.0.0.1', port: started.port, protocol: 'http', maxNetworkRetries: 0 });
});
afterAll(async () => {
  await started.close();
  await new Promise((r) => receiver.close(r));
});
beforeEach(() => {
  started.fake.reset();
  events = [];
});

const nextYear = String((new Date().getUTCFullYear() + 1) % 100).padStart(2, '0');

async function paymentSession(extra: Partial<Stripe.Checkout.SessionCreateParams> = {}) {
  const customer = await stripe.customers.create({ email: 'morgan@example.test' });
  return stripe.checkout.sessions.create({
    mode: 'payment',
    customer: customer.id,
    client_reference_id: 'agr_100',
    success_url: 'http://app.example.test/portal/paid?session_id={CHECKOUT_SESSION_ID}',
    cancel_url: 'http://app.example.test/portal/plans',
    line_items: [{ price_data: { currency: 'usd', unit_amount: 19_900, product_data: { name: 'Comfort plan, 12 months' } }, quantity: 1 }],
    ...extra,
  });
}

function submit(url: string, card: string, expiry = `12/${nextYear}`, cvc = '123') {
  return fetch(url, {
    method: 'POST',
    redirect: 'manual',
    headers: { 'content-type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams({ card_number: card, expiry, cvc }).toString(),
  });
}

describe('hosted payment page', () => {
  it('shows a labelled form with the amount, a Pay button and a Cancel link', async () => {
    const s = await paymentSession();
    const res = await fetch(s.url!);
    expect(res.status).toBe(200);
    const html = await res.text();
    expect(html).toContain('<title>Test payment page</title>');
    expect(html).toContain('$199.00');
    for (const [id, label] of [
      ['card_number', 'Card number'],
      ['expiry', 'Expiry (MM/YY)'],
      ['cvc', 'CVC'],
    ]) {
      expect(html).toContain(`<label for="${id}">${label}</label>`);
      expect(html).toContain(`id="${id}"`);
    }
    expect(html).toMatch(/<button type="submit">Pay<\/button>/);
    expect(html).toContain('<a href="http://app.example.test/portal/plans">Cancel</a>');
  });

  it('4242 4242 4242 4242 pays: 303 to success_url with the session id, session complete', async () => {
    const s = await paymentSession({ metadata: { agreement: 'agr_100' }, payment_intent_data: { metadata: { agreement: 'agr_100' } } });
    const res = await submit(s.url!, '4242 4242 4242 4242');
    expect(res.status).toBe(303);
    expect(res.headers.get('location')).toBe(`http://app.example.test/portal/paid?session_id=${s.id}`);

    const done = await stripe.checkout.sessions.retrieve(s.id, { expand: ['payment_intent'] });
    expect(done).toMatchObject({ status: 'complete', payment_status: 'paid', url: null });
    const pi = done.payment_intent as Stripe.PaymentIntent;
    expect(pi).toMatchObject({ status: 'succeeded', amount: 19_900, metadata: { agreement: 'agr_100' } });

    await started.fake.webhooksIdle();
    expect(events.map((e) => e.type)).toEqual(['payment_intent.succeeded', 'checkout.session.completed']);
    const completed = events[1]!.data.object as Stripe.Checkout.Session;
    expect(completed).toMatchObject({ id: s.id, client_reference_id: 'agr_100', payment_status: 'paid' });

    // the page is closed now
    expect((await fetch(s.url ?? `${started.url}/checkout/${s.id}`)).status).toBe(410);
  });

  it('4000 0000 0000 0002 is declined on the page; the session stays open and a retry can pay', async () => {
    const s = await paymentSession();
    const res = await submit(s.url!, '4000000000000002');
    expect(res.status).toBe(402);
    const html = await res.text();
    expect(html).toContain('role="alert"');
    expect(html).toContain('Your card was declined.');
    // the typed card number is not echoed back
    expect(html).not.toContain('4000000000000002"');
    expect((await stripe.checkout.sessions.retrieve(s.id)).status).toBe('open');

    const retry = await submit(s.url!, '4242424242424242');
    expect(retry.status).toBe(303);
    const done = await stripe.checkout.sessions.retrieve(s.id);
    expect(done.status).toBe('complete');
    await started.fake.webhooksIdle();
    expect(events.map((e) => e.type)).toEqual(['payment_intent.payment_failed', 'payment_intent.succeeded', 'checkout.session.completed']);
  });

  it.each([
    ['4000 0000 0000 9995', 'Your card has insufficient funds.'],
    ['4000 0000 0000 0069', 'Your card has expired.'],
    ['4242 4242 4242 4241', 'Your card number is incorrect.'],
  ])('%s shows “%s”', async (card, message) => {
    const s = await paymentSession();
    const res = await submit(s.url!, card);
    expect(res.status).toBeGreaterThanOrEqual(400);
    expect(await res.text()).toContain(message);
  });

  it('a past expiry date or a malformed one is refused on the page', async () => {
    const s = await paymentSession();
    expect(await (await submit(s.url!, '4242424242424242', '01/20')).text()).toContain('expiration year is invalid');
    expect(await (await submit(s.url!, '4242424242424242', '1225')).text()).toContain('MM/YY');
    expect((await stripe.checkout.sessions.retrieve(s.id)).status).toBe('open');
  });

  it('setup mode saves the card on the customer ("Save card")', async () => {
    const customer = await stripe.customers.create({});
    const s = await stripe.checkout.sessions.create({ mode: 'setup', customer: customer.id, currency: 'usd', success_url: 'http://app.example.test/card-saved' });
    const html = await (await fetch(s.url!)).text();
    expect(html).toMatch(/<button type="submit">Save card<\/button>/);
    // the card that saves but declines later, for dunning tests
    const res = await submit(s.url!, '4000 0000 0000 0341');
    expect(res.status).toBe(303);
    const si = await stripe.setupIntents.retrieve(s.setup_intent as string);
    expect(si.status).toBe('succeeded');
    const pms = await stripe.paymentMethods.list({ customer: customer.id, type: 'card' });
    expect(pms.data.map((p) => p.card?.last4)).toEqual(['0341']);
    await started.fake.webhooksIdle();
    expect(events.map((e) => e.type)).toEqual(['setup_intent.succeeded', 'checkout.session.completed']);

    const later = await stripe.paymentIntents
      .create({ amount: 19_900, currency: 'usd', customer: customer.id, payment_method: pms.data[0]!.id, off_session: true, confirm: true })
      .catch((e: unknown) => e);
    expect(later).toBeInstanceOf(Stripe.errors.StripeCardError);
  });

  it('an unknown session id is a 404 page; an expired session cannot be paid', async () => {
    expect((await fetch(`${started.url}/checkout/cs_test_nope`)).status).toBe(404);
    const s = await paymentSession();
    await stripe.checkout.sessions.expire(s.id);
    expect((await submit(`${started.url}/checkout/${s.id}`, '4242424242424242')).status).toBe(410);
  });
});
