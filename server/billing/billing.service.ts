import { and, desc, eq, ilike, inArray, or, sql, type SQL } from 'drizzle-orm';
import Stripe from 'stripe';
import { invoiceTotals, MoneyError, type InvoiceLine } from '../../shared/money';
import type {
  CreateInvoiceInput,
  InvoicePurpose,
  InvoiceStatus,
  InvoiceSummary,
  InvoiceView,
  OfflinePaymentInput,
  RefundInput,
} from '../../shared/schemas/billing';
import type { SessionUser } from '../../shared/schemas/session';
import type { AppDeps } from '../deps';
import { assertCustomerAccess, isStaffOffice } from '../auth/access';
import type { Db, Tx } from '../db/client';
import { agreements, billingAccounts, customers, invoiceCounters, invoiceLines, invoices, payments, planVersions, refunds } from '../db/schema';
import { AppError, conflict, notFound } from '../http/errors';
import { paymentErrorMessage } from '../integrations/stripe';
import { applyPaidAgreementInvoice, recordHistory } from '../agreements/terms';
import { companyRow, localDate } from '../company/company';

type InvoiceRow = typeof invoices.$inferSelect;
type PaymentRow = typeof payments.$inferSelect;

export const RECEIPT_JOB = 'billing-receipt';

/** Processor outages and refusals become clear API errors; card declines are handled by the caller. */
export function providerError(e: unknown): unknown {
  if (e instanceof Stripe.errors.StripeCardError) return new AppError(402, 'card_declined', paymentErrorMessage(e));
  if (e instanceof Stripe.errors.StripeIdempotencyError) return new AppError(409, 'payment_conflict', 'This payment was already started with other details. Please reload and try again.');
  if (e instanceof Stripe.errors.StripeInvalidRequestError) return new AppError(409, 'payment_refused', e.message);
  if (e instanceof Stripe.errors.StripeError) return new AppError(502, 'payment_provider_unavailable', 'The card processor is not answering. Nothing was recorded; please try again shortly.');
  return e;
}

// ---------- Invoice numbers and creation ----------

/** The next number, taken inside the caller's transaction: a rollback returns it, so there are no gaps. */
export async function nextInvoiceNumber(tx: Tx): Promise<number> {
  await tx.insert(invoiceCounters).values({ companyId: 1 }).onConflictDoNothing();
  const [row] = await tx
    .update(invoiceCounters)
    .set({ nextNumber: sql`${invoiceCounters.nextNumber} + 1` })
    .where(eq(invoiceCounters.companyId, 1))
    .returning({ taken: sql<number>`${invoiceCounters.nextNumber} - 1` });
  return Number(row!.taken);
}

export interface NewInvoice {
  customerId: string;
  agreementId?: string | null;
  purpose: InvoicePurpose;
  planVersionId?: string | null;
  termStartsOn?: string | null;
  lines: InvoiceLine[];
  discountBps?: number;
  notes?: string;
  issue: boolean;
}

/** Writes an invoice and its lines; totals come from the shared money rules, tax from settings. */
export async function insertInvoice(tx: Tx, input: NewInvoice, now: Date): Promise<InvoiceRow> {
  const settings = await companyRow(tx);
  let totals;
  try {
    totals = invoiceTotals({ lines: input.lines, discountBps: input.discountBps ?? 0, taxRateBps: settings.taxRateBps });
  } catch (e) {
    if (e instanceof MoneyError) throw new AppError(422, 'validation_failed', e.message, { [e.field]: e.message });
    throw e;
  }
  const number = input.issue ? await nextInvoiceNumber(tx) : null;
  const [invoice] = await tx
    .insert(invoices)
    .values({
      number,
      customerId: input.customerId,
      agreementId: input.agreementId ?? null,
      purpose: input.purpose,
      status: input.issue ? 'open' : 'draft',
      planVersionId: input.planVersionId ?? null,
      termStartsOn: input.termStartsOn ?? null,
      discountBps: input.discountBps ?? 0,
      taxRateBps: settings.taxRateBps,
      subtotalCents: totals.subtotalCents,
      discountCents: totals.discountCents,
      taxCents: totals.taxCents,
      totalCents: totals.totalCents,
      notes: input.notes ?? '',
      issuedAt: input.issue ? now : null,
    })
    .returning();
  await tx.insert(invoiceLines).values(
    totals.lines.map((l, i) => ({
      invoiceId: invoice!.id,
      position: i + 1,
      description: l.description,
      kind: l.kind,
      quantity: l.quantity,
      unitCents: l.unitCents,
      taxable: l.taxable,
      grossCents: l.grossCents,
      discountCents: l.discountCents,
      netCents: l.netCents,
    })),
  );
  return invoice!;
}

