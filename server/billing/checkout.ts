import { and, eq } from 'drizzle-orm';
import Stripe from 'stripe';
import type { AppDeps } from '../deps';
import { agreements, billingAccounts, customers, invoices, payments } from '../db/schema';
import { AppError, conflict, notFound } from '../http/errors';
import { paymentErrorMessage } from '../integrations/stripe';
import { recordHistory, saveCardOnAgreement } from '../agreements/terms';

import { lockInvoice, settleInvoice } from './invoices';
import { queueReceipt } from './receipts';

// Card payments: the processor's customer, Checkout pages, and recording what the processor reports.

/** Processor outages and refusals become clear API errors; card declines are handled by the caller. */
export function providerError(e: unknown): unknown {
  if (e instanceof Stripe.errors.StripeCardError) return new AppError(402, 'card_declined', paymentErrorMessage(e));
  if (e instanceof Stripe.errors.StripeIdempotencyError)
    return new AppError(409, 'payment_conflict', 'This payment was already started with other details. Please reload and try again.');
  if (e instanceof Stripe.errors.StripeInvalidRequestError) return new AppError(409, 'payment_refused', e.message);
  if (e instanceof Stripe.errors.StripeError) return paymentsUnavailable();
  return e;
}

/** The processor's port closed, timing out or answering 5xx: one clear answer, with Retry-After. */
export const paymentsUnavailable = () =>
  new AppError(503, 'payments_unavailable', 'Payments are unavailable right now. Nothing was charged or recorded; please try again in a few minutes.');

/**
 * Before a write that only makes sense with a payment page after it (an enrollment, a renewal
 * invoice), ask the processor once, so an outage refuses the request with nothing recorded.
 */
export async function assertPaymentsReachable(deps: Pick<AppDeps, 'database' | 'stripe'>, customerId: string): Promise<void> {
  try {
    const id = await ensureStripeCustomer(deps, customerId);
    await deps.stripe.customers.retrieve(id);
  } catch (e) {
    throw providerError(e);
  }
}

// ---------- Processor customer ----------

export async function ensureStripeCustomer(deps: Pick<AppDeps, 'database' | 'stripe'>, customerId: string): Promise<string> {
  const { db } = deps.database;
  const [existing] = await db.select().from(billingAccounts).where(eq(billingAccounts.customerId, customerId));
  if (existing) return existing.stripeCustomerId;
  const [c] = await db.select().from(customers).where(eq(customers.id, customerId));
  if (!c) throw notFound('That household');
  const created = await deps.stripe.customers.create(
    { name: c.name, ...(c.email ? { email: c.email } : {}), metadata: { customerId } },
    { idempotencyKey: `seasonwell-customer-${customerId}` },
  );
  await db.insert(billingAccounts).values({ customerId, stripeCustomerId: created.id }).onConflictDoNothing();
  const [row] = await db.select().from(billingAccounts).where(eq(billingAccounts.customerId, customerId));
  return row!.stripeCustomerId;
}

// ---------- Card payments through Checkout ----------

export interface CheckoutOptions {
  /** A portal path to come back to, e.g. /portal/plan (or with `onDevice`, the visit's screen). */
  returnPath: string;
  /** Paid on the technician's device: the page returns to the visit, /field/visits/:id. */
  onDevice?: boolean;
  /** Keep the card for automatic renewal charges. */
  saveCard?: boolean;
}

function returnUrls(deps: Pick<AppDeps, 'config'>, returnPath: string, onDevice = false) {
  const allowed = onDevice ? /^\/field\/visits\/[0-9a-f-]{36}$/ : /^\/portal(\/[A-Za-z0-9/_-]*)?$/;
  if (!allowed.test(returnPath)) {
    throw new AppError(422, 'validation_failed', 'The return page is not valid.', { returnPath: onDevice ? 'Must be a visit.' : 'Must be a portal page.' });
  }
  const base = deps.config.publicUrl.replace(/\/$/, '');
  return {
    success_url: `${base}${returnPath}?checkout={CHECKOUT_SESSION_ID}`,
    cancel_url: `${base}${returnPath}?checkout=canceled`,
  };
}

