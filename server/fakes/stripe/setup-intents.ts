import { clone, newId, randomId, type Engine, type RequestInfo } from './engine';
import { cardError, invalidRequest, unexpectedState } from './errors';
import { bool, checkKnown, expandList, mergeMetadata, oneOf, str, type Params } from './params';
import { resolvePaymentMethod } from './payment-methods';
import type { WireSetupIntent } from './wire-types';

// SetupIntents: saving a card for later charges; the test card decides whether the save succeeds.

export function createSetupIntent(e: Engine, p: Params, req: RequestInfo): WireSetupIntent {
  checkKnown(p, ['customer', 'payment_method', 'confirm', 'usage', 'metadata', 'description', 'payment_method_types', 'automatic_payment_methods', 'return_url', 'use_stripe_sdk']);
  const cusId = str(p, 'customer');
  if (cusId) e.get(e.customers, 'customer', cusId, 'customer');
  const usage = oneOf(p, 'usage', ['off_session', 'on_session'] as const) ?? 'off_session';
  const metadata = mergeMetadata({}, p['metadata']);
  const confirm = bool(p, 'confirm') ?? false;
  const pmId = str(p, 'payment_method');
  const pm = pmId ? resolvePaymentMethod(e, pmId, 'payment_method') : undefined;
  const id = newId('seti');
  const si: WireSetupIntent = {
    id,
    object: 'setup_intent',
    application: null,
    automatic_payment_methods: null,
    cancellation_reason: null,
    client_secret: `${id}_secret_${randomId()}`,
    created: e.now(),
    customer: cusId ?? null,
    description: str(p, 'description') ?? null,
    last_setup_error: null,
    latest_attempt: null,
    livemode: false,
    metadata,
    next_action: null,
    payment_method: pm ? pm.id : null,
    payment_method_types: ['card'],
    status: pm ? 'requires_confirmation' : 'requires_payment_method',
    usage,
  };
  e.setupIntents.set(id, si);
  if (confirm) return confirmSetupIntent(e, id, {}, req);
  return clone(si);
}

export function retrieveSetupIntent(e: Engine, id: string, q: Params): WireSetupIntent {
  return e.expand(e.get(e.setupIntents, 'setup_intent', id), expandList(q));
}

export function confirmSetupIntent(e: Engine, id: string, p: Params, req: RequestInfo): WireSetupIntent {
  const si = e.get(e.setupIntents, 'setup_intent', id);
  checkKnown(p, ['payment_method', 'return_url', 'use_stripe_sdk', 'mandate_data']);
  if (si.status !== 'requires_payment_method' && si.status !== 'requires_confirmation') {
    throw unexpectedState('setup_intent', `You cannot confirm this SetupIntent because it has a status of ${si.status}.`);
  }
  const pmId = str(p, 'payment_method') ?? si.payment_method;
  if (!pmId) throw invalidRequest("You cannot confirm this SetupIntent because it's missing a payment method.", 'payment_method', 'setup_intent_unexpected_state');
  const pm = resolvePaymentMethod(e, pmId, 'payment_method');
  if (pm.customer && si.customer && pm.customer !== si.customer) {
    throw invalidRequest('The payment method you provided has already been attached to a customer.', 'payment_method');
  }
  si.payment_method = pm.id;
  const card = e.pmCard.get(pm.id);
  if (card?.onSave) {
    si.status = 'requires_payment_method';
    si.last_setup_error = { type: 'card_error', code: card.onSave.code, decline_code: card.onSave.decline_code, message: card.onSave.message, payment_method: clone(pm) };
    si.payment_method = null;
    e.emit('setup_intent.setup_failed', si, req);
    throw cardError(card.onSave, undefined, { setup_intent: clone(si), payment_method: clone(pm) });
  }
  si.status = 'succeeded';
  si.last_setup_error = null;
  if (si.customer) pm.customer = si.customer;
  e.emit('setup_intent.succeeded', si, req);
  return e.expand(si, expandList(p));
}

export function cancelSetupIntent(e: Engine, id: string, p: Params): WireSetupIntent {
  const si = e.get(e.setupIntents, 'setup_intent', id);
  checkKnown(p, ['cancellation_reason']);
  if (si.status === 'succeeded' || si.status === 'canceled') {
    throw unexpectedState('setup_intent', `You cannot cancel this SetupIntent because it has a status of ${si.status}.`);
  }
  const reason = str(p, 'cancellation_reason') ?? null;
  si.status = 'canceled';
  si.cancellation_reason = reason;
  return clone(si);
}