/** The repair discount of the household's agreement in force, if any. */
async function householdDiscountBps(tx: Tx, customerId: string): Promise<number> {
  const rows = await tx
    .select({ bps: planVersions.repairDiscountBps })
    .from(agreements)
    .innerJoin(planVersions, eq(agreements.planVersionId, planVersions.id))
    .where(and(eq(agreements.customerId, customerId), inArray(agreements.status, ['active', 'renewal_due'])));
  return rows.reduce((m, r) => Math.max(m, r.bps), 0);
}

export async function createServiceInvoice(deps: Pick<AppDeps, 'database' | 'clock'>, input: CreateInvoiceInput): Promise<InvoiceView> {
  const { db } = deps.database;
  const id = await db.transaction(async (tx) => {
    const [customer] = await tx.select({ id: customers.id }).from(customers).where(eq(customers.id, input.customerId));
    if (!customer) throw new AppError(422, 'validation_failed', 'That household was not found.', { customerId: 'That household was not found.' });
    const discountBps = await householdDiscountBps(tx, input.customerId);
    const inv = await insertInvoice(tx, { customerId: input.customerId, purpose: 'service', lines: input.lines, discountBps, notes: input.notes, issue: input.issue }, deps.clock());
    return inv.id;
  });
  return invoiceView(db, id);
}

export async function issueInvoice(deps: Pick<AppDeps, 'database' | 'clock'>, id: string): Promise<InvoiceView> {
  const { db } = deps.database;
  await db.transaction(async (tx) => {
    const inv = await lockInvoice(tx, id);
    if (inv.status !== 'draft') throw conflict('Only a draft invoice can be issued.');
    const number = await nextInvoiceNumber(tx);
    await tx.update(invoices).set({ status: 'open', number, issuedAt: deps.clock() }).where(eq(invoices.id, id));
  });
  return invoiceView(db, id);
}

export async function voidInvoice(deps: Pick<AppDeps, 'database' | 'clock'>, id: string): Promise<InvoiceView> {
  const { db } = deps.database;
  await db.transaction(async (tx) => {
    const inv = await lockInvoice(tx, id);
    if (inv.status !== 'open' && inv.status !== 'draft') throw conflict('Only an open or draft invoice can be voided.');
    if (inv.paidCents > 0) throw conflict('This invoice has payments; refund them instead of voiding.');
    // The number stays on the voided invoice, so the sequence keeps no gaps.
    await tx.update(invoices).set({ status: 'void', voidedAt: deps.clock() }).where(eq(invoices.id, id));
    await tx.update(payments).set({ status: 'canceled' }).where(and(eq(payments.invoiceId, id), eq(payments.status, 'pending')));
  });
  return invoiceView(db, id);
}

export async function lockInvoice(tx: Tx, id: string): Promise<InvoiceRow> {
  const [row] = await tx.select().from(invoices).where(eq(invoices.id, id)).for('update');
  if (!row) throw notFound('That invoice');
  return row;
}

// ---------- Reading ----------

const iso = (d: Date | null) => (d ? d.toISOString() : null);

