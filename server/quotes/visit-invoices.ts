import { and, asc, eq, ne } from 'drizzle-orm';
import type { VisitInvoice } from '../../shared/schemas/quotes';
import type { SessionUser } from '../../shared/schemas/session';
import type { AppDeps } from '../deps';
import { invoices } from '../db/schema';
import { notFound } from '../http/errors';
import { startInvoiceCheckout } from '../billing/checkout';
import { reachableVisit } from './visit-access';

// The invoices issued for work on a visit, and paying one on the technician's device: the
// processor's hosted page opens on the device and comes back to the visit.

export async function visitInvoices(deps: Pick<AppDeps, 'database'>, user: SessionUser, visitId: string): Promise<VisitInvoice[]> {
  const { db } = deps.database;
  await reachableVisit(db, user, visitId);
  const rows = await db
    .select()
    .from(invoices)
    .where(and(eq(invoices.visitId, visitId), ne(invoices.status, 'draft')))
    .orderBy(asc(invoices.createdAt));
  return rows.map((r) => ({
    id: r.id,
    number: r.number,
    status: r.status,
    totalCents: r.totalCents,
    discountCents: r.discountCents,
    balanceCents: r.status === 'open' ? r.totalCents - r.paidCents : 0,
    notes: r.notes,
  }));
}

/** A payment page for an invoice of this visit, returning to the visit's screen. */
export async function startVisitCheckout(
  deps: Pick<AppDeps, 'config' | 'database' | 'stripe'>,
  user: SessionUser,
  invoiceId: string,
  visitId: string,
): Promise<{ checkoutUrl: string }> {
  const { db } = deps.database;
  const visit = await reachableVisit(db, user, visitId);
  const [inv] = await db.select({ visitId: invoices.visitId }).from(invoices).where(eq(invoices.id, invoiceId));
  if (!inv || inv.visitId !== visit.id) throw notFound('That invoice');
  return startInvoiceCheckout(deps, invoiceId, { returnPath: `/field/visits/${visit.id}`, onDevice: true });
}