/**
 * A Checkout page for what is still owed. A second click (or a second tab) while a page is
 * open gets the same page, so one invoice never has two live payment pages at once.
 */
export async function startInvoiceCheckout(deps: Pick<AppDeps, 'config' | 'database' | 'stripe'>, invoiceId: string, opts: CheckoutOptions): Promise<{ checkoutUrl: string }> {
  try {
    return await openCheckout(deps, invoiceId, opts);
  } catch (e) {
    throw providerError(e);
  }
}

async function openCheckout(deps: Pick<AppDeps, 'config' | 'database' | 'stripe'>, invoiceId: string, opts: CheckoutOptions): Promise<{ checkoutUrl: string }> {
  const stripe = deps.stripe;
  const urls = returnUrls(deps, opts.returnPath, opts.onDevice);
  const { db } = deps.database;
  const [pre] = await db.select().from(invoices).where(eq(invoices.id, invoiceId));
  if (!pre) throw notFound('That invoice');
  const stripeCustomer = await ensureStripeCustomer(deps, pre.customerId);

  return db.transaction(async (tx) => {
    const inv = await lockInvoice(tx, invoiceId);
    if (inv.status !== 'open') throw conflict(inv.status === 'paid' ? 'This invoice is already paid.' : 'This invoice is not open for payment.');
    const due = inv.totalCents - inv.paidCents;
    if (due < 50) throw conflict('Nothing is left to pay on this invoice.');
    const attempts = await tx
      .select()
      .from(payments)
      .where(and(eq(payments.invoiceId, invoiceId), eq(payments.method, 'card')));
    const pending = attempts.find((p) => p.status === 'pending' && p.stripeCheckoutSessionId && p.amountCents === due);
    if (pending?.stripeCheckoutSessionId) {
      const s = await stripe.checkout.sessions.retrieve(pending.stripeCheckoutSessionId);
      if (s.status === 'open' && s.url) return { checkoutUrl: s.url };
      if (s.status === 'complete') throw conflict('This payment is being recorded. Please refresh in a moment.');
      await tx.update(payments).set({ status: 'canceled' }).where(eq(payments.id, pending.id));
    }
    const [payment] = await tx.insert(payments).values({ invoiceId, method: 'card', status: 'pending', amountCents: due }).returning({ id: payments.id });
    const metadata = { invoiceId, paymentId: payment!.id, ...(opts.saveCard && inv.agreementId ? { saveCard: 'true' } : {}) };
    const session = await stripe.checkout.sessions.create(
      {
        mode: 'payment',
        customer: stripeCustomer,
        client_reference_id: invoiceId,
        line_items: [
          {
            quantity: 1,
            price_data: { currency: 'usd', unit_amount: due, product_data: { name: `Invoice ${inv.number}` } },
          },
        ],
        metadata,
        payment_intent_data: {
          metadata,
          description: `Invoice ${inv.number}`,
          ...(opts.saveCard && inv.agreementId ? { setup_future_usage: 'off_session' as const } : {}),
        },
        ...urls,
      },
      // One key per attempt: a retried request (SDK retry, double click) finds the same session.
      { idempotencyKey: `seasonwell-checkout-${invoiceId}-${attempts.length + 1}-${due}` },
    );
    await tx.update(payments).set({ stripeCheckoutSessionId: session.id, checkoutUrl: session.url }).where(eq(payments.id, payment!.id));
    if (!session.url) throw new AppError(502, 'checkout_failed', 'The payment page could not be opened. Please try again.');
    return { checkoutUrl: session.url };
  });
}

interface CardPayment {
  invoiceId: string;
  paymentIntentId: string;
  amountCents: number;
  paymentId?: string | null;
  checkoutSessionId?: string | null;
  card?: { paymentMethodId: string; brand: string; last4: string } | null;
  saveCard?: boolean;
  source?: string;
}

