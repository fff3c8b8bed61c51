import { newCharge } from './charges';
import { clone, listOf, LIST_PARAMS, MIN_AMOUNT, newId, randomId, type Engine, type RequestInfo } from './engine';
import { cardError, invalidParam, invalidRequest, missingParam, unexpectedState } from './errors';
import { bool, checkKnown, expandList, int, mergeMetadata, oneOf, reqStr, str, type Params } from './params';
import { resolvePaymentMethod } from './payment-methods';
import type { WireList, WirePaymentIntent, WirePaymentMethod } from './wire-types';

// PaymentIntents: a charge to confirm, optionally held for a later capture, or cancelled.

const CAPTURE_METHODS = ['automatic', 'automatic_async', 'manual'] as const;
const FUTURE_USAGES = ['off_session', 'on_session'] as const;
const PI_CANCEL_REASONS = ['duplicate', 'fraudulent', 'requested_by_customer', 'abandoned'] as const;

export function createPaymentIntent(e: Engine, p: Params, req: RequestInfo): WirePaymentIntent {
  checkKnown(p, [
    'amount',
    'currency',
    'customer',
    'payment_method',
    'confirm',
    'off_session',
    'capture_method',
    'metadata',
    'description',
    'receipt_email',
    'setup_future_usage',
    'payment_method_types',
    'automatic_payment_methods',
    'return_url',
    'error_on_requires_action',
    'statement_descriptor',
    'statement_descriptor_suffix',
    'use_stripe_sdk',
  ]);
  const amount = int(p, 'amount');
  if (amount === undefined) throw missingParam('amount');
  if (amount < MIN_AMOUNT) throw invalidRequest('Amount must be at least $0.50 usd', 'amount', 'amount_too_small');
  const currency = reqStr(p, 'currency').toLowerCase();
  if (!/^[a-z]{3}$/.test(currency)) throw invalidParam('currency', `Invalid currency: ${currency}.`);
  const cusId = str(p, 'customer');
  if (cusId) e.get(e.customers, 'customer', cusId, 'customer');
  const capture = oneOf(p, 'capture_method', CAPTURE_METHODS) ?? 'automatic_async';
  const sfu = oneOf(p, 'setup_future_usage', FUTURE_USAGES) ?? null;
  const confirm = bool(p, 'confirm') ?? false;
  const offSession = bool(p, 'off_session');
  if (offSession !== undefined && !confirm) {
    throw invalidRequest('off_session can only be used when confirm=true.', 'off_session');
  }
  const metadata = mergeMetadata({}, p['metadata']);
  const pmId = str(p, 'payment_method');
  const pm = pmId ? resolvePaymentMethod(e, pmId, 'payment_method') : undefined;
  const id = newId('pi');
  const pi: WirePaymentIntent = {
    id,
    object: 'payment_intent',
    amount,
    amount_capturable: 0,
    amount_details: { tip: {} },
    amount_received: 0,
    application: null,
    application_fee_amount: null,
    automatic_payment_methods: null,
    canceled_at: null,
    cancellation_reason: null,
    capture_method: capture,
    client_secret: `${id}_secret_${randomId()}`,
    confirmation_method: 'automatic',
    created: e.now(),
    currency,
    customer: cusId ?? null,
    description: str(p, 'description') ?? null,
    last_payment_error: null,
    latest_charge: null,
    livemode: false,
    metadata,
    next_action: null,
    on_behalf_of: null,
    payment_method: pm ? pm.id : null,
    payment_method_types: ['card'],
    processing: null,
    receipt_email: str(p, 'receipt_email') ?? null,
    setup_future_usage: sfu,
    statement_descriptor: null,
    statement_descriptor_suffix: null,
    status: pm ? 'requires_confirmation' : 'requires_payment_method',
    transfer_data: null,
    transfer_group: null,
  };
  if (pm) checkPmCustomer(pm, pi);
  e.paymentIntents.set(id, pi);
  if (confirm) return confirmPaymentIntent(e, id, offSession !== undefined ? { off_session: String(offSession) } : {}, req);
  return clone(pi);
}

function checkPmCustomer(pm: WirePaymentMethod, pi: WirePaymentIntent): void {
  if (pm.customer && pm.customer !== pi.customer) {
    throw invalidRequest(
      pi.customer
        ? 'The provided PaymentMethod is attached to another Customer.'
        : 'The provided PaymentMethod belongs to a Customer; pass that Customer as the customer parameter.',
      'customer',
    );
  }
}

export function retrievePaymentIntent(e: Engine, id: string, q: Params): WirePaymentIntent {
  return e.expand(e.get(e.paymentIntents, 'payment_intent', id), expandList(q));
}

export function updatePaymentIntent(e: Engine, id: string, p: Params): WirePaymentIntent {
  const pi = e.get(e.paymentIntents, 'payment_intent', id);
  checkKnown(p, ['amount', 'metadata', 'description', 'receipt_email', 'payment_method', 'customer', 'setup_future_usage']);
  if (pi.status === 'succeeded' || pi.status === 'canceled' || pi.status === 'processing') {
    if (Object.keys(p).some((k) => k !== 'metadata' && k !== 'description' && k !== 'expand')) {
      throw unexpectedState('payment_intent', `This PaymentIntent's fields cannot be changed because it has a status of ${pi.status}.`);
    }
  }
  const next = clone(pi);
  const amount = int(p, 'amount');
  if (amount !== undefined) {
    if (amount < MIN_AMOUNT) throw invalidRequest('Amount must be at least $0.50 usd', 'amount', 'amount_too_small');
    next.amount = amount;
  }
  next.metadata = mergeMetadata(pi.metadata, p['metadata']);
  for (const k of ['description', 'receipt_email'] as const) if (p[k] !== undefined) next[k] = str(p, k) ?? null;
  const cus = str(p, 'customer');
  if (cus) next.customer = e.get(e.customers, 'customer', cus, 'customer').id;
  const sfu = oneOf(p, 'setup_future_usage', FUTURE_USAGES);
  if (sfu) next.setup_future_usage = sfu;
  const pmId = str(p, 'payment_method');
  if (pmId) {
    const pm = resolvePaymentMethod(e, pmId, 'payment_method');
    checkPmCustomer(pm, next);
    next.payment_method = pm.id;
    if (next.status === 'requires_payment_method') next.status = 'requires_confirmation';
  }
  e.paymentIntents.set(id, next);
  return e.expand(next, expandList(p));
}

