import { and, eq, gt, sql } from 'drizzle-orm';
import type { PgUpdateSetSource } from 'drizzle-orm/pg-core';
import type { AgreementStatus } from '../../shared/agreements';
import { canTransition, nextAgreementStatus, termEnd, type AgreementEvent } from '../../shared/renewals';
import type { Tx } from '../db/client';
import { agreementHistory, agreements, agreementTerms, invoices, planVersions } from '../db/schema';
import { AppError } from '../http/errors';

type AgreementRow = typeof agreements.$inferSelect;
type InvoiceRow = typeof invoices.$inferSelect;

export async function lockAgreement(tx: Tx, id: string): Promise<AgreementRow> {
  const [row] = await tx.select().from(agreements).where(eq(agreements.id, id)).for('update');
  if (!row) throw new AppError(404, 'not_found', 'That agreement was not found.');
  return row;
}

export async function recordHistory(
  tx: Tx,
  entry: { agreementId: string; event: string; fromStatus?: string | null; toStatus?: string | null; note?: string; actorId?: string | null },
): Promise<void> {
  await tx.insert(agreementHistory).values({
    agreementId: entry.agreementId,
    event: entry.event,
    fromStatus: entry.fromStatus ?? null,
    toStatus: entry.toStatus ?? null,
    note: entry.note ?? '',
    actorId: entry.actorId ?? null,
  });
}

/** Moves an agreement by one of the rule book's events; refuses a transition the rules do not allow. */
export async function transition(
  tx: Tx,
  agreement: AgreementRow,
  event: AgreementEvent,
  extra: PgUpdateSetSource<typeof agreements> = {},
  meta: { note?: string; actorId?: string | null } = {},
): Promise<AgreementStatus> {
  if (!canTransition(agreement.status, event)) {
    throw new AppError(409, 'invalid_transition', `An agreement that is ${agreement.status.replace('_', ' ')} cannot take "${event.replace(/_/g, ' ')}".`);
  }
  const to = nextAgreementStatus(agreement.status, event);
  await tx
    .update(agreements)
    .set({ ...extra, status: to })
    .where(eq(agreements.id, agreement.id));
  await recordHistory(tx, { agreementId: agreement.id, event, fromStatus: agreement.status, toStatus: to, ...meta });
  return to;
}

/**
 * A paid agreement invoice takes effect: an enrollment starts the first term, a renewal adds the
 * term it paid for after the current one (which stays in force until its last day; the agreement
 * row then holds the latest paid term, and coverage reads the term in force through
 * `termsOf`/`termOn`), a tier change moves the agreement to the new plan version. The unique term
 * start makes this idempotent: a second call for the same invoice changes nothing.
 */
export async function applyPaidAgreementInvoice(tx: Tx, invoice: InvoiceRow, today: string, source: string, actorId: string | null = null): Promise<void> {
  if (!invoice.agreementId) return;
  const agreement = await lockAgreement(tx, invoice.agreementId);
  if (invoice.purpose === 'tier_change') {
    if (!invoice.planVersionId) return;
    const [v] = await tx.select().from(planVersions).where(eq(planVersions.id, invoice.planVersionId));
    const priceCents = v ? v.yearlyPriceCents + v.additionalSystemCents * Math.max(agreement.systemsCount - 1, 0) : agreement.priceCents;
    await tx.update(agreements).set({ planVersionId: invoice.planVersionId, priceCents }).where(eq(agreements.id, agreement.id));
    // The new tier's benefits apply from now on: to the term in force and any paid after it.
    await tx
      .update(agreementTerms)
      .set({ planVersionId: invoice.planVersionId })
      .where(and(eq(agreementTerms.agreementId, agreement.id), gt(agreementTerms.endsOn, today)));
    await recordHistory(tx, { agreementId: agreement.id, event: 'tier_change_paid', note: `Invoice ${invoice.number ?? ''}`.trim(), actorId });
    return;
  }
  if (invoice.purpose !== 'enrollment' && invoice.purpose !== 'renewal') return;
  if (agreement.status === 'canceled') {
    await recordHistory(tx, { agreementId: agreement.id, event: 'payment_after_cancel', note: `Invoice ${invoice.number} paid on a canceled agreement; refund it.`, actorId });
    return;
  }

  // An enrollment's term starts the day it is paid; a lapsed agreement restarts then too.
  const start =
    invoice.purpose === 'enrollment' || agreement.status === 'lapsed' || agreement.status === 'pending'
      ? today > (invoice.termStartsOn ?? today)
        ? today
        : (invoice.termStartsOn ?? today)
      : (invoice.termStartsOn ?? agreement.endsOn);
  const end = termEnd(start);
  if (agreement.status !== 'pending' && start > agreement.startsOn) {
    // The term the row held so far stays on record (and in force until its last day) before the
    // row moves on to the new one; terms recorded from the start already have their row.
    await tx
      .insert(agreementTerms)
      .values({
        agreementId: agreement.id,
        startsOn: agreement.startsOn,
        endsOn: agreement.endsOn,
        planVersionId: agreement.planVersionId,
        priceCents: agreement.priceCents,
        source: 'agreement',
      })
      .onConflictDoNothing();
  }
  const inserted = await tx
    .insert(agreementTerms)
    .values({
      agreementId: agreement.id,
      startsOn: start,
      endsOn: end,
      planVersionId: invoice.planVersionId ?? agreement.planVersionId,
      priceCents: invoice.totalCents,
      invoiceId: invoice.id,
      source,
    })
    .onConflictDoNothing()
    .returning({ id: agreementTerms.id });
  if (inserted.length === 0) return;

  const event: AgreementEvent = source === 'check' || source === 'cash' ? 'manual_renewal' : 'paid';
  const fields = {
    startsOn: start,
    endsOn: end,
    planVersionId: invoice.planVersionId ?? agreement.planVersionId,
    priceCents: invoice.subtotalCents,
    chargeFailedOn: null,
    dunningRetries: 0,
    lastChargeError: null,
    creditCents: sql`greatest(${agreements.creditCents} - ${creditUsed(invoice)}, 0)`,
  };
  if (agreement.status === 'active' && event === 'paid') {
    // Renewed early, before the engine opened the window: the status stays active.
    await tx.update(agreements).set(fields).where(eq(agreements.id, agreement.id));
    await recordHistory(tx, { agreementId: agreement.id, event: 'paid', fromStatus: 'active', toStatus: 'active', note: `Term ${start} to ${end}`, actorId });
    return;
  }
  await transition(tx, agreement, event, fields, { note: `Term ${start} to ${end}`, actorId });
}

/** The credit a renewal invoice took off the plan fee (kept in its notes as a marker). */
function creditUsed(invoice: InvoiceRow): number {
  const m = /\[credit:(\d+)\]/.exec(invoice.notes);
  return m ? Number(m[1]) : 0;
}

/** Keeps a card saved at the processor on the agreement for renewal charges, for the billing feature. */
export async function saveCardOnAgreement(
  tx: Tx,
  agreementId: string,
  card: { paymentMethodId: string; brand: string; last4: string },
  opts: { autoRenew?: boolean } = {},
): Promise<void> {
  await tx
    .update(agreements)
    .set({ stripePaymentMethodId: card.paymentMethodId, cardBrand: card.brand, cardLast4: card.last4, ...(opts.autoRenew ? { autoRenew: true } : {}) })
    .where(eq(agreements.id, agreementId));
}
