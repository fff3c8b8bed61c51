import type Stripe from 'stripe';
import { clone, listOf, LIST_PARAMS, MIN_AMOUNT, newId, randomId, type Engine, type RequestInfo } from './engine';
import { invalidParam, invalidRequest, missingParam, noSuch, unexpectedState } from './errors';
import { checkKnown, expandList, int, list, mergeMetadata, obj, oneOf, reqStr, str, type Params } from './params';
import { confirmPaymentIntent, createPaymentIntent } from './payment-intents';
import { createPaymentMethodFromCard, type CardInput } from './payment-methods';
import { confirmSetupIntent, createSetupIntent } from './setup-intents';
import type { WireCheckoutSession, WireLineItem, WireList } from './wire-types';

// Checkout Sessions: a hosted page that pays (mode=payment) or saves a card (mode=setup).

/** Line items with inline `price_data`, all in one currency. */
function parseLineItems(e: Engine, rawLines: unknown[], currencyParam: string | null): { lines: WireLineItem[]; currency: string | null } {
  const lines: WireLineItem[] = [];
  let currency = currencyParam;
  rawLines.forEach((raw, i) => {
    const at = `line_items[${i}]`;
    const li = raw && typeof raw === 'object' ? (raw as Params) : {};
    checkKnown(li, ['price_data', 'quantity', 'price', 'adjustable_quantity', 'tax_rates'], at);
    if (str(li, 'price', `${at}[price]`)) throw noSuch('price', String(li['price']), `${at}[price]`);
    const pd = obj(li, 'price_data', `${at}[price_data]`);
    if (!pd) throw missingParam(`${at}[price_data]`);
    checkKnown(pd, ['currency', 'unit_amount', 'product_data', 'product', 'tax_behavior'], `${at}[price_data]`);
    const lineCurrency = reqStr(pd, 'currency', `${at}[price_data][currency]`).toLowerCase();
    const unit = int(pd, 'unit_amount', `${at}[price_data][unit_amount]`);
    if (unit === undefined) throw missingParam(`${at}[price_data][unit_amount]`);
    if (unit < 0) throw invalidParam(`${at}[price_data][unit_amount]`, 'This value must be greater than or equal to 0.');
    const qty = int(li, 'quantity', `${at}[quantity]`);
    if (qty === undefined) throw missingParam(`${at}[quantity]`);
    if (qty < 1) throw invalidParam(`${at}[quantity]`, 'This value must be greater than or equal to 1.');
    const prod = obj(pd, 'product_data', `${at}[price_data][product_data]`);
    if (!prod) throw missingParam(`${at}[price_data][product_data]`);
    const name = reqStr(prod, 'name', `${at}[price_data][product_data][name]`);
    if (currency && currency !== lineCurrency) throw invalidParam(`${at}[price_data][currency]`, 'All line items must use the same currency.');
    currency = lineCurrency;
    const total = unit * qty;
    lines.push({
      id: newId('li'),
      object: 'item',
      amount_discount: 0,
      amount_subtotal: total,
      amount_tax: 0,
      amount_total: total,
      currency: lineCurrency,
      description: name,
      price: {
        id: newId('price'),
        object: 'price',
        active: false,
        billing_scheme: 'per_unit',
        created: e.now(),
        currency: lineCurrency,
        livemode: false,
        metadata: {},
        product: newId('prod'),
        type: 'one_time',
        unit_amount: unit,
        unit_amount_decimal: String(unit),
      },
      quantity: qty,
    });
  });
  return { lines, currency };
}

