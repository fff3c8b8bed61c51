import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import Stripe from 'stripe';
import { startFakeStripe, type StartedFakeStripe } from '../../server/fakes/stripe';

// Contract tests: the real Stripe SDK (stripe-node 23.1.0) against the fake.
// Where a test names a card number or an error code, the source is Stripe's
// published testing and error-code documentation (docs.stripe.com/testing, /error-codes).

let started: StartedFakeStripe;
let stripe: Stripe;

beforeAll(async () => {
  started = await startFakeStripe({ port: 0, host: '127.0.0.1', webhookSecret: 'whsec_contract' });
  stripe = new Stripe('sk_test_contract123', { host: '127.0.0.1', port: started.port, protocol: 'http', maxNetworkRetries: 0 });
});
afterAll(() => started.close());
beforeEach(() => started.fake.reset());

const idPattern = (prefix: string) => new RegExp(`^${prefix}_[A-Za-z0-9]+$`);

describe('authentication', () => {
  it('refuses a missing or malformed key with an authentication error (401)', async () => {
    const bad = new Stripe('sk_live_nope', { host: '127.0.0.1', port: started.port, protocol: 'http', maxNetworkRetries: 0 });
    await expect(bad.customers.create({})).rejects.toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
    const res = await fetch(`${started.url}/v1/customers`);
    expect(res.status).toBe(401);
    expect(((await res.json()) as { error: { type: string } }).error.type).toBe('authentication_error');
  });
});

describe('customers', () => {
  it('creates, retrieves and updates with merged metadata', async () => {
    const c = await stripe.customers.create({ email: 'dana.homeowner@example.test', name: 'Dana Example', metadata: { household: 'hh_1', zone: 'north' } });
    expect(c.id).toMatch(idPattern('cus'));
    expect(c).toMatchObject({ object: 'customer', livemode: false, email: 'dana.homeowner@example.test', metadata: { household: 'hh_1', zone: 'north' } });
    expect(Number.isInteger(c.created)).toBe(true);
    // created is unix seconds, not milliseconds
    expect(Math.abs(c.created - Date.now() / 1000)).toBeLessThan(60);

    const got = await stripe.customers.retrieve(c.id);
    expect(got).toMatchObject({ id: c.id, name: 'Dana Example' });

    // an empty string removes a metadata key (Stripe API reference, metadata)
    const up = await stripe.customers.update(c.id, { name: 'Dana Q. Example', metadata: { zone: '', tier: 'gold' } });
    expect(up.name).toBe('Dana Q. Example');
    expect(up.metadata).toEqual({ household: 'hh_1', tier: 'gold' });
  });

  it('unknown ids are a 404 invalid request with code resource_missing', async () => {
    const err = await stripe.customers.retrieve('cus_missing').catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(err).toMatchObject({ statusCode: 404, code: 'resource_missing', param: 'id' });
  });

  it('unknown parameters are refused, naming the parameter', async () => {
    const err = await stripe.customers.create({ emial: 'x@example.test' } as never).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(err).toMatchObject({ statusCode: 400, code: 'parameter_unknown', param: 'emial' });
  });
});

describe('payment methods', () => {
  it('attaches a test card to a customer, lists and retrieves it', async () => {
    const c = await stripe.customers.create({ email: 'lee@example.test' });
    const pm = await stripe.paymentMethods.attach('pm_card_visa', { customer: c.id });
    expect(pm.id).toMatch(idPattern('pm'));
    expect(pm).toMatchObject({ object: 'payment_method', type: 'card', customer: c.id, card: { brand: 'visa', last4: '4242' } });
    const listed = await stripe.paymentMethods.list({ customer: c.id, type: 'card' });
    expect(listed.object).toBe('list');
    expect(listed.data.map((x) => x.id)).toEqual([pm.id]);
    const viaCustomer = await stripe.customers.listPaymentMethods(c.id);
    expect(viaCustomer.data[0]!.id).toBe(pm.id);
    expect((await stripe.paymentMethods.retrieve(pm.id)).customer).toBe(c.id);

    const up = await stripe.customers.update(c.id, { invoice_settings: { default_payment_method: pm.id } });
    expect(up.invoice_settings.default_payment_method).toBe(pm.id);
  });

  it('a card that declines cannot be saved; 4000 0000 0000 0341 can', async () => {
    const c = await stripe.customers.create({});
    const err = await stripe.paymentMethods.attach('pm_card_chargeDeclined', { customer: c.id }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeCardError);
    expect(err).toMatchObject({ statusCode: 402, code: 'card_declined', decline_code: 'generic_decline' });
    const saved = await stripe.paymentMethods.attach('pm_card_chargeCustomerFail', { customer: c.id });
    expect(saved.card?.last4).toBe('0341');
  });

  it('creates a card payment method from raw test card data', async () => {
    const pm = await stripe.paymentMethods.create({ type: 'card', card: { number: '4242424242424242', exp_month: 12, exp_year: 2040, cvc: '123' } });
    expect(pm.card).toMatchObject({ last4: '4242', exp_month: 12, exp_year: 2040 });
    const err = await stripe.paymentMethods.create({ type: 'card', card: { number: '4242424242424241', exp_month: 12, exp_year: 2040 } }).catch((e: unknown) => e);
    // a number failing the Luhn check is incorrect_number (ISO/IEC 7812 check digit; Stripe error codes)
    expect(err).toMatchObject({ type: 'StripeCardError', code: 'incorrect_number' });
  });
});

