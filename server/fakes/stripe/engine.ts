import { randomBytes } from 'node:crypto';
import { lookupCard, TEST_CARDS, TEST_PAYMENT_METHODS, TEST_TOKENS, type CardFailure, type TestCard } from './cards';
import { FakeStripeError, invalidParam, invalidRequest, missingParam, noSuch, unexpectedState } from './errors';
import {
  bool,
  checkKnown,
  expandList,
  int,
  list,
  mergeMetadata,
  obj,
  oneOf,
  reqStr,
  str,
  type Params,
} from './params';
import type { WireEvent } from './webhooks';

// The objects and rules of the fake, in memory. Objects are plain JSON in the
// API's wire shape; every operation validates before it changes anything, so
// a refused request leaves no trace.

// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type Obj = Record<string, any>;

export const FAKE_API_VERSION = '2026-10-28.endive';
const MIN_AMOUNT = 50; // Stripe's minimum charge in USD cents

export interface RequestInfo {
  requestId: string;
  idempotencyKey: string | null;
  apiVersion: string;
  publicUrl: string;
}

const ALPHABET = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789';
function randomId(len = 24): string {
  const bytes = randomBytes(len);
  let out = '';
  for (let i = 0; i < len; i++) out += ALPHABET[bytes[i]! % ALPHABET.length];
  return out;
}

export const newId = (prefix: string) => `${prefix}_${randomId()}`;

function clone<T>(v: T): T {
  return structuredClone(v);
}

function listOf(data: Obj[], p: Params, url: string): Obj {
  const limit = int(p, 'limit') ?? 10;
  if (limit < 1 || limit > 100) throw invalidParam('limit', 'This value must be between 1 and 100.');
  let items = data;
  const after = str(p, 'starting_after');
  if (after) {
    const i = items.findIndex((x) => x['id'] === after);
    if (i < 0) throw noSuch('object', after, 'starting_after');
    items = items.slice(i + 1);
  }
  return { object: 'list', data: items.slice(0, limit).map(clone), has_more: items.length > limit, url };
}

const LIST_PARAMS = ['limit', 'starting_after', 'ending_before', 'created'];

export interface CardInput {
  number: string;
  expMonth: number;
  expYear: number;
  cvc?: string;
}

export class Engine {
  customers = new Map<string, Obj>();
  paymentMethods = new Map<string, Obj>();
  setupIntents = new Map<string, Obj>();
  paymentIntents = new Map<string, Obj>();
  charges = new Map<string, Obj>();
  refunds = new Map<string, Obj>();
  sessions = new Map<string, Obj>();
  /** Line items of each Checkout Session, kept apart as the API does. */
  sessionLines = new Map<string, Obj[]>();
  /** Newest first. */
  events: WireEvent[] = [];
  /** Which test card each PaymentMethod stands for (never shown on the wire). */
  private pmCard = new Map<string, TestCard>();

  constructor(
    private readonly clock: () => number,
    private readonly onEvent: (e: WireEvent) => void,
  ) {}

  reset(): void {
    for (const m of [this.customers, this.paymentMethods, this.setupIntents, this.paymentIntents, this.charges, this.refunds, this.sessions]) {
      m.clear();
    }
    this.sessionLines.clear();
    this.pmCard.clear();
    this.events = [];
  }

  private now(): number {
    return Math.floor(this.clock() / 1000);
  }

  private base(prefix: string, object: string): Obj {
    return { id: newId(prefix), object, created: this.now(), livemode: false };
  }

  emit(type: string, object: Obj, req: RequestInfo): void {
    const event: WireEvent = {
      id: newId('evt'),
      object: 'event',
      api_version: req.apiVersion,
      created: this.now(),
      data: { object: clone(object) },
      livemode: false,
      pending_webhooks: 1,
      request: { id: req.requestId, idempotency_key: req.idempotencyKey },
      type,
    };
    this.events.unshift(event);
    this.onEvent(event);
  }

  private expand(o: Obj, fields: string[]): Obj {
    const out = clone(o);
    const sources: Record<string, Map<string, Obj>> = {
      customer: this.customers,
      payment_method: this.paymentMethods,
      payment_intent: this.paymentIntents,
      setup_intent: this.setupIntents,
      latest_charge: this.charges,
      charge: this.charges,
    };
    for (const f of fields) {
      if (f === 'line_items' && o['object'] === 'checkout.session') {
        out['line_items'] = { object: 'list', data: clone(this.sessionLines.get(o['id']) ?? []), has_more: false, url: `/v1/checkout/sessions/${o['id']}/line_items` };
        continue;
      }
      const src = sources[f];
      if (!src || !(f in o)) throw invalidRequest(`This property cannot be expanded (${f}).`, 'expand');
      const id = o[f];
      if (typeof id === 'string' && src.has(id)) out[f] = clone(src.get(id)!);
    }
    return out;
  }

  private get(map: Map<string, Obj>, kind: string, id: string, param = 'id'): Obj {
    const o = map.get(id);
    if (!o) throw noSuch(kind, id, param);
    return o;
  }

  // ---------- Customers ----------

