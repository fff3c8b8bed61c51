import type { CardFailure, TestCard } from './cards';
import { clone, listOf, LIST_PARAMS, newId, type Engine } from './engine';
import { checkKnown, expandList, str, type Params } from './params';
import type { WireCharge, WireList, WirePaymentIntent, WirePaymentMethod } from './wire-types';

// Charges: one per confirmation attempt of a PaymentIntent, read-only on the API.

export function newCharge(e: Engine, pi: WirePaymentIntent, pm: WirePaymentMethod, card: TestCard | undefined, failure: CardFailure | null): WireCharge {
  const captured = !failure && pi.capture_method !== 'manual';
  const ch: WireCharge = {
    id: newId('ch'),
    object: 'charge',
    created: e.now(),
    livemode: false,
    amount: pi.amount,
    amount_captured: captured ? pi.amount : 0,
    amount_refunded: 0,
    billing_details: clone(pm.billing_details),
    captured,
    currency: pi.currency,
    customer: pi.customer,
    description: pi.description,
    disputed: false,
    failure_code: failure?.code ?? null,
    failure_message: failure?.message ?? null,
    metadata: clone(pi.metadata),
    outcome: failure
      ? {
          network_status: 'declined_by_network',
          reason: failure.decline_code ?? failure.code,
          risk_level: 'normal',
          seller_message: 'The bank did not return any further details with this decline.',
          type: 'issuer_declined',
        }
      : { network_status: 'approved_by_network', reason: null, risk_level: 'normal', seller_message: 'Payment complete.', type: 'authorized' },
    paid: !failure,
    payment_intent: pi.id,
    payment_method: pm.id,
    payment_method_details: {
      type: 'card',
      card: { brand: card?.brand ?? 'visa', last4: pm.card.last4, exp_month: pm.card.exp_month, exp_year: pm.card.exp_year, funding: card?.funding ?? 'credit', country: 'US' },
    },
    receipt_email: pi.receipt_email,
    receipt_url: null,
    refunded: false,
    status: failure ? 'failed' : 'succeeded',
  };
  e.charges.set(ch.id, ch);
  return ch;
}

export function retrieveCharge(e: Engine, id: string, q: Params): WireCharge {
  return e.expand(e.get(e.charges, 'charge', id), expandList(q));
}

export function listCharges(e: Engine, q: Params): WireList<WireCharge> {
  checkKnown(q, [...LIST_PARAMS, 'customer', 'payment_intent']);
  const cus = str(q, 'customer');
  const pi = str(q, 'payment_intent');
  const data = [...e.charges.values()].reverse().filter((c) => (!cus || c.customer === cus) && (!pi || c.payment_intent === pi));
  return listOf(data, q, '/v1/charges');
}
