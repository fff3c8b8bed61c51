import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import Stripe from 'stripe';
import { startFakeStripe, type StartedFakeStripe } from '../../server/fakes/stripe';

// Idempotent requests as Stripe documents them (Stripe API reference, "Idempotent requests"):
// the same key replays the first result, status included, for at least 24 hours; the same key
// with other parameters is an idempotency_error (HTTP 400).

let now = Date.parse('2026-06-01T12:00:00Z');
let started: StartedFakeStripe;
let stripe: Stripe;
let retrying: Stripe;

beforeAll(async () => {
  started = await startFakeStripe({ port: 0, host: '127.0.0.1', webhookSecret: 'whsec_idem', clock: () => now });
  const base = { host: '127.0.0.1', port: started.port, protocol: 'http' as const };
  stripe = new Stripe('sk_test_idem123', { ...base, maxNetworkRetries: 0 });
  // keeps the SDK's retries (the default is 2), as a server would in production
  retrying = new Stripe('sk_test_idem123', base);
});
afterAll(() => started.close());
beforeEach(() => {
  started.fake.reset();
  now = Date.parse('2026-06-01T12:00:00Z');
});

describe('idempotency keys', () => {
  it('the same key and parameters replay the first response and create nothing new', async () => {
    const params = { amount: 19_900, currency: 'usd', metadata: { agreement: 'agr_9', term: '2026-06-01' } };
    const first = await stripe.paymentIntents.create(params, { idempotencyKey: 'renewal-agr_9-2026-06-01' });
    // parameters in another order are the same request
    const second = await stripe.paymentIntents.create(
      { metadata: { term: '2026-06-01', agreement: 'agr_9' }, currency: 'usd', amount: 19_900 },
      { idempotencyKey: 'renewal-agr_9-2026-06-01' },
    );
    expect(second.id).toBe(first.id);
    expect(second.lastResponse.headers['idempotent-replayed']).toBe('true');
    expect((await stripe.paymentIntents.list()).data).toHaveLength(1);
  });

  it('replays an error result too: a declined charge stays declined with the same body', async () => {
    const params = { amount: 19_900, currency: 'usd', payment_method: 'pm_card_chargeDeclined', confirm: true };
    const e1 = (await stripe.paymentIntents.create(params, { idempotencyKey: 'k-decline' }).catch((e: unknown) => e)) as Stripe.errors.StripeCardError;
    const e2 = (await stripe.paymentIntents.create(params, { idempotencyKey: 'k-decline' }).catch((e: unknown) => e)) as Stripe.errors.StripeCardError;
    expect(e1).toBeInstanceOf(Stripe.errors.StripeCardError);
    expect(e2).toBeInstanceOf(Stripe.errors.StripeCardError);
    expect(e2.statusCode).toBe(402);
    expect(e2.payment_intent?.id).toBe(e1.payment_intent?.id);
    expect(e2.headers?.['idempotent-replayed']).toBe('true');
    expect((await stripe.paymentIntents.list()).data).toHaveLength(1);
  });

  it('the same key with different parameters raises StripeIdempotencyError', async () => {
    await stripe.paymentIntents.create({ amount: 19_900, currency: 'usd' }, { idempotencyKey: 'k-mismatch' });
    const err = await stripe.paymentIntents.create({ amount: 29_900, currency: 'usd' }, { idempotencyKey: 'k-mismatch' }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
    expect(err).toMatchObject({ statusCode: 400, rawType: 'idempotency_error' });
    // on another endpoint as well
    const other = await stripe.customers.create({}, { idempotencyKey: 'k-mismatch' }).catch((e: unknown) => e);
    expect(other).toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
  });

  it('keeps a result for 24 hours, then treats the key as new', async () => {
    const a = await stripe.customers.create({ name: 'Rio Example' }, { idempotencyKey: 'k-day' });
    now += 24 * 3600 * 1000 - 1000;
    expect((await stripe.customers.create({ name: 'Rio Example' }, { idempotencyKey: 'k-day' })).id).toBe(a.id);
    now += 2000;
    expect((await stripe.customers.create({ name: 'Rio Example' }, { idempotencyKey: 'k-day' })).id).not.toBe(a.id);
  });

  it('the SDK keys every POST itself, so two calls without a key make two objects', async () => {
    const a = await stripe.customers.create({});
    const b = await stripe.customers.create({});
    expect(a.lastResponse.idempotencyKey).toMatch(/^stripe-node-retry-/);
    expect(a.id).not.toBe(b.id);
  });

  it('validation failures are not stored: fixing the request with the same key works', async () => {
    const bad = await stripe.paymentIntents.create({ amount: 10, currency: 'usd' }, { idempotencyKey: 'k-fix' }).catch((e: unknown) => e);
    expect(bad).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    const ok = await stripe.paymentIntents.create({ amount: 1_000, currency: 'usd' }, { idempotencyKey: 'k-fix' });
    expect(ok.amount).toBe(1_000);
  });
});

describe('fault switch', () => {
  it('two 500s then success: the SDK retries with one key and exactly one PaymentIntent exists', async () => {
    const res = await fetch(`${started.url}/_test/faults`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ path: '/v1/payment_intents', status: 500, times: 2 }),
    });
    expect(res.status).toBe(200);
    const pi = await retrying.paymentIntents.create({ amount: 19_900, currency: 'usd' });
    expect(pi.status).toBe('requires_payment_method');
    const posts = started.fake.requests().filter((r) => r.method === 'POST' && r.path === '/v1/payment_intents');
    expect(posts.map((r) => r.status)).toEqual([500, 500, 200]);
    // one key across the three attempts (stripe-node keeps the key on retries)
    expect(new Set(posts.map((r) => r.idempotencyKey)).size).toBe(1);
    expect(posts[0]!.idempotencyKey).toMatch(/^stripe-node-retry-/);
    expect((await stripe.paymentIntents.list()).data).toHaveLength(1);
  });

  it('with retries off the fault surfaces as StripeAPIError and stores nothing under the key', async () => {
    started.fake.addFault({ path: '/v1/customers', status: 500, times: 1 });
    const err = await stripe.customers.create({ name: 'Ash Example' }, { idempotencyKey: 'k-fault' }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeAPIError);
    expect((await stripe.customers.list()).data).toHaveLength(0);
    const retry = await stripe.customers.create({ name: 'Ash Example' }, { idempotencyKey: 'k-fault' });
    expect(retry.lastResponse.headers['idempotent-replayed']).toBeUndefined();
    expect((await stripe.customers.list()).data).toHaveLength(1);
  });

  it('refuses a malformed fault', async () => {
    const res = await fetch(`${started.url}/_test/faults`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ path: 'v1', status: 200 }),
    });
    expect(res.status).toBe(400);
  });
});
