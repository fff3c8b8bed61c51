import { and, eq } from 'drizzle-orm';
import { formatUsd } from '../../shared/money';
import { invoiceLinesOf } from '../../shared/quote-coverage';
import type { DirectInvoice, QuoteApprove, QuoteDecline, QuoteView } from '../../shared/schemas/pricebook';
import type { InvoiceView } from '../../shared/schemas/billing';
import type { SessionUser } from '../../shared/schemas/session';
import type { Tx } from '../db/client';
import { customers, properties, quoteApprovals, quoteLines, quoteOptions, quoteRevisions, quotes, visits } from '../db/schema';
import { AppError } from '../http/errors';
import { companyRow, localDate } from '../company/company';
import { insertCoveredInvoice, invoiceView } from '../billing/invoices';
import { queueMail } from '../mail/outbox';
import { renderEmail } from '../integrations/mail-layout';
import { followUpVisit } from '../visits/follow-up';
import type { VisitRow } from '../visits/visit-status';
import { OutOfStock, takeStock } from '../stock/stock.service';
import { coverageContext, coverageOf, priceLines } from './pricing';
import { pastValidUntil, quoteExpired } from './expiry';
import { frozen, readQuote, reachableQuote, staleRevision, type MailDeps } from './quotes.service';
import { revisionRow } from './quotes.store';
import { reachableVisit } from './visit-access';
import { coverOption } from '../../shared/quote-coverage';

// The homeowner's answer. Approval, in one transaction: the revision is frozen, an invoice is
// issued with the coverage line by line, the quoted truck parts leave the truck, and a part that
// must be ordered opens a follow-up visit in the requested queue.

type Answer = { ip: string; onDevice: 'portal' | 'technician' };

async function openAnswer(tx: Tx, user: SessionUser, id: string, revision: number, now: Date) {
  const q = await reachableQuote(tx, user, id, true);
  if (q.status === 'expired') throw quoteExpired(q.validUntil ?? localDate(now, (await companyRow(tx)).timeZone));
  if (q.status === 'approved' || q.status === 'declined') throw frozen(q.status);
  if (user.role === 'homeowner' && q.status !== 'sent') throw new AppError(409, 'quote_not_sent', 'This quote is not ready to answer yet.');
  if (revision !== q.revision) throw staleRevision();
  const { timeZone } = await companyRow(tx);
  if (q.status === 'sent' && pastValidUntil(q.validUntil, localDate(now, timeZone))) throw quoteExpired(q.validUntil!);
  return q;
}

function payMail(deps: MailDeps, invoice: InvoiceView, to: string, companyName: string) {
  const url = `${deps.config.publicUrl}/portal/invoices/${invoice.id}`;
  const settled = invoice.totalCents === 0;
  const content = renderEmail({
    title: `Invoice ${invoice.number} from ${companyName}`,
    paragraphs: [
      `Total ${formatUsd(invoice.totalCents)}${invoice.discountCents ? `, after ${formatUsd(invoice.discountCents)} of plan savings` : ''}.`,
      settled ? 'This work is covered in full: there is nothing to pay.' : 'You can pay online with a card.',
    ],
    action: { label: settled ? 'See the invoice' : 'Pay online', url },
  });
  return queueMail(deps, {
    kind: 'invoice_pay_link',
    key: `invoice-pay-link:${invoice.id}`,
    message: { to, subject: `Invoice ${invoice.number} from ${companyName}`, html: content.html, text: content.text },
  });
}