  createCustomer(p: Params): Obj {
    checkKnown(p, ['email', 'name', 'phone', 'description', 'metadata', 'payment_method', 'invoice_settings', 'address', 'preferred_locales']);
    const email = str(p, 'email');
    if (email !== undefined && !/^[^@\s]+@[^@\s]+$/.test(email)) throw invalidParam('email', `Invalid email address: ${email}`, 'email_invalid');
    const metadata = mergeMetadata({}, p['metadata']);
    const pmId = str(p, 'payment_method');
    const pm = pmId ? this.resolvePaymentMethod(pmId, 'payment_method') : undefined;
    if (pm) this.checkSave(pm);
    const c: Obj = {
      ...this.base('cus', 'customer'),
      address: null,
      balance: 0,
      currency: null,
      default_source: null,
      delinquent: false,
      description: str(p, 'description') ?? null,
      email: email ?? null,
      invoice_prefix: randomId(8).toUpperCase(),
      invoice_settings: { custom_fields: null, default_payment_method: null, footer: null, rendering_options: null },
      metadata,
      name: str(p, 'name') ?? null,
      phone: str(p, 'phone') ?? null,
      preferred_locales: [],
      shipping: null,
      tax_exempt: 'none',
      test_clock: null,
    };
    this.customers.set(c['id'], c);
    if (pm) pm['customer'] = c['id'];
    this.applyInvoiceSettings(c, p);
    return clone(c);
  }

  private applyInvoiceSettings(c: Obj, p: Params): void {
    const inv = obj(p, 'invoice_settings');
    if (!inv) return;
    checkKnown(inv, ['default_payment_method', 'custom_fields', 'footer', 'rendering_options'], 'invoice_settings');
    const param = 'invoice_settings[default_payment_method]';
    const pmId = str(inv, 'default_payment_method', param);
    if (pmId === undefined) {
      if (inv['default_payment_method'] === '') c['invoice_settings'].default_payment_method = null;
      return;
    }
    const pm = this.paymentMethods.get(pmId);
    if (!pm || pm['customer'] !== c['id']) {
      throw invalidRequest(
        `The customer does not have a payment method with the ID ${pmId}. The payment method must be attached to the customer.`,
        param,
        'resource_missing',
      );
    }
    c['invoice_settings'].default_payment_method = pmId;
  }

  retrieveCustomer(id: string, q: Params): Obj {
    return this.expand(this.get(this.customers, 'customer', id), expandList(q));
  }

  updateCustomer(id: string, p: Params): Obj {
    const c = this.get(this.customers, 'customer', id);
    checkKnown(p, ['email', 'name', 'phone', 'description', 'metadata', 'invoice_settings', 'address', 'preferred_locales']);
    const next = clone(c);
    for (const k of ['email', 'name', 'phone', 'description']) {
      if (p[k] === '') next[k] = null;
      else if (p[k] !== undefined) next[k] = str(p, k);
    }
    next['metadata'] = mergeMetadata(c['metadata'], p['metadata']);
    this.applyInvoiceSettings(next, p);
    this.customers.set(id, next);
    return this.expand(next, expandList(p));
  }

  deleteCustomer(id: string): Obj {
    this.get(this.customers, 'customer', id);
    this.customers.delete(id);
    for (const pm of this.paymentMethods.values()) if (pm['customer'] === id) pm['customer'] = null;
    return { id, object: 'customer', deleted: true };
  }

  listCustomers(q: Params): Obj {
    checkKnown(q, [...LIST_PARAMS, 'email', 'test_clock']);
    const email = str(q, 'email');
    const all = [...this.customers.values()].reverse().filter((c) => !email || c['email'] === email);
    return listOf(all, q, '/v1/customers');
  }

  // ---------- PaymentMethods ----------

  private newCardPaymentMethod(card: TestCard, expMonth: number, expYear: number, extra: Params = {}): Obj {
    const pm: Obj = {
      ...this.base('pm', 'payment_method'),
      allow_redisplay: 'unspecified',
      billing_details: {
        address: { city: null, country: null, line1: null, line2: null, postal_code: null, state: null },
        email: null,
        name: null,
        phone: null,
        ...(obj(extra, 'billing_details') ?? {}),
      },
      card: {
        brand: card.brand,
        checks: { address_line1_check: null, address_postal_code_check: null, cvc_check: 'pass' },
        country: 'US',
        display_brand: card.brand,
        exp_month: expMonth,
        exp_year: expYear,
        fingerprint: card.number.slice(-8) + 'fakeprint',
        funding: card.funding,
        last4: card.number.slice(-4),
        networks: { available: [card.brand], preferred: null },
        wallet: null,
      },
      customer: null,
      metadata: mergeMetadata({}, extra['metadata']),
      type: 'card',
    };
    this.paymentMethods.set(pm['id'], pm);
    this.pmCard.set(pm['id'], card);
    return pm;
  }

  /** A stored PaymentMethod, or a fresh one for a test id such as `pm_card_visa`. */
  resolvePaymentMethod(id: string, param: string): Obj {
    const testNumber = TEST_PAYMENT_METHODS[id];
    if (testNumber) {
      const card = TEST_CARDS.find((c) => c.number === testNumber)!;
      return this.newCardPaymentMethod(card, 12, new Date(this.clock()).getUTCFullYear() + 3);
    }
    return this.get(this.paymentMethods, 'PaymentMethod', id, param);
  }

