import { and, desc, eq, ilike, inArray, or, sql, type SQL } from 'drizzle-orm';
import { invoiceTotals, MoneyError, type InvoiceLine } from '../../shared/money';
import type { CreateInvoiceInput, InvoicePurpose, InvoiceStatus, InvoiceSummary, InvoiceView } from '../../shared/schemas/billing';
import type { SessionUser } from '../../shared/schemas/session';
import type { AppDeps } from '../deps';
import { assertCustomerAccess, isStaffOffice } from '../auth/access';
import type { Db, Tx } from '../db/client';
import { agreements, customers, invoiceCounters, invoiceLines, invoices, payments, planVersions } from '../db/schema';
import { AppError, conflict, notFound } from '../http/errors';
import { applyPaidAgreementInvoice } from '../agreements/terms';
import { companyRow, localDate } from '../company/company';

type InvoiceRow = typeof invoices.$inferSelect;

// Invoices: numbers, creation, issue and void, and how they read.

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

export interface CoveredInvoice {
  customerId: string;
  agreementId: string | null;
  /** The visit the work was done on, when there is one. */
  visitId: string | null;
  /** Lines whose coverage is already worked out (shared/quote-coverage.ts): the savings are each line's discount. */
  lines: {
    description: string;
    kind: InvoiceLine['kind'];
    quantity: number;
    unitCents: number;
    taxable: boolean;
    grossCents: number;
    discountCents: number;
    netCents: number;
    reason: string;
  }[];
  taxRateBps: number;
  totals: { subtotalCents: number; discountCents: number; taxCents: number; totalCents: number };
  notes: string;
}

/** Issues a service invoice whose discount is shown line by line, in the caller's transaction. */
export async function insertCoveredInvoice(tx: Tx, input: CoveredInvoice, now: Date): Promise<InvoiceRow> {
  const sum = input.lines.reduce((s, l) => s + l.grossCents, 0);
  const off = input.lines.reduce((s, l) => s + l.discountCents, 0);
  if (sum !== input.totals.subtotalCents || off !== input.totals.discountCents || input.totals.totalCents !== sum - off + input.totals.taxCents) {
    throw new AppError(422, 'validation_failed', 'The invoice lines do not add up to the totals.');
  }
  const number = await nextInvoiceNumber(tx);
  const [invoice] = await tx
    .insert(invoices)
    .values({
      number,
      customerId: input.customerId,
      agreementId: input.agreementId,
      visitId: input.visitId,
      purpose: 'service',
      // Work the plan or a warranty covered in full leaves nothing to pay: it is settled as issued.
      status: input.totals.totalCents === 0 ? 'paid' : 'open',
      paidAt: input.totals.totalCents === 0 ? now : null,
      taxRateBps: input.taxRateBps,
      ...input.totals,
      notes: input.notes,
      issuedAt: now,
    })
    .returning();
  await tx.insert(invoiceLines).values(input.lines.map((l, i) => ({ invoiceId: invoice!.id, position: i + 1, ...l })));
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
    const inv = await insertInvoice(
      tx,
      { customerId: input.customerId, purpose: 'service', lines: input.lines, discountBps, notes: input.notes, issue: input.issue },
      deps.clock(),
    );
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
    await tx
      .update(payments)
      .set({ status: 'canceled' })
      .where(and(eq(payments.invoiceId, id), eq(payments.status, 'pending')));
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
      reason: l.reason,
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

/** Adds a payment to the invoice; when it is paid in full the agreement takes effect. */
export async function settleInvoice(tx: Tx, inv: InvoiceRow, amountCents: number, now: Date, source: string, actorId: string | null): Promise<boolean> {
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

/** Voids an agreement's open invoices (only those nothing was paid on, with unpaidOnly), for the agreements feature. */
export async function voidOpenInvoicesOf(tx: Tx, agreementId: string, at: Date, opts: { unpaidOnly?: boolean } = {}): Promise<void> {
  await tx
    .update(invoices)
    .set({ status: 'void', voidedAt: at })
    .where(and(eq(invoices.agreementId, agreementId), eq(invoices.status, 'open'), opts.unpaidOnly ? eq(invoices.paidCents, 0) : undefined));
}