export async function invoiceView(db: Db | Tx, id: string): Promise<InvoiceView> {
  const [row] = await db
    .select({ invoice: invoices, customerName: customers.name })
    .from(invoices)
    .innerJoin(customers, eq(invoices.customerId, customers.id))
    .where(eq(invoices.id, id));
  if (!row) throw notFound('That invoice');
  const lines = await db.select().from(invoiceLines).where(eq(invoiceLines.invoiceId, id)).orderBy(invoiceLines.position);
  const pays = await db.select().from(payments).where(eq(payments.invoiceId, id)).orderBy(payments.createdAt);
  const inv = row.invoice;
  return {
    id: inv.id,
    number: inv.number,
    customerId: inv.customerId,
    customerName: row.customerName,
    agreementId: inv.agreementId,
    purpose: inv.purpose,
    status: inv.status,
    discountBps: inv.discountBps,
    taxRateBps: inv.taxRateBps,
    subtotalCents: inv.subtotalCents,
    discountCents: inv.discountCents,
    taxCents: inv.taxCents,
    totalCents: inv.totalCents,
    paidCents: inv.paidCents,
    refundedCents: inv.refundedCents,
    balanceCents: balanceOf(inv),
    notes: publicNotes(inv.notes),
    issuedAt: iso(inv.issuedAt),
    paidAt: iso(inv.paidAt),
    lines: lines.map((l) => ({
      description: l.description,
      kind: l.kind,
      quantity: Number(l.quantity),
      unitCents: l.unitCents,
      taxable: l.taxable,
      grossCents: l.grossCents,
      discountCents: l.discountCents,
      netCents: l.netCents,
    })),
    payments: pays
      .filter((p) => p.status === 'succeeded')
      .map((p) => ({
        id: p.id,
        method: p.method,
        status: p.status,
        amountCents: p.amountCents,
        refundedCents: p.refundedCents,
        reference: p.reference,
        cardLast4: p.method === 'card' ? (/(\d{4})$/.exec(p.reference)?.[1] ?? null) : null,
        succeededAt: iso(p.succeededAt),
        createdAt: p.createdAt.toISOString(),
      })),
  };
}

/** Internal markers in notes (e.g. credit applied) are not shown. */
export const publicNotes = (notes: string) => notes.replace(/\s*\[credit:\d+\]/g, '').trim();

const balanceOf = (inv: InvoiceRow) => (inv.status === 'open' ? Math.max(inv.totalCents - inv.paidCents, 0) : 0);

export async function readInvoice(deps: Pick<AppDeps, 'database'>, user: SessionUser, id: string): Promise<InvoiceView> {
  const view = await invoiceView(deps.database.db, id);
  await assertCustomerAccess(deps.database.db, user, view.customerId);
  if (user.role === 'homeowner' && view.status === 'draft') throw notFound('That invoice');
  return view;
}

export async function listInvoices(
  deps: Pick<AppDeps, 'database'>,
  user: SessionUser,
  q: { status?: InvoiceStatus; customerId?: string; q?: string; limit: number; offset: number },
): Promise<{ total: number; rows: InvoiceSummary[] }> {
  const { db } = deps.database;
  const where: SQL[] = [];
  if (user.role === 'homeowner') {
    if (!user.customerId) return { total: 0, rows: [] };
    where.push(eq(invoices.customerId, user.customerId), sql`${invoices.status} <> 'draft'`);
  } else if (!isStaffOffice(user)) {
    throw new AppError(403, 'forbidden', 'You do not have access to this.');
  }
  if (q.status) where.push(eq(invoices.status, q.status));
  if (q.customerId) where.push(eq(invoices.customerId, q.customerId));
  if (q.q) {
    const n = /^\d+$/.test(q.q.trim()) ? Number(q.q.trim()) : null;
    where.push(or(ilike(customers.name, `%${q.q.replace(/[%_\\]/g, (c) => `\\${c}`)}%`), ...(n !== null && n < 2 ** 31 ? [eq(invoices.number, n)] : []))!);
  }
  const cond = where.length ? and(...where) : undefined;
  const [{ count }] = (await db
    .select({ count: sql<number>`count(*)::int` })
    .from(invoices)
    .innerJoin(customers, eq(invoices.customerId, customers.id))
    .where(cond)) as [{ count: number }];
  const rows = await db
    .select({ invoice: invoices, customerName: customers.name })
    .from(invoices)
    .innerJoin(customers, eq(invoices.customerId, customers.id))
    .where(cond)
    .orderBy(desc(invoices.createdAt), desc(invoices.number))
    .limit(q.limit)
    .offset(q.offset);
  return {
    total: count,
    rows: rows.map(({ invoice: i, customerName }) => ({
      id: i.id,
      number: i.number,
      customerName,
      purpose: i.purpose,
      status: i.status,
      totalCents: i.totalCents,
      balanceCents: balanceOf(i),
      issuedAt: iso(i.issuedAt),
    })),
  };
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
  /** A portal path to come back to, e.g. /portal/plan. */
  returnPath: string;
  /** Keep the card for automatic renewal charges. */
  saveCard?: boolean;
}