  /** Validates typed card data; a bad number or date is a card error, as on a real card form. */
  cardFromInput(input: CardInput): TestCard {
    const found = lookupCard(input.number);
    if (!found.ok) throw this.cardError(found.failure, 'number');
    const { expMonth, expYear } = input;
    if (!Number.isInteger(expMonth) || expMonth < 1 || expMonth > 12) {
      throw this.cardError({ code: 'invalid_expiry_month', message: "Your card's expiration month is invalid." }, 'exp_month');
    }
    const now = new Date(this.clock());
    const year = expYear < 100 ? 2000 + expYear : expYear;
    if (year < now.getUTCFullYear() || (year === now.getUTCFullYear() && expMonth < now.getUTCMonth() + 1)) {
      throw this.cardError({ code: 'invalid_expiry_year', message: "Your card's expiration year is invalid." }, 'exp_year');
    }
    if (input.cvc !== undefined && !/^\d{3,4}$/.test(input.cvc)) {
      throw this.cardError({ code: 'invalid_cvc', message: "Your card's security code is invalid." }, 'cvc');
    }
    return found.card;
  }

  createPaymentMethodFromCard(input: CardInput, extra: Params = {}): Obj {
    const card = this.cardFromInput(input);
    const year = input.expYear < 100 ? 2000 + input.expYear : input.expYear;
    return this.newCardPaymentMethod(card, input.expMonth, year, extra);
  }

  createPaymentMethod(p: Params): Obj {
    checkKnown(p, ['type', 'card', 'billing_details', 'metadata', 'allow_redisplay']);
    const type = reqStr(p, 'type');
    if (type !== 'card') throw invalidParam('type', 'This test tool supports only type=card.');
    const card = obj(p, 'card');
    if (!card) throw missingParam('card');
    checkKnown(card, ['number', 'exp_month', 'exp_year', 'cvc', 'token'], 'card');
    const token = str(card, 'token', 'card[token]');
    mergeMetadata({}, p['metadata']);
    if (token) {
      const number = TEST_TOKENS[token];
      if (!number) throw noSuch('token', token, 'card[token]');
      const tc = TEST_CARDS.find((c) => c.number === number)!;
      return clone(this.newCardPaymentMethod(tc, 12, new Date(this.clock()).getUTCFullYear() + 3, p));
    }
    const number = reqStr(card, 'number', 'card[number]');
    const expMonth = int(card, 'exp_month', 'card[exp_month]');
    const expYear = int(card, 'exp_year', 'card[exp_year]');
    if (expMonth === undefined) throw missingParam('card[exp_month]');
    if (expYear === undefined) throw missingParam('card[exp_year]');
    return clone(this.createPaymentMethodFromCard({ number, expMonth, expYear, cvc: str(card, 'cvc', 'card[cvc]') }, p));
  }

  retrievePaymentMethod(id: string): Obj {
    return clone(this.resolvePaymentMethod(id, 'id'));
  }

  /** Saving a card runs the card check; some test cards fail it. */
  private checkSave(pm: Obj, extra: Partial<Obj> = {}): void {
    const card = this.pmCard.get(pm['id']);
    if (card?.onSave) throw this.cardError(card.onSave, undefined, { payment_method: clone(pm), ...extra });
  }

  attachPaymentMethod(id: string, p: Params): Obj {
    checkKnown(p, ['customer']);
    const cusId = reqStr(p, 'customer');
    this.get(this.customers, 'customer', cusId, 'customer');
    const pm = this.resolvePaymentMethod(id, 'payment_method');
    if (pm['customer'] && pm['customer'] !== cusId) {
      throw invalidRequest('The payment method you provided has already been attached to a customer.', 'payment_method');
    }
    this.checkSave(pm);
    pm['customer'] = cusId;
    return clone(pm);
  }

  detachPaymentMethod(id: string): Obj {
    const pm = this.get(this.paymentMethods, 'PaymentMethod', id);
    if (!pm['customer']) throw invalidRequest('The payment method you provided is not attached to a customer so detachment is impossible.', 'payment_method');
    pm['customer'] = null;
    return clone(pm);
  }

  listPaymentMethods(q: Params, customerId?: string): Obj {
    checkKnown(q, [...LIST_PARAMS, 'customer', 'type', 'allow_redisplay']);
    const cus = customerId ?? str(q, 'customer');
    if (cus) this.get(this.customers, 'customer', cus, 'customer');
    const type = str(q, 'type');
    const data = [...this.paymentMethods.values()]
      .reverse()
      .filter((pm) => (cus ? pm['customer'] === cus : true) && (!type || pm['type'] === type));
    return listOf(data, q, customerId ? `/v1/customers/${customerId}/payment_methods` : '/v1/payment_methods');
  }

  // ---------- Errors from cards ----------

  cardError(f: CardFailure, param?: string, extra: Obj = {}): FakeStripeError {
    return new FakeStripeError(402, {
      type: 'card_error',
      code: f.code,
      ...(f.decline_code ? { decline_code: f.decline_code } : {}),
      message: f.message,
      ...(param ? { param } : {}),
      ...extra,
    });
  }

  // ---------- SetupIntents ----------