/**
 * Records a succeeded card payment, once. Called only with a PaymentIntent read back from the
 * processor (webhook or direct retrieve), never from the browser's redirect. Idempotent by the
 * PaymentIntent id; the invoice row lock orders concurrent calls.
 */
export async function recordCardPayment(
  deps: Pick<AppDeps, 'database' | 'clock' | 'logger' | 'jobs' | 'stripe'>,
  p: CardPayment,
): Promise<{ recorded: boolean; paymentId: string }> {
  const { db } = deps.database;
  const now = deps.clock();
  const result = await db.transaction(async (tx) => {
    const inv = await lockInvoice(tx, p.invoiceId);
    const [already] = await tx.select().from(payments).where(eq(payments.stripePaymentIntentId, p.paymentIntentId));
    if (already?.status === 'succeeded') return { recorded: false, paymentId: already.id, paid: false };
    const reference = p.card ? `${p.card.brand} ending ${p.card.last4}` : 'Card';
    let paymentId: string;
    const candidate =
      already ??
      (p.paymentId
        ? (
            await tx
              .select()
              .from(payments)
              .where(and(eq(payments.id, p.paymentId), eq(payments.invoiceId, p.invoiceId)))
          )[0]
        : undefined) ??
      (p.checkoutSessionId ? (await tx.select().from(payments).where(eq(payments.stripeCheckoutSessionId, p.checkoutSessionId)))[0] : undefined);
    if (candidate && candidate.status !== 'succeeded') {
      await tx
        .update(payments)
        .set({ status: 'succeeded', stripePaymentIntentId: p.paymentIntentId, amountCents: p.amountCents, reference, succeededAt: now, failureMessage: null })
        .where(eq(payments.id, candidate.id));
      paymentId = candidate.id;
    } else {
      const [row] = await tx
        .insert(payments)
        .values({
          invoiceId: p.invoiceId,
          method: 'card',
          status: 'succeeded',
          amountCents: p.amountCents,
          stripePaymentIntentId: p.paymentIntentId,
          stripeCheckoutSessionId: candidate ? null : (p.checkoutSessionId ?? null),
          reference,
          succeededAt: now,
        })
        .returning({ id: payments.id });
      paymentId = row!.id;
    }
    const paid = await settleInvoice(tx, inv, p.amountCents, now, p.source ?? 'card', null);
    if (p.saveCard && p.card && inv.agreementId) {
      await saveCardOnAgreement(tx, inv.agreementId, p.card, { autoRenew: true });
    }
    return { recorded: true, paymentId, paid };
  });
  if (result.paid) await closeOpenCheckouts(deps, p.invoiceId);
  if (result.recorded) await queueReceipt(deps, result.paymentId);
  return { recorded: result.recorded, paymentId: result.paymentId };
}

/**
 * Once an invoice is paid, any payment page still open for it is closed at the processor, so
 * nobody pays twice (for example a renewal charged automatically while a Checkout tab was open).
 */
export async function closeOpenCheckouts(deps: Pick<AppDeps, 'database' | 'stripe'>, invoiceId: string): Promise<void> {
  const { stripe } = deps;
  const open = await deps.database.db
    .select()
    .from(payments)
    .where(and(eq(payments.invoiceId, invoiceId), eq(payments.status, 'pending')));
  for (const p of open) {
    if (p.stripeCheckoutSessionId) {
      await stripe.checkout.sessions.expire(p.stripeCheckoutSessionId).catch(() => undefined);
    }
    await deps.database.db
      .update(payments)
      .set({ status: 'canceled' })
      .where(and(eq(payments.id, p.id), eq(payments.status, 'pending')));
  }
}