function returnUrls(deps: Pick<AppDeps, 'config'>, returnPath: string) {
  if (!/^\/portal(\/[A-Za-z0-9/_-]*)?$/.test(returnPath)) {
    throw new AppError(422, 'validation_failed', 'The return page is not valid.', { returnPath: 'Must be a portal page.' });
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
  const urls = returnUrls(deps, opts.returnPath);
  const { db } = deps.database;
  const [pre] = await db.select().from(invoices).where(eq(invoices.id, invoiceId));
  if (!pre) throw notFound('That invoice');
  const stripeCustomer = await ensureStripeCustomer(deps, pre.customerId);

  return db.transaction(async (tx) => {
    const inv = await lockInvoice(tx, invoiceId);
    if (inv.status !== 'open') throw conflict(inv.status === 'paid' ? 'This invoice is already paid.' : 'This invoice is not open for payment.');
    const due = inv.totalCents - inv.paidCents;
    if (due < 50) throw conflict('Nothing is left to pay on this invoice.');
    const attempts = await tx.select().from(payments).where(and(eq(payments.invoiceId, invoiceId), eq(payments.method, 'card')));
    const pending = attempts.find((p) => p.status === 'pending' && p.stripeCheckoutSessionId && p.amountCents === due);
    if (pending?.stripeCheckoutSessionId) {
      const s = await stripe.checkout.sessions.retrieve(pending.stripeCheckoutSessionId);
      if (s.status === 'open' && s.url) return { checkoutUrl: s.url };
      if (s.status === 'complete') throw conflict('This payment is being recorded. Please refresh in a moment.');
      await tx.update(payments).set({ status: 'canceled' }).where(eq(payments.id, pending.id));
    }
    const [payment] = await tx
      .insert(payments)
      .values({ invoiceId, method: 'card', status: 'pending', amountCents: due })
      .returning({ id: payments.id });
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
export async function recordCardPayment(deps: Pick<AppDeps, 'database' | 'clock' | 'logger' | 'jobs' | 'stripe'>, p: CardPayment): Promise<{ recorded: boolean; paymentId: string }> {
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
      (p.paymentId ? (await tx.select().from(payments).where(and(eq(payments.id, p.paymentId), eq(payments.invoiceId, p.invoiceId))))[0] : undefined) ??
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
      await tx
        .update(agreements)
        .set({ stripePaymentMethodId: p.card.paymentMethodId, cardBrand: p.card.brand, cardLast4: p.card.last4, autoRenew: true })
        .where(eq(agreements.id, inv.agreementId));
    }
    return { recorded: true, paymentId, paid };
  });
  if (result.paid) await closeOpenCheckouts(deps, p.invoiceId);
  if (result.recorded) await queueReceipt(deps, result.paymentId);
  return { recorded: result.recorded, paymentId: result.paymentId };
}

/** Adds a payment to the invoice; when it is paid in full the agreement takes effect. */
async function settleInvoice(tx: Tx, inv: InvoiceRow, amountCents: number, now: Date, source: string, actorId: string | null): Promise<boolean> {
  const paidCents = inv.paidCents + amountCents;
  const nowPaid = inv.status === 'open' && paidCents >= inv.totalCents;
  await tx
    .update(invoices)
    .set({ paidCents, ...(nowPaid ? { status: 'paid', paidAt: now } : {}) })
    .where(eq(invoices.id, inv.id));
  if (nowPaid) {
    const settings = await companyRow(tx);
    await applyPaidAgreementInvoice(tx, { ...inv, paidCents, status: 'paid' }, localDate(now, settings.timeZone), source, actorId);
  }
  return nowPaid;
}

/**
 * Once an invoice is paid, any payment page still open for it is closed at the processor, so
 * nobody pays twice (for example a renewal charged automatically while a Checkout tab was open).
 */
async function closeOpenCheckouts(deps: Pick<AppDeps, 'database' | 'stripe'>, invoiceId: string): Promise<void> {
  const { stripe } = deps;
  const open = await deps.database.db.select().from(payments).where(and(eq(payments.invoiceId, invoiceId), eq(payments.status, 'pending')));
  for (const p of open) {
    if (p.stripeCheckoutSessionId) {
      await stripe.checkout.sessions.expire(p.stripeCheckoutSessionId).catch(() => undefined);
    }
    await deps.database.db.update(payments).set({ status: 'canceled' }).where(and(eq(payments.id, p.id), eq(payments.status, 'pending')));
  }
}

/** Reads a Checkout Session back from the processor and records what it says. */
export async function syncCheckoutSession(deps: Pick<AppDeps, 'database' | 'clock' | 'logger' | 'jobs' | 'stripe'>, sessionId: string): Promise<{ state: 'paid' | 'open' | 'expired' | 'saved' | 'unknown'; invoiceId: string | null }> {
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

export async function recordFromPaymentIntent(deps: Pick<AppDeps, 'database' | 'clock' | 'logger' | 'jobs' | 'stripe'>, pi: Stripe.PaymentIntent, sessionId: string | null, source = 'card') {
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
    await tx
      .update(agreements)
      .set({ stripePaymentMethodId: method.id, cardBrand: method.card!.brand, cardLast4: method.card!.last4, ...(enableAutoRenew ? { autoRenew: true } : {}) })
      .where(eq(agreements.id, agreementId));
    await recordHistory(tx, { agreementId, event: 'card_saved', note: `${method.card!.brand} ending ${method.card!.last4}${enableAutoRenew ? '; automatic renewal on' : ''}` });
  });
}