  createSetupIntent(p: Params, req: RequestInfo): Obj {
    checkKnown(p, ['customer', 'payment_method', 'confirm', 'usage', 'metadata', 'description', 'payment_method_types', 'automatic_payment_methods', 'return_url', 'use_stripe_sdk']);
    const cusId = str(p, 'customer');
    if (cusId) this.get(this.customers, 'customer', cusId, 'customer');
    const usage = oneOf(p, 'usage', ['off_session', 'on_session'] as const) ?? 'off_session';
    const metadata = mergeMetadata({}, p['metadata']);
    const confirm = bool(p, 'confirm') ?? false;
    const pmId = str(p, 'payment_method');
    const pm = pmId ? this.resolvePaymentMethod(pmId, 'payment_method') : undefined;
    const id = newId('seti');
    const si: Obj = {
      id,
      object: 'setup_intent',
      application: null,
      automatic_payment_methods: null,
      cancellation_reason: null,
      client_secret: `${id}_secret_${randomId()}`,
      created: this.now(),
      customer: cusId ?? null,
      description: str(p, 'description') ?? null,
      last_setup_error: null,
      latest_attempt: null,
      livemode: false,
      metadata,
      next_action: null,
      payment_method: pm ? pm['id'] : null,
      payment_method_types: ['card'],
      status: pm ? 'requires_confirmation' : 'requires_payment_method',
      usage,
    };
    this.setupIntents.set(id, si);
    if (confirm) return this.confirmSetupIntent(id, {}, req);
    return clone(si);
  }

  retrieveSetupIntent(id: string, q: Params): Obj {
    return this.expand(this.get(this.setupIntents, 'setup_intent', id), expandList(q));
  }

  confirmSetupIntent(id: string, p: Params, req: RequestInfo): Obj {
    const si = this.get(this.setupIntents, 'setup_intent', id);
    checkKnown(p, ['payment_method', 'return_url', 'use_stripe_sdk', 'mandate_data']);
    if (si['status'] !== 'requires_payment_method' && si['status'] !== 'requires_confirmation') {
      throw unexpectedState('setup_intent', `You cannot confirm this SetupIntent because it has a status of ${si['status']}.`);
    }
    const pmId = str(p, 'payment_method') ?? si['payment_method'];
    if (!pmId) throw invalidRequest("You cannot confirm this SetupIntent because it's missing a payment method.", 'payment_method', 'setup_intent_unexpected_state');
    const pm = this.resolvePaymentMethod(pmId, 'payment_method');
    if (pm['customer'] && si['customer'] && pm['customer'] !== si['customer']) {
      throw invalidRequest('The payment method you provided has already been attached to a customer.', 'payment_method');
    }
    si['payment_method'] = pm['id'];
    const card = this.pmCard.get(pm['id']);
    if (card?.onSave) {
      si['status'] = 'requires_payment_method';
      si['last_setup_error'] = { type: 'card_error', code: card.onSave.code, decline_code: card.onSave.decline_code, message: card.onSave.message, payment_method: clone(pm) };
      si['payment_method'] = null;
      this.emit('setup_intent.setup_failed', si, req);
      throw this.cardError(card.onSave, undefined, { setup_intent: clone(si), payment_method: clone(pm) });
    }
    si['status'] = 'succeeded';
    si['last_setup_error'] = null;
    if (si['customer']) pm['customer'] = si['customer'];
    this.emit('setup_intent.succeeded', si, req);
    return this.expand(si, expandList(p));
  }

  cancelSetupIntent(id: string, p: Params): Obj {
    const si = this.get(this.setupIntents, 'setup_intent', id);
    checkKnown(p, ['cancellation_reason']);
    if (si['status'] === 'succeeded' || si['status'] === 'canceled') {
      throw unexpectedState('setup_intent', `You cannot cancel this SetupIntent because it has a status of ${si['status']}.`);
    }
    si['status'] = 'canceled';
    si['cancellation_reason'] = str(p, 'cancellation_reason') ?? null;
    return clone(si);
  }

  // ---------- PaymentIntents and charges ----------

