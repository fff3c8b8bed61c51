import { randomBytes } from 'node:crypto';
import type Stripe from 'stripe';
import type { TestCard } from './cards';
import { invalidParam, invalidRequest, noSuch } from './errors';
import { int, str, type Params } from './params';
import type {
  WireCharge,
  WireCheckoutSession,
  WireCustomer,
  WireEvent,
  WireLineItem,
  WireList,
  WireObject,
  WirePaymentIntent,
  WirePaymentMethod,
  WireRefund,
  WireSetupIntent,
} from './wire-types';

// The fake's state, in memory, and the plumbing every resource shares. The
// rules live one module per resource (customers.ts, payment-intents.ts, ...);
// every operation validates before it changes anything, so a refused request
// leaves no trace.

export const FAKE_API_VERSION = '2026-10-28.endive';
export const MIN_AMOUNT = 50; // Stripe's minimum charge in USD cents

export interface RequestInfo {
  requestId: string;
  idempotencyKey: string | null;
  apiVersion: string;
  publicUrl: string;
}

const ALPHABET = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789';
export function randomId(len = 24): string {
  const bytes = randomBytes(len);
  let out = '';
  for (let i = 0; i < len; i++) out += ALPHABET[bytes[i]! % ALPHABET.length];
  return out;
}

export const newId = (prefix: string) => `${prefix}_${randomId()}`;

export function clone<T>(v: T): T {
  return structuredClone(v);
}

export const LIST_PARAMS = ['limit', 'starting_after', 'ending_before', 'created'];

export function listOf<T extends { id: string }>(data: T[], p: Params, url: string): WireList<T> {
  const limit = int(p, 'limit') ?? 10;
  if (limit < 1 || limit > 100) throw invalidParam('limit', 'This value must be between 1 and 100.');
  let items = data;
  const after = str(p, 'starting_after');
  if (after) {
    const i = items.findIndex((x) => x.id === after);
    if (i < 0) throw noSuch('object', after, 'starting_after');
    items = items.slice(i + 1);
  }
  return { object: 'list', data: items.slice(0, limit).map(clone), has_more: items.length > limit, url };
}

/** What a Checkout Session passes on to the PaymentIntent it creates; never shown on the wire. */
export interface SessionExtras {
  piMetadata: Stripe.Metadata;
  sfu: 'off_session' | 'on_session' | null;
  capture: 'automatic' | 'automatic_async' | 'manual';
  description: string | null;
}

export class Engine {
  customers = new Map<string, WireCustomer>();
  paymentMethods = new Map<string, WirePaymentMethod>();
  setupIntents = new Map<string, WireSetupIntent>();
  paymentIntents = new Map<string, WirePaymentIntent>();
  charges = new Map<string, WireCharge>();
  refunds = new Map<string, WireRefund>();
  sessions = new Map<string, WireCheckoutSession>();
  /** Line items of each Checkout Session, kept apart as the API does. */
  sessionLines = new Map<string, WireLineItem[]>();
  sessionExtras = new Map<string, SessionExtras>();
  /** Newest first. */
  events: WireEvent[] = [];
  /** Which test card each PaymentMethod stands for (never shown on the wire). */
  pmCard = new Map<string, TestCard>();

  constructor(
    readonly clock: () => number,
    private readonly onEvent: (e: WireEvent) => void,
  ) {}

  reset(): void {
    for (const m of [this.customers, this.paymentMethods, this.setupIntents, this.paymentIntents, this.charges, this.refunds, this.sessions]) {
      m.clear();
    }
    this.sessionLines.clear();
    this.sessionExtras.clear();
    this.pmCard.clear();
    this.events = [];
  }

  /** Unix seconds, as every timestamp on the wire. */
  now(): number {
    return Math.floor(this.clock() / 1000);
  }

  emit(type: Stripe.Event.Type, object: WireObject, req: RequestInfo): void {
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

  get<T>(map: Map<string, T>, kind: string, id: string, param = 'id'): T {
    const o = map.get(id);
    if (!o) throw noSuch(kind, id, param);
    return o;
  }

  /** A copy of `o` with the named id fields replaced by the objects they point to. */
  expand<T extends { id: string; object: string }>(o: T, fields: string[]): T {
    const out = clone(o) as T & Record<string, unknown>;
    const fieldsOf = o as T & Record<string, unknown>;
    const sources: Record<string, Map<string, unknown>> = {
      customer: this.customers,
      payment_method: this.paymentMethods,
      payment_intent: this.paymentIntents,
      setup_intent: this.setupIntents,
      latest_charge: this.charges,
      charge: this.charges,
    };
    for (const f of fields) {
      if (f === 'line_items' && o.object === 'checkout.session') {
        const page: WireList<WireLineItem> = {
          object: 'list',
          data: clone(this.sessionLines.get(o.id) ?? []),
          has_more: false,
          url: `/v1/checkout/sessions/${o.id}/line_items`,
        };
        Object.assign(out, { line_items: page });
        continue;
      }
      const src = sources[f];
      if (!src || !(f in o)) throw invalidRequest(`This property cannot be expanded (${f}).`, 'expand');
      const id = fieldsOf[f];
      if (typeof id === 'string' && src.has(id)) Object.assign(out, { [f]: clone(src.get(id)) });
    }
    return out;
  }
}
