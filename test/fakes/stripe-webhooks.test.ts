import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import express from 'express';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import Stripe from 'stripe';
import { signPayload, startFakeStripe, type StartedFakeStripe } from '../../server/fakes/stripe';

// Webhooks: signed as Stripe documents ("Check the webhook signatures": t=<unix>,v1=<HMAC-SHA256 hex of
// "t.payload">), verified here by the SDK's own stripe.webhooks.constructEvent over the raw body.

const SECRET = 'whsec_receiver_test_secret';

interface Received {
  event?: Stripe.Event;
  error?: string;
  status: number;
}

let started: StartedFakeStripe;
let stripe: Stripe;
let receiver: Server;
let received: Received[] = [];
let failFirst = 0;

beforeAll(async () => {
  const app = express();
  app.post('/hooks', express.raw({ type: 'application/json' }), (req, res) => {
    let event: Stripe.Event | undefined;
    try {
      event = stripe.webhooks.constructEvent(req.body as Buffer, req.get('stripe-signature') ?? '', SECRET);
    } catch (e) {
      received.push({ error: (e as Error).message, status: 400 });
      res.status(400).send('bad signature');
      return;
    }
    if (failFirst > 0) {
      failFirst--;
      received.push({ event, status: 503 });
      res.status(503).send('not now');
      return;
    }
    received.push({ event, status: 200 });
    res.json({ received: true });
  });
  receiver = await new Promise<Server>((resolve) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s));
  });
  const hookUrl = `http://127.0.0.1:${(receiver.address() as AddressInfo).port}/hooks`;
  started = await startFakeStripe({ port: 0, host: '127.0.0.1', webhookSecret: SECRET, webhookUrl: hookUrl, webhookRetryBaseMs: 20, webhookMaxAttempts: 4 });
  stripe = new Stripe('sk_test_hooks123', { host: '127.0.0.1', port: started.port, protocol: 'http', maxNetworkRetries: 0 });
});
afterAll(async () => {
  await started.close();
  await new Promise((r) => receiver.close(r));
});
beforeEach(() => {
  started.fake.reset();
  received = [];
  failFirst = 0;
});

const ok = () => received.filter((r) => r.status === 200).map((r) => r.event!);

describe('webhook signatures', () => {
  it('each event verifies with constructEvent and carries the event shape', async () => {
    const pi = await stripe.paymentIntents.create({ amount: 19_900, currency: 'usd', payment_method: 'pm_card_visa', confirm: true });
    await started.fake.webhooksIdle();
    expect(received.every((r) => !r.error)).toBe(true);
    const [evt] = ok();
    expect(evt).toMatchObject({ object: 'event', type: 'payment_intent.succeeded', livemode: false });
    expect(evt!.id).toMatch(/^evt_/);
    expect(typeof evt!.api_version).toBe('string');
    expect((evt!.data.object as Stripe.PaymentIntent).id).toBe(pi.id);
  });

  it('signPayload gives the same header as the SDK test helper', () => {
    const payload = JSON.stringify({ id: 'evt_x', object: 'event' });
    // stripe.webhooks.generateTestHeaderString is the SDK's reference implementation of the header
    const fromSdk = stripe.webhooks.generateTestHeaderString({ payload, secret: SECRET, timestamp: 1_780_000_000 });
    expect(signPayload(payload, SECRET, 1_780_000_000)).toBe(fromSdk);
  });

  it('a receiver with another secret rejects the delivery', async () => {
    const payload = JSON.stringify({ id: 'evt_y', object: 'event' });
    const header = signPayload(payload, 'whsec_other', Math.floor(Date.now() / 1000));
    expect(() => stripe.webhooks.constructEvent(payload, header, SECRET)).toThrow(Stripe.errors.StripeSignatureVerificationError);
  });

  it('sends the events the app relies on', async () => {
    const c = await stripe.customers.create({});
    const si = await stripe.setupIntents.create({ customer: c.id, payment_method: 'pm_card_visa', confirm: true });
    expect(si.status).toBe('succeeded');
    const pi = await stripe.paymentIntents.create({ amount: 10_000, currency: 'usd', payment_method: 'pm_card_visa', confirm: true });
    await stripe.refunds.create({ payment_intent: pi.id, amount: 2_500 });
    await stripe.paymentIntents.create({ amount: 10_000, currency: 'usd', payment_method: 'pm_card_chargeDeclined', confirm: true }).catch(() => undefined);
    await started.fake.webhooksIdle();
    const types = ok().map((e) => e.type);
    expect(types).toEqual(['setup_intent.succeeded', 'payment_intent.succeeded', 'refund.created', 'charge.refunded', 'payment_intent.payment_failed']);
    const refunded = ok().find((e) => e.type === 'charge.refunded')!.data.object as Stripe.Charge;
    expect(refunded.amount_refunded).toBe(2_500);
  });
});