describe('setup intents', () => {
  it('create → confirm saves the card on the customer', async () => {
    const c = await stripe.customers.create({});
    const si = await stripe.setupIntents.create({ customer: c.id, usage: 'off_session', metadata: { agreement: 'agr_7' } });
    expect(si.id).toMatch(idPattern('seti'));
    expect(si).toMatchObject({ object: 'setup_intent', status: 'requires_payment_method', customer: c.id, usage: 'off_session' });
    expect(si.client_secret).toMatch(new RegExp(`^${si.id}_secret_`));
    const done = await stripe.setupIntents.confirm(si.id, { payment_method: 'pm_card_visa' });
    expect(done.status).toBe('succeeded');
    const again = await stripe.setupIntents.retrieve(si.id);
    expect(again.status).toBe('succeeded');
    const pms = await stripe.paymentMethods.list({ customer: c.id, type: 'card' });
    expect(pms.data).toHaveLength(1);
    expect(pms.data[0]!.id).toBe(done.payment_method);
  });

  it('a declined card fails the setup and leaves it waiting for another card', async () => {
    const c = await stripe.customers.create({});
    const si = await stripe.setupIntents.create({ customer: c.id });
    const err = await stripe.setupIntents.confirm(si.id, { payment_method: 'pm_card_chargeDeclinedInsufficientFunds' }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeCardError);
    expect(err).toMatchObject({ code: 'card_declined', decline_code: 'insufficient_funds' });
    expect((await stripe.setupIntents.retrieve(si.id)).status).toBe('requires_payment_method');
  });
});