/** Reads a Checkout Session back from the processor and records what it says. */
export async function syncCheckoutSession(
  deps: Pick<AppDeps, 'database' | 'clock' | 'logger' | 'jobs' | 'stripe'>,
  sessionId: string,
): Promise<{ state: 'paid' | 'open' | 'expired' | 'saved' | 'unknown'; invoiceId: string | null }> {
  const stripe = deps.stripe;
  let s: Stripe.Checkout.Session;
  try {
    s = await stripe.checkout.sessions.retrieve(sessionId);
  } catch (e) {
    if (e instanceof Stripe.errors.StripeInvalidRequestError && e.statusCode === 404) throw notFound('That payment');
    throw e;
  }
  const invoiceId = s.metadata?.['invoiceId'] ?? null;
  if (s.mode === 'setup') {
    const agreementId = s.metadata?.['agreementId'];
    const siId = typeof s.setup_intent === 'string' ? s.setup_intent : s.setup_intent?.id;
    const si = siId ? await stripe.setupIntents.retrieve(siId, { expand: ['payment_method'] }) : null;
    if (agreementId && si && si.status === 'succeeded') {
      await saveAgreementCard(deps, agreementId, si.payment_method as Stripe.PaymentMethod, s.metadata?.['enableAutoRenew'] === 'true');
      return { state: 'saved', invoiceId: null };
    }
    return { state: s.status === 'expired' ? 'expired' : 'open', invoiceId: null };
  }
  if (!invoiceId) return { state: 'unknown', invoiceId: null };
  const piId = typeof s.payment_intent === 'string' ? s.payment_intent : s.payment_intent?.id;
  // One level of expansion per call: the card on the PaymentIntent gives the receipt its last four.
  const pi = piId ? await stripe.paymentIntents.retrieve(piId, { expand: ['payment_method'] }) : null;
  if (s.status === 'complete' && pi && pi.status === 'succeeded') {
    await recordFromPaymentIntent(deps, pi, s.id);
    return { state: 'paid', invoiceId };
  }
  return { state: s.status === 'expired' ? 'expired' : 'open', invoiceId };
}

export async function syncPaymentIntent(deps: Pick<AppDeps, 'database' | 'clock' | 'logger' | 'jobs' | 'stripe'>, paymentIntentId: string): Promise<void> {
  const pi = await deps.stripe.paymentIntents.retrieve(paymentIntentId, { expand: ['payment_method'] });
  if (pi.status === 'succeeded' && pi.metadata?.['invoiceId']) await recordFromPaymentIntent(deps, pi, null);
}

export async function recordFromPaymentIntent(
  deps: Pick<AppDeps, 'database' | 'clock' | 'logger' | 'jobs' | 'stripe'>,
  pi: Stripe.PaymentIntent,
  sessionId: string | null,
  source = 'card',
) {
  const invoiceId = pi.metadata?.['invoiceId'];
  if (!invoiceId) return null;
  const pm = pi.payment_method && typeof pi.payment_method === 'object' ? pi.payment_method : null;
  return recordCardPayment(deps, {
    invoiceId,
    paymentIntentId: pi.id,
    amountCents: pi.amount_received,
    paymentId: pi.metadata?.['paymentId'] ?? null,
    checkoutSessionId: sessionId,
    card: pm?.card ? { paymentMethodId: pm.id, brand: pm.card.brand, last4: pm.card.last4 } : null,
    saveCard: pi.metadata?.['saveCard'] === 'true',
    source,
  });
}

export async function saveAgreementCard(deps: Pick<AppDeps, 'database' | 'stripe'>, agreementId: string, pm: Stripe.PaymentMethod | string | null, enableAutoRenew: boolean) {
  const method = typeof pm === 'string' ? await deps.stripe.paymentMethods.retrieve(pm) : pm;
  if (!method?.card) return;
  await deps.database.db.transaction(async (tx) => {
    const [a] = await tx.select().from(agreements).where(eq(agreements.id, agreementId)).for('update');
    if (!a || a.stripePaymentMethodId === method.id) return;
    await saveCardOnAgreement(tx, agreementId, { paymentMethodId: method.id, brand: method.card!.brand, last4: method.card!.last4 }, { autoRenew: enableAutoRenew });
    await recordHistory(tx, { agreementId, event: 'card_saved', note: `${method.card!.brand} ending ${method.card!.last4}${enableAutoRenew ? '; automatic renewal on' : ''}` });
  });
}
