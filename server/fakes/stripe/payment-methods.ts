import { lookupCard, TEST_CARDS, TEST_PAYMENT_METHODS, TEST_TOKENS, type TestCard } from './cards';
import { clone, listOf, LIST_PARAMS, newId, type Engine } from './engine';
import { cardError, invalidParam, invalidRequest, missingParam, noSuch } from './errors';
import { checkKnown, int, mergeMetadata, obj, reqStr, str, type Params } from './params';
import type { WireBillingDetails, WireList, WirePaymentMethod } from './wire-types';

// PaymentMethods: cards only, each standing for one of the documented test cards.

export interface CardInput {
  number: string;
  expMonth: number;
  expYear: number;
  cvc?: string;
}

function newCardPaymentMethod(e: Engine, card: TestCard, expMonth: number, expYear: number, extra: Params = {}): WirePaymentMethod {
  const billing: WireBillingDetails = {
    address: { city: null, country: null, line1: null, line2: null, postal_code: null, state: null },
    email: null,
    name: null,
    phone: null,
    // As given: the endpoint takes billing details as they come, like the metadata below.
    ...((obj(extra, 'billing_details') ?? {}) as Partial<WireBillingDetails>),
  };
  const pm: WirePaymentMethod = {
    id: newId('pm'),
    object: 'payment_method',
    created: e.now(),
    livemode: false,
    allow_redisplay: 'unspecified',
    billing_details: billing,
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
  e.paymentMethods.set(pm.id, pm);
  e.pmCard.set(pm.id, card);
  return pm;
}

/** A card valid for three more years, for the test ids and tokens that stand for a card. */
function testCardPaymentMethod(e: Engine, number: string, extra: Params = {}): WirePaymentMethod {
  const card = TEST_CARDS.find((c) => c.number === number)!;
  return newCardPaymentMethod(e, card, 12, new Date(e.clock()).getUTCFullYear() + 3, extra);
}

/** A stored PaymentMethod, or a fresh one for a test id such as `pm_card_visa`. */
export function resolvePaymentMethod(e: Engine, id: string, param: string): WirePaymentMethod {
  const testNumber = TEST_PAYMENT_METHODS[id];
  if (testNumber) return testCardPaymentMethod(e, testNumber);
  return e.get(e.paymentMethods, 'PaymentMethod', id, param);
}

/** Validates typed card data; a bad number or date is a card error, as on a real card form. */
function cardFromInput(e: Engine, input: CardInput): TestCard {
  const found = lookupCard(input.number);
  if (!found.ok) throw cardError(found.failure, 'number');
  const { expMonth, expYear } = input;
  if (!Number.isInteger(expMonth) || expMonth < 1 || expMonth > 12) {
    throw cardError({ code: 'invalid_expiry_month', message: "Your card's expiration month is invalid." }, 'exp_month');
  }
  const now = new Date(e.clock());
  const year = expYear < 100 ? 2000 + expYear : expYear;
  if (year < now.getUTCFullYear() || (year === now.getUTCFullYear() && expMonth < now.getUTCMonth() + 1)) {
    throw cardError({ code: 'invalid_expiry_year', message: "Your card's expiration year is invalid." }, 'exp_year');
  }
  if (input.cvc !== undefined && !/^\d{3,4}$/.test(input.cvc)) {
    throw cardError({ code: 'invalid_cvc', message: "Your card's security code is invalid." }, 'cvc');
  }
  return found.card;
}

export function createPaymentMethodFromCard(e: Engine, input: CardInput, extra: Params = {}): WirePaymentMethod {
  const card = cardFromInput(e, input);
  const year = input.expYear < 100 ? 2000 + input.expYear : input.expYear;
  return newCardPaymentMethod(e, card, input.expMonth, year, extra);
}

export function createPaymentMethod(e: Engine, p: Params): WirePaymentMethod {
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
    return clone(testCardPaymentMethod(e, number, p));
  }
  const number = reqStr(card, 'number', 'card[number]');
  const expMonth = int(card, 'exp_month', 'card[exp_month]');
  const expYear = int(card, 'exp_year', 'card[exp_year]');
  if (expMonth === undefined) throw missingParam('card[exp_month]');
  if (expYear === undefined) throw missingParam('card[exp_year]');
  return clone(createPaymentMethodFromCard(e, { number, expMonth, expYear, cvc: str(card, 'cvc', 'card[cvc]') }, p));
}

export function retrievePaymentMethod(e: Engine, id: string): WirePaymentMethod {
  return clone(resolvePaymentMethod(e, id, 'id'));
}

/** Saving a card runs the card check; some test cards fail it. */
export function checkSave(e: Engine, pm: WirePaymentMethod): void {
  const card = e.pmCard.get(pm.id);
  if (card?.onSave) throw cardError(card.onSave, undefined, { payment_method: clone(pm) });
}

export function attachPaymentMethod(e: Engine, id: string, p: Params): WirePaymentMethod {
  checkKnown(p, ['customer']);
  const cusId = reqStr(p, 'customer');
  e.get(e.customers, 'customer', cusId, 'customer');
  const pm = resolvePaymentMethod(e, id, 'payment_method');
  if (pm.customer && pm.customer !== cusId) {
    throw invalidRequest('The payment method you provided has already been attached to a customer.', 'payment_method');
  }
  checkSave(e, pm);
  pm.customer = cusId;
  return clone(pm);
}

export function detachPaymentMethod(e: Engine, id: string): WirePaymentMethod {
  const pm = e.get(e.paymentMethods, 'PaymentMethod', id);
  if (!pm.customer) throw invalidRequest('The payment method you provided is not attached to a customer so detachment is impossible.', 'payment_method');
  pm.customer = null;
  return clone(pm);
}

export function listPaymentMethods(e: Engine, q: Params, customerId?: string): WireList<WirePaymentMethod> {
  checkKnown(q, [...LIST_PARAMS, 'customer', 'type', 'allow_redisplay']);
  const cus = customerId ?? str(q, 'customer');
  if (cus) e.get(e.customers, 'customer', cus, 'customer');
  const type = str(q, 'type');
  const data = [...e.paymentMethods.values()].reverse().filter((pm) => (cus ? pm.customer === cus : true) && (!type || pm.type === type));
  return listOf(data, q, customerId ? `/v1/customers/${customerId}/payment_methods` : '/v1/payment_methods');
}