describe('payment intents', () => {
  it('create → confirm succeeds with 4242 and records a charge', async () => {
    const pi = await stripe.paymentIntents.create({ amount: 19_900, currency: 'usd', metadata: { agreement: 'agr_1' } });
    expect(pi.id).toMatch(idPattern('pi'));
    expect(pi).toMatchObject({ object: 'payment_intent', amount: 19_900, currency: 'usd', status: 'requires_payment_method', livemode: false });
    const ok = await stripe.paymentIntents.confirm(pi.id, { payment_method: 'pm_card_visa' });
    expect(ok).toMatchObject({ status: 'succeeded', amount_received: 19_900 });
    const withCharge = await stripe.paymentIntents.retrieve(pi.id, { expand: ['latest_charge'] });
    const ch = withCharge.latest_charge as Stripe.Charge;
    expect(ch).toMatchObject({ object: 'charge', amount: 19_900, captured: true, paid: true, status: 'succeeded', amount_refunded: 0 });
  });

  it('manual capture: requires_capture, then capture a smaller amount', async () => {
    const pi = await stripe.paymentIntents.create({ amount: 50_000, currency: 'usd', capture_method: 'manual', payment_method: 'pm_card_visa', confirm: true });
    expect(pi).toMatchObject({ status: 'requires_capture', amount_capturable: 50_000, amount_received: 0 });
    const cap = await stripe.paymentIntents.capture(pi.id, { amount_to_capture: 42_500 });
    expect(cap).toMatchObject({ status: 'succeeded', amount_received: 42_500, amount_capturable: 0 });
    const again = await stripe.paymentIntents.capture(pi.id).catch((e: unknown) => e);
    expect(again).toMatchObject({ type: 'StripeInvalidRequestError', code: 'payment_intent_unexpected_state' });
  });

  it('off-session with a saved card charges it', async () => {
    const c = await stripe.customers.create({});
    const pm = await stripe.paymentMethods.attach('pm_card_visa', { customer: c.id });
    const pi = await stripe.paymentIntents.create({ amount: 19_900, currency: 'usd', customer: c.id, payment_method: pm.id, off_session: true, confirm: true });
    expect(pi).toMatchObject({ status: 'succeeded', customer: c.id, payment_method: pm.id });
  });

  it('0341 saves fine but declines off-session later (the dunning card)', async () => {
    const c = await stripe.customers.create({});
    const pm = await stripe.paymentMethods.attach('pm_card_chargeCustomerFail', { customer: c.id });
    const err = (await stripe.paymentIntents
      .create({ amount: 19_900, currency: 'usd', customer: c.id, payment_method: pm.id, off_session: true, confirm: true })
      .catch((e: unknown) => e)) as Stripe.errors.StripeCardError;
    expect(err).toBeInstanceOf(Stripe.errors.StripeCardError);
    expect(err).toMatchObject({ statusCode: 402, code: 'card_declined', decline_code: 'generic_decline' });
    // the error carries the PaymentIntent, now waiting for another payment method (Stripe API reference, errors)
    expect(err.payment_intent).toMatchObject({ status: 'requires_payment_method', last_payment_error: { code: 'card_declined' } });
    const pi = await stripe.paymentIntents.retrieve(err.payment_intent!.id, { expand: ['latest_charge'] });
    expect((pi.latest_charge as Stripe.Charge).status).toBe('failed');
  });

  it.each([
    ['pm_card_chargeDeclined', 'card_declined', 'generic_decline'],
    ['pm_card_chargeDeclinedInsufficientFunds', 'card_declined', 'insufficient_funds'],
    ['pm_card_chargeDeclinedExpiredCard', 'expired_card', 'expired_card'],
  ])('%s declines with %s / %s', async (pm, code, decline) => {
    const err = await stripe.paymentIntents.create({ amount: 1_000, currency: 'usd', payment_method: pm, confirm: true }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeCardError);
    expect(err).toMatchObject({ code, decline_code: decline });
  });

  it('bad amounts are refused, naming the parameter', async () => {
    const missing = await stripe.paymentIntents.create({ currency: 'usd' } as never).catch((e: unknown) => e);
    expect(missing).toMatchObject({ type: 'StripeInvalidRequestError', code: 'parameter_missing', param: 'amount' });
    // USD minimum charge is $0.50 (Stripe docs, minimum and maximum charge amounts)
    const small = await stripe.paymentIntents.create({ amount: 49, currency: 'usd' }).catch((e: unknown) => e);
    expect(small).toMatchObject({ code: 'amount_too_small', param: 'amount' });
    const fraction = await stripe.paymentIntents.create({ amount: 19.5, currency: 'usd' }).catch((e: unknown) => e);
    expect(fraction).toMatchObject({ type: 'StripeInvalidRequestError', param: 'amount' });
  });
});

describe('refunds', () => {
  it('partial then full refund updates amount_refunded on the charge', async () => {
    const pi = await stripe.paymentIntents.create({ amount: 30_000, currency: 'usd', payment_method: 'pm_card_visa', confirm: true });
    const r1 = await stripe.refunds.create({ payment_intent: pi.id, amount: 7_500, reason: 'requested_by_customer' });
    expect(r1.id).toMatch(idPattern('re'));
    expect(r1).toMatchObject({ object: 'refund', amount: 7_500, status: 'succeeded', payment_intent: pi.id });
    let ch = await stripe.charges.retrieve(pi.latest_charge as string);
    expect(ch).toMatchObject({ amount_refunded: 7_500, refunded: false });

    const tooMuch = await stripe.refunds.create({ payment_intent: pi.id, amount: 30_000 }).catch((e: unknown) => e);
    expect(tooMuch).toMatchObject({ type: 'StripeInvalidRequestError', param: 'amount' });

    const r2 = await stripe.refunds.create({ payment_intent: pi.id });
    expect(r2.amount).toBe(22_500);
    ch = await stripe.charges.retrieve(pi.latest_charge as string);
    expect(ch).toMatchObject({ amount_refunded: 30_000, refunded: true });
    expect((await stripe.refunds.retrieve(r1.id)).amount).toBe(7_500);
    expect((await stripe.refunds.list({ payment_intent: pi.id })).data).toHaveLength(2);

    const none = await stripe.refunds.create({ payment_intent: pi.id }).catch((e: unknown) => e);
    expect(none).toMatchObject({ code: 'charge_already_refunded' });
  });

  it('a payment that never succeeded cannot be refunded', async () => {
    const pi = await stripe.paymentIntents.create({ amount: 5_000, currency: 'usd' });
    await expect(stripe.refunds.create({ payment_intent: pi.id })).rejects.toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
  });
});