// ---------- Offline payments and refunds ----------

export async function recordOfflinePayment(deps: Pick<AppDeps, 'database' | 'clock' | 'logger' | 'jobs' | 'stripe'>, user: SessionUser, invoiceId: string, input: OfflinePaymentInput): Promise<InvoiceView> {
  const { db } = deps.database;
  const now = deps.clock();
  const paymentId = await db.transaction(async (tx) => {
    const inv = await lockInvoice(tx, invoiceId);
    if (inv.status !== 'open') throw conflict('Payments can only be recorded on an open invoice.');
    const due = inv.totalCents - inv.paidCents;
    if (input.amountCents > due) {
      throw new AppError(422, 'validation_failed', `The amount is more than the balance of ${(due / 100).toFixed(2)}.`, { amountCents: 'More than the balance due.' });
    }
    const [row] = await tx
      .insert(payments)
      .values({ invoiceId, method: input.method, status: 'succeeded', amountCents: input.amountCents, reference: input.reference, recordedById: user.id, succeededAt: now })
      .returning({ id: payments.id });
    const paid = await settleInvoice(tx, inv, input.amountCents, now, input.method, user.id);
    return { id: row!.id, paid };
  });
  if (paymentId.paid) await closeOpenCheckouts(deps, invoiceId);
  await queueReceipt(deps, paymentId.id);
  return invoiceView(db, invoiceId);
}