export function createCheckoutSession(e: Engine, p: Params, req: RequestInfo): WireCheckoutSession {
  checkKnown(p, [
    'mode',
    'success_url',
    'cancel_url',
    'line_items',
    'customer',
    'customer_email',
    'client_reference_id',
    'metadata',
    'payment_intent_data',
    'setup_intent_data',
    'payment_method_types',
    'currency',
    'expires_at',
    'locale',
    'submit_type',
    'customer_creation',
    'billing_address_collection',
    'allow_promotion_codes',
    'ui_mode',
  ]);
  const mode = oneOf(p, 'mode', ['payment', 'setup', 'subscription'] as const);
  if (!mode) throw missingParam('mode');
  if (mode === 'subscription') throw invalidParam('mode', 'This test tool supports mode=payment and mode=setup only.');
  const successUrl = reqStr(p, 'success_url');
  for (const [k, v] of [
    ['success_url', successUrl],
    ['cancel_url', str(p, 'cancel_url')],
  ] as const) {
    if (v !== undefined && !/^https?:\/\/[^\s]+$/.test(v)) throw invalidParam(k, `Not a valid URL`, 'url_invalid');
  }
  const cusId = str(p, 'customer');
  if (cusId) e.get(e.customers, 'customer', cusId, 'customer');
  const customerEmail = str(p, 'customer_email');
  if (cusId && customerEmail) throw invalidRequest('You may only specify one of these parameters: customer, customer_email.', 'customer_email');
  const metadata = mergeMetadata({}, p['metadata']);
  const piData = obj(p, 'payment_intent_data') ?? {};
  checkKnown(piData, ['metadata', 'setup_future_usage', 'description', 'capture_method', 'receipt_email', 'statement_descriptor'], 'payment_intent_data');
  const siData = obj(p, 'setup_intent_data') ?? {};
  checkKnown(siData, ['metadata', 'description'], 'setup_intent_data');
  const piMetadata = mergeMetadata({}, piData['metadata'], 'payment_intent_data[metadata]');
  const siMetadata = mergeMetadata({}, siData['metadata'], 'setup_intent_data[metadata]');
  const sfu = oneOf(piData, 'setup_future_usage', ['off_session', 'on_session'] as const, 'payment_intent_data[setup_future_usage]');
  const capture = oneOf(piData, 'capture_method', ['automatic', 'automatic_async', 'manual'] as const, 'payment_intent_data[capture_method]');

  const currencyParam = str(p, 'currency')?.toLowerCase() ?? null;
  const rawLines = list(p, 'line_items') ?? [];
  if (mode === 'payment' && rawLines.length === 0) throw missingParam('line_items');
  if (mode === 'setup' && rawLines.length > 0) throw invalidParam('line_items', 'line_items cannot be used in setup mode.');
  const { lines, currency } = parseLineItems(e, rawLines, currencyParam);
  const amountTotal = mode === 'payment' ? lines.reduce((s, l) => s + l.amount_total, 0) : null;
  if (amountTotal !== null && amountTotal < MIN_AMOUNT)
    throw invalidRequest("The Checkout Session's total amount due must add up to at least $0.50 usd", 'line_items', 'amount_too_small');

  const id = `cs_test_${randomId(58)}`;
  let setupIntentId: string | null = null;
  if (mode === 'setup') {
    const si = createSetupIntent(e, { ...(cusId ? { customer: cusId } : {}), usage: 'off_session' }, req);
    e.setupIntents.get(si.id)!.metadata = siMetadata;
    setupIntentId = si.id;
  }
  const now = e.now();
  const expiresAt = int(p, 'expires_at') ?? now + 24 * 3600;
  const s: WireCheckoutSession = {
    id,
    object: 'checkout.session',
    amount_subtotal: amountTotal,
    amount_total: amountTotal,
    cancel_url: str(p, 'cancel_url') ?? null,
    client_reference_id: str(p, 'client_reference_id') ?? null,
    created: now,
    currency,
    customer: cusId ?? null,
    customer_creation: null,
    customer_details: customerEmail ? { email: customerEmail, name: null, phone: null, address: null, tax_exempt: 'none', tax_ids: [] } : null,
    customer_email: customerEmail ?? null,
    expires_at: expiresAt,
    livemode: false,
    // Passed through as given, as the fake always has: it checks neither against the API's lists.
    locale: (str(p, 'locale') ?? null) as Stripe.Checkout.Session.Locale | null,
    metadata,
    mode,
    payment_intent: null,
    payment_method_types: ['card'],
    payment_status: mode === 'setup' ? 'no_payment_required' : 'unpaid',
    setup_intent: setupIntentId,
    status: 'open',
    submit_type: (str(p, 'submit_type') ?? null) as Stripe.Checkout.Session.SubmitType | null,
    success_url: successUrl,
    ui_mode: 'hosted',
    url: `${req.publicUrl}/checkout/${id}`,
  };
  e.sessions.set(id, s);
  e.sessionLines.set(id, lines);
  e.sessionExtras.set(id, {
    piMetadata,
    sfu: sfu ?? null,
    capture: capture ?? 'automatic_async',
    description: str(piData, 'description', 'payment_intent_data[description]') ?? null,
  });
  return e.expand(s, expandList(p));
}

