import { clone, listOf, LIST_PARAMS, newId, randomId, type Engine } from './engine';
import { invalidParam, invalidRequest } from './errors';
import { checkKnown, expandList, mergeMetadata, obj, str, type Params } from './params';
import { checkSave, resolvePaymentMethod } from './payment-methods';
import type { WireCustomer, WireDeletedCustomer, WireList } from './wire-types';

// Customers, and the default card on their invoice settings.

const TEXT_FIELDS = ['email', 'name', 'phone', 'description'] as const;

export function createCustomer(e: Engine, p: Params): WireCustomer {
  checkKnown(p, ['email', 'name', 'phone', 'description', 'metadata', 'payment_method', 'invoice_settings', 'address', 'preferred_locales']);
  const email = str(p, 'email');
  if (email !== undefined && !/^[^@\s]+@[^@\s]+$/.test(email)) throw invalidParam('email', `Invalid email address: ${email}`, 'email_invalid');
  const metadata = mergeMetadata({}, p['metadata']);
  const pmId = str(p, 'payment_method');
  const pm = pmId ? resolvePaymentMethod(e, pmId, 'payment_method') : undefined;
  if (pm) checkSave(e, pm);
  const c: WireCustomer = {
    id: newId('cus'),
    object: 'customer',
    created: e.now(),
    livemode: false,
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
  e.customers.set(c.id, c);
  if (pm) pm.customer = c.id;
  applyInvoiceSettings(e, c, p);
  return clone(c);
}

function applyInvoiceSettings(e: Engine, c: WireCustomer, p: Params): void {
  const inv = obj(p, 'invoice_settings');
  if (!inv) return;
  checkKnown(inv, ['default_payment_method', 'custom_fields', 'footer', 'rendering_options'], 'invoice_settings');
  const param = 'invoice_settings[default_payment_method]';
  const pmId = str(inv, 'default_payment_method', param);
  if (pmId === undefined) {
    if (inv['default_payment_method'] === '') c.invoice_settings.default_payment_method = null;
    return;
  }
  const pm = e.paymentMethods.get(pmId);
  if (!pm || pm.customer !== c.id) {
    throw invalidRequest(`The customer does not have a payment method with the ID ${pmId}. The payment method must be attached to the customer.`, param, 'resource_missing');
  }
  c.invoice_settings.default_payment_method = pmId;
}

export function retrieveCustomer(e: Engine, id: string, q: Params): WireCustomer {
  return e.expand(e.get(e.customers, 'customer', id), expandList(q));
}

export function updateCustomer(e: Engine, id: string, p: Params): WireCustomer {
  const c = e.get(e.customers, 'customer', id);
  checkKnown(p, ['email', 'name', 'phone', 'description', 'metadata', 'invoice_settings', 'address', 'preferred_locales']);
  const next = clone(c);
  for (const k of TEXT_FIELDS) {
    if (p[k] === '') next[k] = null;
    else if (p[k] !== undefined) next[k] = str(p, k) ?? null;
  }
  next.metadata = mergeMetadata(c.metadata, p['metadata']);
  applyInvoiceSettings(e, next, p);
  e.customers.set(id, next);
  return e.expand(next, expandList(p));
}

export function deleteCustomer(e: Engine, id: string): WireDeletedCustomer {
  e.get(e.customers, 'customer', id);
  e.customers.delete(id);
  for (const pm of e.paymentMethods.values()) if (pm.customer === id) pm.customer = null;
  return { id, object: 'customer', deleted: true };
}

export function listCustomers(e: Engine, q: Params): WireList<WireCustomer> {
  checkKnown(q, [...LIST_PARAMS, 'email', 'test_clock']);
  const email = str(q, 'email');
  const all = [...e.customers.values()].reverse().filter((c) => !email || c.email === email);
  return listOf(all, q, '/v1/customers');
}