export async function approveQuote(deps: MailDeps, user: SessionUser, id: string, body: QuoteApprove, answer: Answer): Promise<QuoteView> {
  const { db } = deps.database;
  const now = deps.clock();
  const invoiceId = await db.transaction(async (tx) => {
    const q = await openAnswer(tx, user, id, body.revision, now);
    const rev = await revisionRow(tx, q.id, q.revision);
    const [opt] = await tx
      .select()
      .from(quoteOptions)
      .where(and(eq(quoteOptions.id, body.optionId), eq(quoteOptions.revisionId, rev.id)));
    if (!opt) throw new AppError(422, 'validation_failed', 'Please check optionId.', { optionId: 'Choose one of the options on this quote.' });
    await tx.insert(quoteApprovals).values({
      quoteId: q.id,
      revision: q.revision,
      outcome: 'approved',
      optionId: opt.id,
      typedName: body.typedName,
      ip: answer.ip,
      onDevice: answer.onDevice,
      userId: user.id,
      at: now,
    });
    const lines = await tx.select().from(quoteLines).where(eq(quoteLines.optionId, opt.id)).orderBy(quoteLines.position);
    const [visit] = await tx.select().from(visits).where(eq(visits.id, q.visitId));
    const company = await companyRow(tx);
    const inv = await insertCoveredInvoice(
      tx,
      {
        customerId: q.customerId,
        agreementId: visit!.agreementId,
        visitId: q.visitId,
        lines: invoiceLinesOf({
          lines: lines.map((l) => ({ ...l, quantity: Number(l.quantity), rules: [] })),
          subtotalCents: 0,
          savingsCents: 0,
          taxableCents: 0,
          taxCents: 0,
          totalCents: 0,
        }).map((l) => ({ ...l, description: l.description })),
        taxRateBps: rev.taxRateBps,
        totals: { subtotalCents: opt.subtotalCents, discountCents: opt.savingsCents, taxCents: opt.taxCents, totalCents: opt.totalCents },
        notes: `Quote #${q.number}, revision ${q.revision}: ${opt.title}`,
      },
      now,
    );
    const toOrder: string[] = [];
    for (const l of lines) {
      if (l.kind !== 'part' || !l.itemId) continue;
      const qty = Number(l.quantity);
      if (!l.stockLocationId || !Number.isInteger(qty)) {
        if (l.category !== 'refrigerant' && l.category !== 'consumable') toOrder.push(l.description);
        continue;
      }
      try {
        await takeStock(tx, {
          kind: 'use',
          locationId: l.stockLocationId,
          itemId: l.itemId,
          quantity: qty,
          visitId: q.visitId,
          quoteId: q.id,
          userId: user.id,
          note: `Quote #${q.number}`,
        });
      } catch (err) {
        if (!(err instanceof OutOfStock)) throw err;
        toOrder.push(l.description);
      }
    }
    const followUp = toOrder.length ? await followUpVisit(tx, visit!, toOrder, user.id, company.timeZone) : null;
    await tx.update(quoteRevisions).set({ status: 'approved' }).where(eq(quoteRevisions.id, rev.id));
    await tx.update(quotes).set({ status: 'approved', invoiceId: inv.id, followUpVisitId: followUp, updatedAt: now }).where(eq(quotes.id, q.id));
    return inv.id;
  });
  await mailInvoice(deps, invoiceId);
  return readQuote(deps, user, id);
}

async function mailInvoice(deps: MailDeps, invoiceId: string): Promise<void> {
  const { db } = deps.database;
  const inv = await invoiceView(db, invoiceId);
  const [c] = await db.select({ email: customers.email }).from(customers).where(eq(customers.id, inv.customerId));
  if (c?.email) await payMail(deps, inv, c.email, (await companyRow(db)).name);
}

export async function declineQuote(deps: MailDeps, user: SessionUser, id: string, body: QuoteDecline, answer: Answer): Promise<QuoteView> {
  const { db } = deps.database;
  const now = deps.clock();
  await db.transaction(async (tx) => {
    const q = await openAnswer(tx, user, id, body.revision, now);
    await tx
      .insert(quoteApprovals)
      .values({ quoteId: q.id, revision: q.revision, outcome: 'declined', declineReason: body.reason, ip: answer.ip, onDevice: answer.onDevice, userId: user.id, at: now });
    await tx
      .update(quoteRevisions)
      .set({ status: 'declined' })
      .where(and(eq(quoteRevisions.quoteId, q.id), eq(quoteRevisions.revision, q.revision)));
    await tx.update(quotes).set({ status: 'declined', updatedAt: now }).where(eq(quotes.id, q.id));
  });
  return readQuote(deps, user, id);
}