export function retrieveCheckoutSession(e: Engine, id: string, q: Params): WireCheckoutSession {
  return e.expand(sessionNow(e, id), expandList(q));
}

/** The session, marked expired once its time has passed. */
export function sessionNow(e: Engine, id: string): WireCheckoutSession {
  const s = e.get(e.sessions, 'checkout.session', id);
  if (s.status === 'open' && e.now() >= s.expires_at) {
    s.status = 'expired';
    s.url = null;
  }
  return s;
}

export function listCheckoutSessions(e: Engine, q: Params): WireList<WireCheckoutSession> {
  checkKnown(q, [...LIST_PARAMS, 'customer', 'payment_intent', 'status']);
  const pi = str(q, 'payment_intent');
  const data = [...e.sessions.values()].reverse().filter((s) => !pi || s.payment_intent === pi);
  return listOf(data, q, '/v1/checkout/sessions');
}

export function listCheckoutLineItems(e: Engine, id: string, q: Params): WireList<WireLineItem> {
  e.get(e.sessions, 'checkout.session', id);
  return listOf(e.sessionLines.get(id) ?? [], q, `/v1/checkout/sessions/${id}/line_items`);
}

export function expireCheckoutSession(e: Engine, id: string, req: RequestInfo): WireCheckoutSession {
  const s = sessionNow(e, id);
  if (s.status !== 'open') {
    throw unexpectedState('checkout_session', `Only Checkout Sessions with a status in ["open"] can be expired. This Checkout Session has a status of "${s.status}".`);
  }
  s.status = 'expired';
  s.url = null;
  e.emit('checkout.session.expired', s, req);
  return clone(s);
}

/**
 * The hosted page's submit: pays (or saves the card) with typed test card
 * data. A decline throws a card error and leaves the session open.
 */
export function completeCheckout(e: Engine, id: string, input: CardInput, req: RequestInfo): WireCheckoutSession {
  const s = sessionNow(e, id);
  if (s.status !== 'open') {
    throw unexpectedState('checkout_session', `This Checkout Session is ${s.status}.`);
  }
  const pm = createPaymentMethodFromCard(e, input, s.customer_email ? { billing_details: { email: s.customer_email } } : {});
  if (s.mode === 'setup') {
    try {
      confirmSetupIntent(e, s.setup_intent!, { payment_method: pm.id }, req);
    } catch (err) {
      e.paymentMethods.delete(pm.id);
      throw err;
    }
  } else {
    const extras = e.sessionExtras.get(id)!;
    let piId = s.payment_intent;
    if (!piId) {
      const pi = createPaymentIntent(
        e,
        {
          amount: String(s.amount_total),
          currency: s.currency,
          ...(s.customer ? { customer: s.customer } : {}),
          ...(extras.sfu && s.customer ? { setup_future_usage: extras.sfu } : {}),
          ...(extras.description ? { description: extras.description } : {}),
          capture_method: extras.capture,
          metadata: extras.piMetadata,
        },
        req,
      );
      piId = pi.id;
      s.payment_intent = piId;
    }
    confirmPaymentIntent(e, piId, { payment_method: pm.id }, req);
    s.payment_status = e.paymentIntents.get(piId)!.status === 'succeeded' ? 'paid' : 'unpaid';
  }
  s.status = 'complete';
  s.url = null;
  e.emit('checkout.session.completed', s, req);
  return clone(s);
}