  createPaymentIntent(p: Params, req: RequestInfo): Obj {
    checkKnown(p, [
      'amount', 'currency', 'customer', 'payment_method', 'confirm', 'off_session', 'capture_method', 'metadata',
      'description', 'receipt_email', 'setup_future_usage', 'payment_method_types', 'automatic_payment_methods',
      'return_url', 'error_on_requires_action', 'statement_descriptor', 'statement_descriptor_suffix', 'use_stripe_sdk',
    ]);
    const amount = int(p, 'amount');
    if (amount === undefined) throw missingParam('amount');
    if (amount < MIN_AMOUNT) throw invalidRequest('Amount must be at least $0.50 usd', 'amount', 'amount_too_small');
    const currency = reqStr(p, 'currency').toLowerCase();
    if (!/^[a-z]{3}$/.test(currency)) throw invalidParam('currency', `Invalid currency: ${currency}.`);
    const cusId = str(p, 'customer');
    if (cusId) this.get(this.customers, 'customer', cusId, 'customer');
    const capture = oneOf(p, 'capture_method', ['automatic', 'automatic_async', 'manual'] as const) ?? 'automatic_async';
    const sfu = oneOf(p, 'setup_future_usage', ['off_session', 'on_session'] as const) ?? null;
    const confirm = bool(p, 'confirm') ?? false;
    const offSession = bool(p, 'off_session');
    if (offSession !== undefined && !confirm) {
      throw invalidRequest('off_session can only be used when confirm=true.', 'off_session');
    }
    const metadata = mergeMetadata({}, p['metadata']);
    const pmId = str(p, 'payment_method');
    const pm = pmId ? this.resolvePaymentMethod(pmId, 'payment_method') : undefined;
    const id = newId('pi');
    const pi: Obj = {
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
      created: this.now(),
      currency,
      customer: cusId ?? null,
      description: str(p, 'description') ?? null,
      last_payment_error: null,
      latest_charge: null,
      livemode: false,
      metadata,
      next_action: null,
      on_behalf_of: null,
      payment_method: pm ? pm['id'] : null,
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
    if (pm) this.checkPmCustomer(pm, pi);
    this.paymentIntents.set(id, pi);
    if (confirm) return this.confirmPaymentIntent(id, offSession !== undefined ? { off_session: String(offSession) } : {}, req);
    return clone(pi);
  }

  private checkPmCustomer(pm: Obj, pi: Obj): void {
    if (pm['customer'] && pm['customer'] !== pi['customer']) {
      throw invalidRequest(
        pi['customer']
          ? 'The provided PaymentMethod is attached to another Customer.'
          : 'The provided PaymentMethod belongs to a Customer; pass that Customer as the customer parameter.',
        'customer',
      );
    }
  }

  retrievePaymentIntent(id: string, q: Params): Obj {
    return this.expand(this.get(this.paymentIntents, 'payment_intent', id), expandList(q));
  }

  updatePaymentIntent(id: string, p: Params): Obj {
    const pi = this.get(this.paymentIntents, 'payment_intent', id);
    checkKnown(p, ['amount', 'metadata', 'description', 'receipt_email', 'payment_method', 'customer', 'setup_future_usage']);
    if (['succeeded', 'canceled', 'processing'].includes(pi['status'])) {
      if (Object.keys(p).some((k) => k !== 'metadata' && k !== 'description' && k !== 'expand')) {
        throw unexpectedState('payment_intent', `This PaymentIntent's fields cannot be changed because it has a status of ${pi['status']}.`);
      }
    }
    const next = clone(pi);
    const amount = int(p, 'amount');
    if (amount !== undefined) {
      if (amount < MIN_AMOUNT) throw invalidRequest('Amount must be at least $0.50 usd', 'amount', 'amount_too_small');
      next['amount'] = amount;
    }
    next['metadata'] = mergeMetadata(pi['metadata'], p['metadata']);
    for (const k of ['description', 'receipt_email']) if (p[k] !== undefined) next[k] = str(p, k) ?? null;
    const cus = str(p, 'customer');
    if (cus) next['customer'] = this.get(this.customers, 'customer', cus, 'customer')['id'];
    const sfu = oneOf(p, 'setup_future_usage', ['off_session', 'on_session'] as const);
    if (sfu) next['setup_future_usage'] = sfu;
    const pmId = str(p, 'payment_method');
    if (pmId) {
      const pm = this.resolvePaymentMethod(pmId, 'payment_method');
      this.checkPmCustomer(pm, next);
      next['payment_method'] = pm['id'];
      if (next['status'] === 'requires_payment_method') next['status'] = 'requires_confirmation';
    }
    this.paymentIntents.set(id, next);
    return this.expand(next, expandList(p));
  }

  confirmPaymentIntent(id: string, p: Params, req: RequestInfo): Obj {
    const pi = this.get(this.paymentIntents, 'payment_intent', id);
    checkKnown(p, ['payment_method', 'off_session', 'return_url', 'setup_future_usage', 'error_on_requires_action', 'use_stripe_sdk', 'receipt_email', 'capture_method', 'mandate_data']);
    if (pi['status'] !== 'requires_payment_method' && pi['status'] !== 'requires_confirmation') {
      throw unexpectedState('payment_intent', `You cannot confirm this PaymentIntent because it has a status of ${pi['status']}.`);
    }
    bool(p, 'off_session');
    const sfu = oneOf(p, 'setup_future_usage', ['off_session', 'on_session'] as const);
    const pmId = str(p, 'payment_method') ?? pi['payment_method'];
    if (!pmId) {
      throw invalidRequest("You cannot confirm this PaymentIntent because it's missing a payment method.", 'payment_method', 'payment_intent_unexpected_state');
    }
    const pm = this.resolvePaymentMethod(pmId, 'payment_method');
    this.checkPmCustomer(pm, pi);
    if (sfu) pi['setup_future_usage'] = sfu;
    pi['payment_method'] = pm['id'];
    const card = this.pmCard.get(pm['id']);
    const failure = card?.onCharge ?? null;
    const charge = this.newCharge(pi, pm, card, failure);
    pi['latest_charge'] = charge['id'];
    if (failure) {
      pi['status'] = 'requires_payment_method';
      pi['payment_method'] = null;
      pi['last_payment_error'] = {
        type: 'card_error',
        charge: charge['id'],
        code: failure.code,
        decline_code: failure.decline_code,
        message: failure.message,
        payment_method: clone(pm),
      };
      this.emit('payment_intent.payment_failed', pi, req);
      throw this.cardError(failure, undefined, { charge: charge['id'], payment_intent: clone(pi), payment_method: clone(pm) });
    }
    pi['last_payment_error'] = null;
    if (pi['setup_future_usage'] && pi['customer'] && !pm['customer']) pm['customer'] = pi['customer'];
    if (pi['capture_method'] === 'manual') {
      pi['status'] = 'requires_capture';
      pi['amount_capturable'] = pi['amount'];
      this.emit('payment_intent.amount_capturable_updated', pi, req);
    } else {
      pi['status'] = 'succeeded';
      pi['amount_received'] = pi['amount'];
      this.emit('payment_intent.succeeded', pi, req);
    }
    return this.expand(pi, expandList(p));
  }

  private newCharge(pi: Obj, pm: Obj, card: TestCard | undefined, failure: CardFailure | null): Obj {
    const captured = !failure && pi['capture_method'] !== 'manual';
    const ch: Obj = {
      ...this.base('ch', 'charge'),
      amount: pi['amount'],
      amount_captured: captured ? pi['amount'] : 0,
      amount_refunded: 0,
      billing_details: clone(pm['billing_details']),
      captured,
      currency: pi['currency'],
      customer: pi['customer'],
      description: pi['description'],
      disputed: false,
      failure_code: failure?.code ?? null,
      failure_message: failure?.message ?? null,
      metadata: clone(pi['metadata']),
      outcome: failure
        ? { network_status: 'declined_by_network', reason: failure.decline_code ?? failure.code, risk_level: 'normal', seller_message: 'The bank did not return any further details with this decline.', type: 'issuer_declined' }
        : { network_status: 'approved_by_network', reason: null, risk_level: 'normal', seller_message: 'Payment complete.', type: 'authorized' },
      paid: !failure,
      payment_intent: pi['id'],
      payment_method: pm['id'],
      payment_method_details: {
        type: 'card',
        card: { brand: card?.brand ?? 'visa', last4: pm['card']?.last4, exp_month: pm['card']?.exp_month, exp_year: pm['card']?.exp_year, funding: card?.funding ?? 'credit', country: 'US' },
      },
      receipt_email: pi['receipt_email'],
      receipt_url: null,
      refunded: false,
      status: failure ? 'failed' : 'succeeded',
    };
    this.charges.set(ch['id'], ch);
    return ch;
  }

  capturePaymentIntent(id: string, p: Params, req: RequestInfo): Obj {
    const pi = this.get(this.paymentIntents, 'payment_intent', id);
    checkKnown(p, ['amount_to_capture', 'metadata', 'final_capture', 'statement_descriptor']);
    if (pi['status'] !== 'requires_capture') {
      throw unexpectedState('payment_intent', `This PaymentIntent could not be captured because it has a status of ${pi['status']}. Only a PaymentIntent with one of the following statuses may be captured: requires_capture.`);
    }
    const amount = int(p, 'amount_to_capture') ?? pi['amount_capturable'];
    if (amount < 1 || amount > pi['amount_capturable']) {
      throw invalidRequest(`The amount to capture must be between 1 and ${pi['amount_capturable']}.`, 'amount_to_capture');
    }
    pi['metadata'] = mergeMetadata(pi['metadata'], p['metadata']);
    const ch = this.charges.get(pi['latest_charge'])!;
    ch['captured'] = true;
    ch['amount_captured'] = amount;
    pi['amount_received'] = amount;
    pi['amount_capturable'] = 0;
    pi['status'] = 'succeeded';
    this.emit('payment_intent.succeeded', pi, req);
    return this.expand(pi, expandList(p));
  }

  cancelPaymentIntent(id: string, p: Params, req: RequestInfo): Obj {
    const pi = this.get(this.paymentIntents, 'payment_intent', id);
    checkKnown(p, ['cancellation_reason']);
    if (pi['status'] === 'succeeded' || pi['status'] === 'canceled') {
      throw unexpectedState('payment_intent', `You cannot cancel this PaymentIntent because it has a status of ${pi['status']}.`);
    }
    pi['status'] = 'canceled';
    pi['canceled_at'] = this.now();
    pi['cancellation_reason'] = oneOf(p, 'cancellation_reason', ['duplicate', 'fraudulent', 'requested_by_customer', 'abandoned'] as const) ?? null;
    pi['amount_capturable'] = 0;
    this.emit('payment_intent.canceled', pi, req);
    return clone(pi);
  }

  listPaymentIntents(q: Params): Obj {
    checkKnown(q, [...LIST_PARAMS, 'customer']);
    const cus = str(q, 'customer');
    return listOf([...this.paymentIntents.values()].reverse().filter((x) => !cus || x['customer'] === cus), q, '/v1/payment_intents');
  }

  retrieveCharge(id: string, q: Params): Obj {
    return this.expand(this.get(this.charges, 'charge', id), expandList(q));
  }

  listCharges(q: Params): Obj {
    checkKnown(q, [...LIST_PARAMS, 'customer', 'payment_intent']);
    const cus = str(q, 'customer');
    const pi = str(q, 'payment_intent');
    const data = [...this.charges.values()].reverse().filter((c) => (!cus || c['customer'] === cus) && (!pi || c['payment_intent'] === pi));
    return listOf(data, q, '/v1/charges');
  }

  // ---------- Refunds ----------

  createRefund(p: Params, req: RequestInfo): Obj {
    checkKnown(p, ['payment_intent', 'charge', 'amount', 'reason', 'metadata']);
    const piId = str(p, 'payment_intent');
    const chId = str(p, 'charge');
    if (!piId && !chId) throw missingParam('payment_intent');
    let ch: Obj | undefined;
    if (piId) {
      const pi = this.get(this.paymentIntents, 'payment_intent', piId, 'payment_intent');
      ch = pi['latest_charge'] ? this.charges.get(pi['latest_charge']) : undefined;
      if (!ch || pi['status'] !== 'succeeded') {
        throw invalidRequest(`This PaymentIntent (${piId}) does not have a successful charge to refund.`, 'payment_intent');
      }
    } else {
      ch = this.get(this.charges, 'charge', chId!, 'charge');
    }
    if (chId && ch['id'] !== chId) throw invalidRequest('The charge does not belong to that PaymentIntent.', 'charge');
    const remaining = ch['amount_captured'] - ch['amount_refunded'];
    if (ch['status'] !== 'succeeded' || !ch['captured']) throw invalidRequest(`Charge ${ch['id']} has not been captured and cannot be refunded.`, 'charge');
    if (remaining <= 0) throw invalidRequest(`Charge ${ch['id']} has already been refunded.`, undefined, 'charge_already_refunded');
    const amount = int(p, 'amount') ?? remaining;
    if (amount < 1) throw invalidParam('amount', 'Refund amount must be a positive integer.');
    if (amount > remaining) {
      const usd = (c: number) => `$${(c / 100).toFixed(2)}`;
      throw invalidRequest(`Refund amount (${usd(amount)}) is greater than unrefunded amount on charge (${usd(remaining)})`, 'amount', 'amount_too_large');
    }
    const reason = oneOf(p, 'reason', ['duplicate', 'fraudulent', 'requested_by_customer'] as const) ?? null;
    const metadata = mergeMetadata({}, p['metadata']);
    const re: Obj = {
      ...this.base('re', 'refund'),
      amount,
      balance_transaction: null,
      charge: ch['id'],
      currency: ch['currency'],
      metadata,
      payment_intent: ch['payment_intent'],
      reason,
      receipt_number: null,
      status: 'succeeded',
    };
    delete re['livemode'];
    this.refunds.set(re['id'], re);
    ch['amount_refunded'] += amount;
    ch['refunded'] = ch['amount_refunded'] >= ch['amount_captured'];
    this.emit('refund.created', re, req);
    this.emit('charge.refunded', ch, req);
    return clone(re);
  }

  retrieveRefund(id: string, q: Params): Obj {
    return this.expand(this.get(this.refunds, 'refund', id), expandList(q));
  }

  listRefunds(q: Params): Obj {
    checkKnown(q, [...LIST_PARAMS, 'payment_intent', 'charge']);
    const pi = str(q, 'payment_intent');
    const ch = str(q, 'charge');
    const data = [...this.refunds.values()].reverse().filter((r) => (!pi || r['payment_intent'] === pi) && (!ch || r['charge'] === ch));
    return listOf(data, q, '/v1/refunds');
  }

  // ---------- Checkout Sessions ----------

  createCheckoutSession(p: Params, req: RequestInfo): Obj {
    checkKnown(p, [
      'mode', 'success_url', 'cancel_url', 'line_items', 'customer', 'customer_email', 'client_reference_id', 'metadata',
      'payment_intent_data', 'setup_intent_data', 'payment_method_types', 'currency', 'expires_at', 'locale',
      'submit_type', 'customer_creation', 'billing_address_collection', 'allow_promotion_codes', 'ui_mode',
    ]);
    const mode = oneOf(p, 'mode', ['payment', 'setup', 'subscription'] as const);
    if (!mode) throw missingParam('mode');
    if (mode === 'subscription') throw invalidParam('mode', 'This test tool supports mode=payment and mode=setup only.');
    const successUrl = reqStr(p, 'success_url');
    for (const [k, v] of [['success_url', successUrl], ['cancel_url', str(p, 'cancel_url')]] as const) {
      if (v !== undefined && !/^https?:\/\/[^\s]+$/.test(v)) throw invalidParam(k, `Not a valid URL`, 'url_invalid');
    }
    const cusId = str(p, 'customer');
    if (cusId) this.get(this.customers, 'customer', cusId, 'customer');
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

    const lines: Obj[] = [];
    let currency = str(p, 'currency')?.toLowerCase() ?? null;
    const rawLines = list(p, 'line_items') ?? [];
    if (mode === 'payment' && rawLines.length === 0) throw missingParam('line_items');
    if (mode === 'setup' && rawLines.length > 0) throw invalidParam('line_items', 'line_items cannot be used in setup mode.');
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
          created: this.now(),
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
    const amountTotal = mode === 'payment' ? lines.reduce((s, l) => s + l['amount_total'], 0) : null;
    if (amountTotal !== null && amountTotal < MIN_AMOUNT) throw invalidRequest('The Checkout Session\'s total amount due must add up to at least $0.50 usd', 'line_items', 'amount_too_small');

    const id = `cs_test_${randomId(58)}`;
    let setupIntentId: string | null = null;
    if (mode === 'setup') {
      const si = this.createSetupIntent({ ...(cusId ? { customer: cusId } : {}), usage: 'off_session' }, req);
      const stored = this.setupIntents.get(si['id'])!;
      stored['metadata'] = siMetadata;
      setupIntentId = si['id'];
    }
    const now = this.now();
    const expiresAt = int(p, 'expires_at') ?? now + 24 * 3600;
    const s: Obj = {
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
      locale: str(p, 'locale') ?? null,
      metadata,
      mode,
      payment_intent: null,
      payment_method_types: ['card'],
      payment_status: mode === 'setup' ? 'no_payment_required' : 'unpaid',
      setup_intent: setupIntentId,
      status: 'open',
      submit_type: str(p, 'submit_type') ?? null,
      success_url: successUrl,
      ui_mode: 'hosted',
      url: `${req.publicUrl}/checkout/${id}`,
    };
    this.sessions.set(id, s);
    this.sessionLines.set(id, lines);
    this.sessionExtras.set(id, { piMetadata, sfu: sfu ?? null, capture: capture ?? 'automatic_async', description: str(piData, 'description', 'payment_intent_data[description]') ?? null });
    return this.expand(s, expandList(p));
  }

  private sessionExtras = new Map<string, { piMetadata: Record<string, string>; sfu: string | null; capture: string; description: string | null }>();

  retrieveCheckoutSession(id: string, q: Params): Obj {
    return this.expand(this.sessionNow(id), expandList(q));
  }

  /** The session, marked expired once its time has passed. */
  sessionNow(id: string): Obj {
    const s = this.get(this.sessions, 'checkout.session', id);
    if (s['status'] === 'open' && this.now() >= s['expires_at']) {
      s['status'] = 'expired';
      s['url'] = null;
    }
    return s;
  }

  listCheckoutSessions(q: Params): Obj {
    checkKnown(q, [...LIST_PARAMS, 'customer', 'payment_intent', 'status']);
    const pi = str(q, 'payment_intent');
    const data = [...this.sessions.values()].reverse().filter((s) => !pi || s['payment_intent'] === pi);
    return listOf(data, q, '/v1/checkout/sessions');
  }

  listCheckoutLineItems(id: string, q: Params): Obj {
    this.get(this.sessions, 'checkout.session', id);
    return listOf(this.sessionLines.get(id) ?? [], q, `/v1/checkout/sessions/${id}/line_items`);
  }

  expireCheckoutSession(id: string, req: RequestInfo): Obj {
    const s = this.sessionNow(id);
    if (s['status'] !== 'open') {
      throw unexpectedState('checkout_session', `Only Checkout Sessions with a status in ["open"] can be expired. This Checkout Session has a status of "${s['status']}".`);
    }
    s['status'] = 'expired';
    s['url'] = null;
    this.emit('checkout.session.expired', s, req);
    return clone(s);
  }

  /**
   * The hosted page's submit: pays (or saves the card) with typed test card
   * data. A decline throws a card error and leaves the session open.
   */
  completeCheckout(id: string, input: CardInput, req: RequestInfo): Obj {
    const s = this.sessionNow(id);
    if (s['status'] !== 'open') {
      throw unexpectedState('checkout_session', `This Checkout Session is ${s['status']}.`);
    }
    const pm = this.createPaymentMethodFromCard(input, s['customer_email'] ? { billing_details: { email: s['customer_email'] } } : {});
    if (s['mode'] === 'setup') {
      try {
        this.confirmSetupIntent(s['setup_intent'], { payment_method: pm['id'] }, req);
      } catch (e) {
        this.paymentMethods.delete(pm['id']);
        throw e;
      }
    } else {
      const extras = this.sessionExtras.get(id)!;
      let piId: string | null = s['payment_intent'];
      if (!piId) {
        const pi = this.createPaymentIntent(
          {
            amount: String(s['amount_total']),
            currency: s['currency'],
            ...(s['customer'] ? { customer: s['customer'] } : {}),
            ...(extras.sfu && s['customer'] ? { setup_future_usage: extras.sfu } : {}),
            ...(extras.description ? { description: extras.description } : {}),
            capture_method: extras.capture,
            metadata: extras.piMetadata,
          },
          req,
        );
        piId = pi['id'] as string;
        s['payment_intent'] = piId;
      }
      this.confirmPaymentIntent(piId, { payment_method: pm['id'] }, req);
      s['payment_status'] = this.paymentIntents.get(piId)!['status'] === 'succeeded' ? 'paid' : 'unpaid';
    }
    s['status'] = 'complete';
    s['url'] = null;
    this.emit('checkout.session.completed', s, req);
    return clone(s);
  }

  // ---------- Events ----------

  retrieveEvent(id: string): Obj {
    const e = this.events.find((x) => x.id === id);
    if (!e) throw noSuch('event', id);
    return clone(e);
  }

  listEvents(q: Params): Obj {
    checkKnown(q, [...LIST_PARAMS, 'type', 'types', 'delivery_success']);
    const type = str(q, 'type');
    const types = list(q, 'types')?.filter((t): t is string => typeof t === 'string');
    const match = (t: string) => {
      if (type) return type.endsWith('.*') ? t.startsWith(type.slice(0, -1)) : t === type;
      if (types) return types.includes(t);
      return true;
    };
    return listOf(this.events.filter((e) => match(e.type)), q, '/v1/events');
  }
}