// ---- Invoicing work without a quote ----

async function workVisit(tx: Tx, user: SessionUser, body: DirectInvoice, now: Date): Promise<VisitRow> {
  if (body.visitId) {
    const v = await reachableVisit(tx, user, body.visitId);
    if (v.customerId !== body.customerId) throw new AppError(422, 'validation_failed', 'Please check visitId.', { visitId: 'That visit is at another household.' });
    return v;
  }
  if (user.role === 'technician') throw new AppError(422, 'validation_failed', 'Please check visitId.', { visitId: 'Choose the visit the work was done on.' });
  const [c] = await tx.select({ id: customers.id }).from(customers).where(eq(customers.id, body.customerId));
  if (!c) throw new AppError(422, 'validation_failed', 'Please check customerId.', { customerId: 'That household was not found.' });
  const [p] = await tx.select({ id: properties.id }).from(properties).where(eq(properties.customerId, body.customerId)).limit(1);
  if (!p) throw new AppError(422, 'validation_failed', 'Please check customerId.', { customerId: 'That household has no home on record.' });
  // Work on the day it is invoiced: the coverage of the term in force today.
  return { id: crypto.randomUUID(), customerId: body.customerId, propertyId: p.id, agreementId: null, kind: 'service_call', status: 'done', startsAt: now } as VisitRow;
}

async function priceWork(tx: Tx, user: SessionUser, body: DirectInvoice, now: Date) {
  const visit = await workVisit(tx, user, body, now);
  const { taxRateBps } = await companyRow(tx);
  const ctx = await coverageContext(tx, visit, body.equipmentId, taxRateBps);
  const lines = await priceLines(tx, body.lines, ctx, '');
  return { visit, lines, coverage: coverageOf(() => coverOption({ agreement: ctx.agreement, warranty: ctx.warranty, visitDate: ctx.visitDate, lines, taxRateBps })) };
}

export async function previewWorkInvoice(deps: MailDeps, user: SessionUser, body: DirectInvoice) {
  return deps.database.db.transaction(async (tx) => {
    const { coverage: c, lines } = await priceWork(tx, user, body, deps.clock());
    return {
      id: 'preview',
      title: 'Invoice',
      description: '',
      subtotalCents: c.subtotalCents,
      savingsCents: c.savingsCents,
      taxableCents: c.taxableCents,
      taxCents: c.taxCents,
      totalCents: c.totalCents,
      lines: c.lines.map((l, i) => ({
        ...l,
        id: `preview-${i + 1}`,
        itemId: lines[i]!.itemId,
        itemVersionId: lines[i]!.itemVersionId,
        taskId: lines[i]!.taskId,
        group: l.group ?? null,
        sku: lines[i]!.sku,
        stockLocationId: null,
      })),
    };
  });
}

export async function createWorkInvoice(deps: MailDeps, user: SessionUser, body: DirectInvoice): Promise<InvoiceView> {
  const { db } = deps.database;
  const now = deps.clock();
  const id = await db.transaction(async (tx) => {
    const { visit, coverage: c } = await priceWork(tx, user, body, now);
    const { taxRateBps } = await companyRow(tx);
    const inv = await insertCoveredInvoice(
      tx,
      {
        customerId: body.customerId,
        agreementId: body.visitId ? visit.agreementId : null,
        visitId: body.visitId ?? null,
        lines: invoiceLinesOf(c),
        taxRateBps,
        totals: { subtotalCents: c.subtotalCents, discountCents: c.savingsCents, taxCents: c.taxCents, totalCents: c.totalCents },
        notes: body.notes,
      },
      now,
    );
    return inv.id;
  });
  if (body.sendPayLink) await mailInvoice(deps, id);
  return invoiceView(db, id);
}