export function confirmPaymentIntent(e: Engine, id: string, p: Params, req: RequestInfo): WirePaymentIntent {
  const pi = e.get(e.paymentIntents, 'payment_intent', id);
  checkKnown(p, [
    'payment_method',
    'off_session',
    'return_url',
    'setup_future_usage',
    'error_on_requires_action',
    'use_stripe_sdk',
    'receipt_email',
    'capture_method',
    'mandate_data',
  ]);
  if (pi.status !== 'requires_payment_method' && pi.status !== 'requires_confirmation') {
    throw unexpectedState('payment_intent', `You cannot confirm this PaymentIntent because it has a status of ${pi.status}.`);
  }
  bool(p, 'off_session');
  const sfu = oneOf(p, 'setup_future_usage', FUTURE_USAGES);
  const pmId = str(p, 'payment_method') ?? pi.payment_method;
  if (!pmId) {
    throw invalidRequest("You cannot confirm this PaymentIntent because it's missing a payment method.", 'payment_method', 'payment_intent_unexpected_state');
  }
  const pm = resolvePaymentMethod(e, pmId, 'payment_method');
  checkPmCustomer(pm, pi);
  if (sfu) pi.setup_future_usage = sfu;
  pi.payment_method = pm.id;
  const card = e.pmCard.get(pm.id);
  const failure = card?.onCharge ?? null;
  const charge = newCharge(e, pi, pm, card, failure);
  pi.latest_charge = charge.id;
  if (failure) {
    pi.status = 'requires_payment_method';
    pi.payment_method = null;
    pi.last_payment_error = {
      type: 'card_error',
      charge: charge.id,
      code: failure.code,
      decline_code: failure.decline_code,
      message: failure.message,
      payment_method: clone(pm),
    };
    e.emit('payment_intent.payment_failed', pi, req);
    throw cardError(failure, undefined, { charge: charge.id, payment_intent: clone(pi), payment_method: clone(pm) });
  }
  pi.last_payment_error = null;
  if (pi.setup_future_usage && pi.customer && !pm.customer) pm.customer = pi.customer;
  if (pi.capture_method === 'manual') {
    pi.status = 'requires_capture';
    pi.amount_capturable = pi.amount;
    e.emit('payment_intent.amount_capturable_updated', pi, req);
  } else {
    pi.status = 'succeeded';
    pi.amount_received = pi.amount;
    e.emit('payment_intent.succeeded', pi, req);
  }
  return e.expand(pi, expandList(p));
}

export function capturePaymentIntent(e: Engine, id: string, p: Params, req: RequestInfo): WirePaymentIntent {
  const pi = e.get(e.paymentIntents, 'payment_intent', id);
  checkKnown(p, ['amount_to_capture', 'metadata', 'final_capture', 'statement_descriptor']);
  if (pi.status !== 'requires_capture') {
    throw unexpectedState(
      'payment_intent',
      `This PaymentIntent could not be captured because it has a status of ${pi.status}. Only a PaymentIntent with one of the following statuses may be captured: requires_capture.`,
    );
  }
  const amount = int(p, 'amount_to_capture') ?? pi.amount_capturable;
  if (amount < 1 || amount > pi.amount_capturable) {
    throw invalidRequest(`The amount to capture must be between 1 and ${pi.amount_capturable}.`, 'amount_to_capture');
  }
  pi.metadata = mergeMetadata(pi.metadata, p['metadata']);
  // A PaymentIntent waiting for capture was confirmed, so it has a charge.
  const ch = e.charges.get(pi.latest_charge!)!;
  ch.captured = true;
  ch.amount_captured = amount;
  pi.amount_received = amount;
  pi.amount_capturable = 0;
  pi.status = 'succeeded';
  e.emit('payment_intent.succeeded', pi, req);
  return e.expand(pi, expandList(p));
}

export function cancelPaymentIntent(e: Engine, id: string, p: Params, req: RequestInfo): WirePaymentIntent {
  const pi = e.get(e.paymentIntents, 'payment_intent', id);
  checkKnown(p, ['cancellation_reason']);
  if (pi.status === 'succeeded' || pi.status === 'canceled') {
    throw unexpectedState('payment_intent', `You cannot cancel this PaymentIntent because it has a status of ${pi.status}.`);
  }
  const reason = oneOf(p, 'cancellation_reason', PI_CANCEL_REASONS) ?? null;
  pi.status = 'canceled';
  pi.canceled_at = e.now();
  pi.cancellation_reason = reason;
  pi.amount_capturable = 0;
  e.emit('payment_intent.canceled', pi, req);
  return clone(pi);
}

export function listPaymentIntents(e: Engine, q: Params): WireList<WirePaymentIntent> {
  checkKnown(q, [...LIST_PARAMS, 'customer']);
  const cus = str(q, 'customer');
  return listOf(
    [...e.paymentIntents.values()].reverse().filter((x) => !cus || x.customer === cus),
    q,
    '/v1/payment_intents',
  );
}
