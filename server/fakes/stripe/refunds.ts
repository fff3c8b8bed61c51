import { formatMoney } from '../../../shared/money';
import { clone, listOf, LIST_PARAMS, newId, type Engine, type RequestInfo } from './engine';
import { invalidParam, invalidRequest, missingParam } from './errors';
import { checkKnown, expandList, int, mergeMetadata, oneOf, str, type Params } from './params';
import type { WireCharge, WireList, WireRefund } from './wire-types';

// Refunds of a captured charge, whole or in part, up to what is left on it.

const REFUND_REASONS = ['duplicate', 'fraudulent', 'requested_by_customer'] as const;

/** The charge a refund request points at, by PaymentIntent or by charge id. */
function chargeToRefund(e: Engine, piId: string | undefined, chId: string | undefined): WireCharge {
  if (!piId) return e.get(e.charges, 'charge', chId!, 'charge');
  const pi = e.get(e.paymentIntents, 'payment_intent', piId, 'payment_intent');
  const ch = pi.latest_charge ? e.charges.get(pi.latest_charge) : undefined;
  if (!ch || pi.status !== 'succeeded') {
    throw invalidRequest(`This PaymentIntent (${piId}) does not have a successful charge to refund.`, 'payment_intent');
  }
  return ch;
}

export function createRefund(e: Engine, p: Params, req: RequestInfo): WireRefund {
  checkKnown(p, ['payment_intent', 'charge', 'amount', 'reason', 'metadata']);
  const piId = str(p, 'payment_intent');
  const chId = str(p, 'charge');
  if (!piId && !chId) throw missingParam('payment_intent');
  const ch = chargeToRefund(e, piId, chId);
  if (chId && ch.id !== chId) throw invalidRequest('The charge does not belong to that PaymentIntent.', 'charge');
  const remaining = ch.amount_captured - ch.amount_refunded;
  if (ch.status !== 'succeeded' || !ch.captured) throw invalidRequest(`Charge ${ch.id} has not been captured and cannot be refunded.`, 'charge');
  if (remaining <= 0) throw invalidRequest(`Charge ${ch.id} has already been refunded.`, undefined, 'charge_already_refunded');
  const amount = int(p, 'amount') ?? remaining;
  if (amount < 1) throw invalidParam('amount', 'Refund amount must be a positive integer.');
  if (amount > remaining) {
    const money = (c: number) => formatMoney(c, ch.currency);
    throw invalidRequest(`Refund amount (${money(amount)}) is greater than unrefunded amount on charge (${money(remaining)})`, 'amount', 'amount_too_large');
  }
  const reason = oneOf(p, 'reason', REFUND_REASONS) ?? null;
  const metadata = mergeMetadata({}, p['metadata']);
  const re: WireRefund = {
    id: newId('re'),
    object: 'refund',
    created: e.now(),
    amount,
    balance_transaction: null,
    charge: ch.id,
    currency: ch.currency,
    metadata,
    payment_intent: ch.payment_intent,
    reason,
    receipt_number: null,
    status: 'succeeded',
  };
  e.refunds.set(re.id, re);
  ch.amount_refunded += amount;
  ch.refunded = ch.amount_refunded >= ch.amount_captured;
  e.emit('refund.created', re, req);
  e.emit('charge.refunded', ch, req);
  return clone(re);
}

export function retrieveRefund(e: Engine, id: string, q: Params): WireRefund {
  return e.expand(e.get(e.refunds, 'refund', id), expandList(q));
}

export function listRefunds(e: Engine, q: Params): WireList<WireRefund> {
  checkKnown(q, [...LIST_PARAMS, 'payment_intent', 'charge']);
  const pi = str(q, 'payment_intent');
  const ch = str(q, 'charge');
  const data = [...e.refunds.values()].reverse().filter((r) => (!pi || r.payment_intent === pi) && (!ch || r.charge === ch));
  return listOf(data, q, '/v1/refunds');
}