describe('checkout sessions', () => {
  it('payment mode: line items with price_data, url to the hosted page', async () => {
    const c = await stripe.customers.create({});
    const s = await stripe.checkout.sessions.create({
      mode: 'payment',
      customer: c.id,
      client_reference_id: 'agr_55',
      metadata: { agreement: 'agr_55' },
      success_url: 'http://app.example.test/paid?session={CHECKOUT_SESSION_ID}',
      cancel_url: 'http://app.example.test/plans',
      line_items: [
        { price_data: { currency: 'usd', unit_amount: 19_900, product_data: { name: 'Comfort plan, 12 months' } }, quantity: 1 },
        { price_data: { currency: 'usd', unit_amount: 2_500, product_data: { name: 'Second system' } }, quantity: 2 },
      ],
    });
    expect(s.id).toMatch(/^cs_test_[A-Za-z0-9]+$/);
    expect(s).toMatchObject({
      object: 'checkout.session',
      mode: 'payment',
      status: 'open',
      payment_status: 'unpaid',
      amount_total: 24_900,
      currency: 'usd',
      client_reference_id: 'agr_55',
      metadata: { agreement: 'agr_55' },
      customer: c.id,
    });
    expect(s.url).toBe(`${started.url}/checkout/${s.id}`);
    const items = await stripe.checkout.sessions.listLineItems(s.id);
    expect(items.data.map((i) => [i.description, i.quantity, i.amount_total])).toEqual([
      ['Comfort plan, 12 months', 1, 19_900],
      ['Second system', 2, 5_000],
    ]);
    const got = await stripe.checkout.sessions.retrieve(s.id, { expand: ['line_items'] });
    expect(got.line_items?.data).toHaveLength(2);
  });

  it('setup mode has a SetupIntent and no amount', async () => {
    const c = await stripe.customers.create({});
    const s = await stripe.checkout.sessions.create({ mode: 'setup', customer: c.id, currency: 'usd', success_url: 'http://app.example.test/ok' });
    expect(s).toMatchObject({ mode: 'setup', status: 'open', payment_status: 'no_payment_required', amount_total: null });
    expect(s.setup_intent).toMatch(idPattern('seti'));
  });

  it('refuses a payment session without line items', async () => {
    const err = await stripe.checkout.sessions.create({ mode: 'payment', success_url: 'http://app.example.test/ok' }).catch((e: unknown) => e);
    expect(err).toMatchObject({ type: 'StripeInvalidRequestError', param: 'line_items' });
  });
});

describe('events', () => {
  it('records events that can be listed and retrieved', async () => {
    const pi = await stripe.paymentIntents.create({ amount: 2_000, currency: 'usd', payment_method: 'pm_card_visa', confirm: true });
    const list = await stripe.events.list({ type: 'payment_intent.succeeded' });
    expect(list.data).toHaveLength(1);
    const evt = list.data[0]!;
    expect(evt.id).toMatch(idPattern('evt'));
    expect(evt).toMatchObject({ object: 'event', type: 'payment_intent.succeeded', livemode: false });
    expect((evt.data.object as Stripe.PaymentIntent).id).toBe(pi.id);
    expect((await stripe.events.retrieve(evt.id)).id).toBe(evt.id);
  });
});

describe('errors by status', () => {
  it('a 500 from the fault switch raises StripeAPIError; 429 a rate-limit error; 403 a permission error', async () => {
    started.fake.addFault({ path: '/v1/customers', status: 500, times: 1 });
    await expect(stripe.customers.create({})).rejects.toBeInstanceOf(Stripe.errors.StripeAPIError);
    started.fake.addFault({ path: '/v1/customers', status: 429, times: 1 });
    await expect(stripe.customers.create({})).rejects.toBeInstanceOf(Stripe.errors.StripeRateLimitError);
    started.fake.addFault({ path: '/v1/customers', status: 403, times: 1 });
    await expect(stripe.customers.create({})).rejects.toBeInstanceOf(Stripe.errors.StripePermissionError);
    // the fault is used up: the next call works
    await expect(stripe.customers.create({})).resolves.toMatchObject({ object: 'customer' });
  });
});