/** Full or partial refund: card payments through the processor, checks and cash recorded as paid back. */
export async function refundInvoice(deps: Pick<AppDeps, 'database' | 'stripe'>, user: SessionUser, invoiceId: string, input: RefundInput, requestKey: string): Promise<InvoiceView> {
  const { db } = deps.database;
  const pays = await db.select().from(payments).where(and(eq(payments.invoiceId, invoiceId), eq(payments.status, 'succeeded')));
  if (pays.length === 0) {
    const [inv] = await db.select({ id: invoices.id }).from(invoices).where(eq(invoices.id, invoiceId));
    if (!inv) throw notFound('That invoice');
    throw conflict('This invoice has no payments to refund.');
  }
  let payment: PaymentRow | undefined;
  if (input.paymentId) {
    payment = pays.find((p) => p.id === input.paymentId);
    if (!payment) throw new AppError(422, 'validation_failed', 'That payment is not on this invoice.', { paymentId: 'Not a payment on this invoice.' });
  } else {
    payment = pays.filter((p) => p.amountCents - p.refundedCents >= input.amountCents).sort((a, b) => +b.createdAt - +a.createdAt)[0];
    if (!payment) throw new AppError(422, 'validation_failed', 'No single payment has that much left to refund.', { amountCents: 'More than any payment has left to refund.' });
  }
  const left = payment.amountCents - payment.refundedCents;
  if (input.amountCents > left) {
    throw new AppError(422, 'validation_failed', `At most ${(left / 100).toFixed(2)} can be refunded on that payment.`, { amountCents: 'More than is left to refund.' });
  }
  let stripeRefundId: string | null = null;
  if (payment.method === 'card') {
    if (!payment.stripePaymentIntentId) throw conflict('That card payment has no processor record.');
    try {
      const r = await deps.stripe.refunds.create(
        { payment_intent: payment.stripePaymentIntentId, amount: input.amountCents, metadata: { invoiceId, paymentId: payment.id } },
        { idempotencyKey: `seasonwell-refund-${payment.id}-${requestKey}` },
      );
      stripeRefundId = r.id;
    } catch (e) {
      throw providerError(e);
    }
  }
  await applyRefund(deps, { paymentId: payment.id, amountCents: input.amountCents, stripeRefundId, reason: input.reason, actorId: user.id });
  return invoiceView(db, invoiceId);
}

/** Records a refund once (by processor refund id) and moves the invoice to refunded or partly refunded. */
export async function applyRefund(
  deps: Pick<AppDeps, 'database'>,
  r: { paymentId: string; amountCents: number; stripeRefundId: string | null; reason: string; actorId: string | null },
): Promise<boolean> {
  return deps.database.db.transaction(async (tx) => {
    const [pay] = await tx.select().from(payments).where(eq(payments.id, r.paymentId));
    if (!pay) return false;
    const inv = await lockInvoice(tx, pay.invoiceId);
    const [p] = await tx.select().from(payments).where(eq(payments.id, r.paymentId)).for('update');
    if (r.stripeRefundId) {
      const ins = await tx
        .insert(refunds)
        .values({ paymentId: p!.id, amountCents: r.amountCents, stripeRefundId: r.stripeRefundId, reason: r.reason, createdById: r.actorId })
        .onConflictDoNothing()
        .returning({ id: refunds.id });
      if (ins.length === 0) return false;
    } else {
      await tx.insert(refunds).values({ paymentId: p!.id, amountCents: r.amountCents, reason: r.reason, createdById: r.actorId });
    }
    await tx
      .update(payments)
      .set({ refundedCents: p!.refundedCents + r.amountCents })
      .where(eq(payments.id, p!.id));
    const refundedCents = inv.refundedCents + r.amountCents;
    const status: InvoiceStatus = refundedCents >= inv.paidCents ? 'refunded' : 'partially_refunded';
    await tx.update(invoices).set({ refundedCents, status }).where(eq(invoices.id, inv.id));
    return true;
  });
}

/** A charge.refunded event: any refund made outside the app (the processor's dashboard) is recorded too. */
export async function syncRefunds(deps: Pick<AppDeps, 'database' | 'stripe'>, paymentIntentId: string): Promise<void> {
  const { db } = deps.database;
  const [pay] = await db.select().from(payments).where(eq(payments.stripePaymentIntentId, paymentIntentId));
  if (!pay) return;
  const list = await deps.stripe.refunds.list({ payment_intent: paymentIntentId, limit: 100 });
  for (const r of list.data) {
    if (r.status !== 'succeeded') continue;
    await applyRefund(deps, { paymentId: pay.id, amountCents: r.amount, stripeRefundId: r.id, reason: r.reason ?? '', actorId: null });
  }
}

// ---------- Receipts ----------

export async function queueReceipt(deps: Pick<AppDeps, 'logger' | 'jobs'>, paymentId: string): Promise<void> {
  try {
    await deps.jobs.send(RECEIPT_JOB, { paymentId }, { singletonKey: `receipt-${paymentId}` });
  } catch (err) {
    // A receipt that fails to send never undoes a recorded payment.
    deps.logger.error({ err, paymentId }, 'receipt e-mail failed');
  }
}

export { paymentErrorMessage };