describe('webhook retries', () => {
  it('retries with growing delays until the receiver answers 2xx', async () => {
    failFirst = 2;
    await stripe.paymentIntents.create({ amount: 5_000, currency: 'usd', payment_method: 'pm_card_visa', confirm: true });
    await started.fake.webhooksIdle();
    expect(received.map((r) => r.status)).toEqual([503, 503, 200]);
    expect(new Set(received.map((r) => r.event!.id)).size).toBe(1);
    const attempts = started.fake.deliveries();
    expect(attempts.map((a) => a.attempt)).toEqual([1, 2, 3]);
    // base 20 ms doubling: the second gap is at least the 40 ms backoff step
    expect(attempts[2]!.at - attempts[1]!.at).toBeGreaterThanOrEqual(35);
  });

  it('gives up after the configured number of attempts', async () => {
    failFirst = 99;
    await stripe.paymentIntents.create({ amount: 5_000, currency: 'usd', payment_method: 'pm_card_visa', confirm: true });
    await started.fake.webhooksIdle();
    expect(received.map((r) => r.status)).toEqual([503, 503, 503, 503]);
  });
});

describe('duplicate and out-of-order delivery', () => {
  it('the JS switch sends each event twice, same id', async () => {
    started.fake.setWebhookBehaviour({ duplicate: true });
    await stripe.paymentIntents.create({ amount: 5_000, currency: 'usd', payment_method: 'pm_card_visa', confirm: true });
    await started.fake.webhooksIdle();
    const ids = ok().map((e) => e.id);
    expect(ids).toHaveLength(2);
    expect(ids[0]).toBe(ids[1]);
  });

  it('the HTTP switch delivers the events of one call newest first, and twice', async () => {
    const res = await fetch(`${started.url}/_test/webhooks`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ duplicate: true, outOfOrder: true }),
    });
    expect(await res.json()).toMatchObject({ duplicate: true, outOfOrder: true });
    const pi = await stripe.paymentIntents.create({ amount: 8_000, currency: 'usd', payment_method: 'pm_card_visa', confirm: true });
    await started.fake.webhooksIdle();
    received = [];
    await stripe.refunds.create({ payment_intent: pi.id });
    await started.fake.webhooksIdle();
    // raised in the order refund.created, charge.refunded; delivered reversed
    expect(ok().map((e) => e.type)).toEqual(['charge.refunded', 'charge.refunded', 'refund.created', 'refund.created']);
    // each event's created time still tells the true order
    const [later, , earlier] = ok();
    expect(later!.created).toBeGreaterThanOrEqual(earlier!.created);
  });

  it('POST /_test/reset clears objects, events and switches', async () => {
    started.fake.setWebhookBehaviour({ duplicate: true });
    await stripe.customers.create({});
    const res = await fetch(`${started.url}/_test/reset`, { method: 'POST' });
    expect(res.status).toBe(200);
    expect((await stripe.customers.list()).data).toHaveLength(0);
    await stripe.paymentIntents.create({ amount: 5_000, currency: 'usd', payment_method: 'pm_card_visa', confirm: true });
    await started.fake.webhooksIdle();
    expect(ok()).toHaveLength(1);
  });
});
