import { and, eq } from 'drizzle-orm';
import { formatUsd } from '../../shared/money';
import type { InvoiceStatus, InvoiceView, OfflinePaymentInput, RefundInput } from '../../shared/schemas/billing';
import type { SessionUser } from '../../shared/schemas/session';
import type { AppDeps } from '../deps';
import { invoices, payments, refunds } from '../db/schema';
import { AppError, conflict, notFound } from '../http/errors';

type PaymentRow = typeof payments.$inferSelect;
import { invoiceView, lockInvoice, settleInvoice } from './invoices';
import { closeOpenCheckouts, providerError } from './checkout';
import { queueReceipt } from './receipts';

// ---------- Offline payments and refunds ----------

export async function recordOfflinePayment(
  deps: Pick<AppDeps, 'database' | 'clock' | 'logger' | 'jobs' | 'stripe'>,
  user: SessionUser,
  invoiceId: string,
  input: OfflinePaymentInput,
): Promise<InvoiceView> {
  const { db } = deps.database;
  const now = deps.clock();
  const paymentId = await db.transaction(async (tx) => {
    const inv = await lockInvoice(tx, invoiceId);
    if (inv.status !== 'open') throw conflict('Payments can only be recorded on an open invoice.');
    const due = inv.totalCents - inv.paidCents;
    if (input.amountCents > due) {
      throw new AppError(422, 'validation_failed', `The amount is more than the balance of ${formatUsd(due)}.`, { amountCents: 'More than the balance due.' });
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
export async function refundInvoice(
  deps: Pick<AppDeps, 'database' | 'stripe'>,
  user: SessionUser,
  invoiceId: string,
  input: RefundInput,
  requestKey: string,
): Promise<InvoiceView> {
  const { db } = deps.database;
  const pays = await db
    .select()
    .from(payments)
    .where(and(eq(payments.invoiceId, invoiceId), eq(payments.status, 'succeeded')));
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
    throw new AppError(422, 'validation_failed', `At most ${formatUsd(left)} can be refunded on that payment.`, { amountCents: 'More than is left to refund.' });
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
