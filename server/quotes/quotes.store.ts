import { and, asc, eq, inArray } from 'drizzle-orm';
import { QUOTE_STATUS_LABELS, type CoverageRuleName, type QuoteOptionView, type QuoteView } from '../../shared/schemas/pricebook';
import type { Db, Tx } from '../db/client';
import { customers, files, quoteApprovals, quoteLines, quoteOptions, quoteRevisions, quotes } from '../db/schema';
import { notFound } from '../http/errors';
import type { PricedOption } from './pricing';

// Writing one revision's options and lines, and reading a quote back as the API shows it.

export type QuoteRow = typeof quotes.$inferSelect;
export type RevisionRow = typeof quoteRevisions.$inferSelect;

export async function writeOptions(tx: Tx, revisionId: string, options: PricedOption[]): Promise<void> {
  await tx.delete(quoteOptions).where(eq(quoteOptions.revisionId, revisionId));
  for (const [i, o] of options.entries()) {
    const c = o.coverage;
    const [row] = await tx
      .insert(quoteOptions)
      .values({
        revisionId,
        position: i + 1,
        title: o.title,
        description: o.description,
        subtotalCents: c.subtotalCents,
        savingsCents: c.savingsCents,
        taxableCents: c.taxableCents,
        taxCents: c.taxCents,
        totalCents: c.totalCents,
      })
      .returning({ id: quoteOptions.id });
    await tx.insert(quoteLines).values(
      o.lines.map((l, k) => {
        const cl = c.lines[k]!;
        return {
          optionId: row!.id,
          position: k + 1,
          itemId: l.itemId,
          itemVersionId: l.itemVersionId,
          taskId: l.taskId,
          groupKey: l.group ?? null,
          sku: l.sku,
          description: l.description,
          kind: l.kind,
          category: l.category,
          quantity: l.quantity,
          unitCents: l.unitCents,
          taxable: l.taxable,
          grossCents: cl.grossCents,
          savingsCents: cl.savingsCents,
          chargedCents: cl.chargedCents,
          rules: cl.rules,
          reason: cl.reason,
          stockLocationId: l.stockLocationId,
          equipmentId: l.equipmentId,
        };
      }),
    );
  }
}

/** Copies a revision's options and lines into another (a new revision starts as the last one was). */
export async function copyOptions(tx: Tx, fromRevisionId: string, toRevisionId: string): Promise<void> {
  const opts = await tx.select().from(quoteOptions).where(eq(quoteOptions.revisionId, fromRevisionId)).orderBy(asc(quoteOptions.position));
  for (const o of opts) {
    const { id, ...rest } = o;
    const [row] = await tx
      .insert(quoteOptions)
      .values({ ...rest, revisionId: toRevisionId })
      .returning({ id: quoteOptions.id });
    const lines = await tx.select().from(quoteLines).where(eq(quoteLines.optionId, id));
    if (lines.length) await tx.insert(quoteLines).values(lines.map(({ id: _id, ...l }) => ({ ...l, optionId: row!.id })));
  }
}

export async function optionViews(db: Db | Tx, revisionId: string): Promise<QuoteOptionView[]> {
  const opts = await db.select().from(quoteOptions).where(eq(quoteOptions.revisionId, revisionId)).orderBy(asc(quoteOptions.position));
  const lines = opts.length
    ? await db
        .select()
        .from(quoteLines)
        .where(
          inArray(
            quoteLines.optionId,
            opts.map((o) => o.id),
          ),
        )
        .orderBy(asc(quoteLines.position))
    : [];
  return opts.map((o) => ({
    id: o.id,
    title: o.title,
    description: o.description,
    subtotalCents: o.subtotalCents,
    savingsCents: o.savingsCents,
    taxableCents: o.taxableCents,
    taxCents: o.taxCents,
    totalCents: o.totalCents,
    lines: lines
      .filter((l) => l.optionId === o.id)
      .map((l) => ({
        id: l.id,
        itemId: l.itemId,
        itemVersionId: l.itemVersionId,
        taskId: l.taskId,
        group: l.groupKey,
        sku: l.sku,
        description: l.description,
        kind: l.kind,
        category: l.category,
        quantity: Number(l.quantity),
        unitCents: l.unitCents,
        taxable: l.taxable,
        grossCents: l.grossCents,
        savingsCents: l.savingsCents,
        chargedCents: l.chargedCents,
        rules: l.rules as CoverageRuleName[],
        reason: l.reason,
        stockLocationId: l.stockLocationId,
      })),
  }));
}

export async function revisionRow(db: Db | Tx, quoteId: string, revision: number): Promise<RevisionRow> {
  const [r] = await db
    .select()
    .from(quoteRevisions)
    .where(and(eq(quoteRevisions.quoteId, quoteId), eq(quoteRevisions.revision, revision)));
  if (!r) throw notFound('That quote revision');
  return r;
}

export async function quoteView(db: Db | Tx, q: QuoteRow, revision = q.revision): Promise<QuoteView> {
  const rev = await revisionRow(db, q.id, revision);
  const [c] = await db.select({ name: customers.name }).from(customers).where(eq(customers.id, q.customerId));
  const options = await optionViews(db, rev.id);
  const revs = await db.select().from(quoteRevisions).where(eq(quoteRevisions.quoteId, q.id)).orderBy(asc(quoteRevisions.revision));
  const totals = revs.length
    ? await db
        .select({ revisionId: quoteOptions.revisionId, total: quoteOptions.totalCents })
        .from(quoteOptions)
        .where(
          inArray(
            quoteOptions.revisionId,
            revs.map((r) => r.id),
          ),
        )
        .orderBy(asc(quoteOptions.position))
    : [];
  const [answer] = await db
    .select()
    .from(quoteApprovals)
    .where(and(eq(quoteApprovals.quoteId, q.id), eq(quoteApprovals.revision, revision)));
  const photos = rev.photoIds.length
    ? await db
        .select({ id: files.id, caption: files.caption, thumbKey: files.thumbKey })
        .from(files)
        .where(and(inArray(files.id, rev.photoIds), eq(files.visitId, q.visitId)))
    : [];
  const current = revision === q.revision;
  return {
    id: q.id,
    number: q.number,
    visitId: q.visitId,
    customerId: q.customerId,
    customerName: c?.name ?? '',
    propertyId: q.propertyId,
    equipmentId: rev.equipmentId,
    status: rev.status,
    statusLabel: QUOTE_STATUS_LABELS[rev.status],
    revision,
    note: rev.note,
    photos: photos.map((p) => ({ id: p.id, url: `/api/files/${p.id}`, thumbUrl: p.thumbKey ? `/api/files/${p.id}/thumb` : null, caption: p.caption })),
    options,
    coverageNotes: rev.coverageNotes,
    taxRateBps: rev.taxRateBps,
    validUntil: current ? q.validUntil : null,
    sentAt: current && q.sentAt ? q.sentAt.toISOString() : null,
    sentTo: current ? q.sentTo : null,
    approval:
      answer?.outcome === 'approved' ? { optionId: answer.optionId!, typedName: answer.typedName!, at: answer.at.toISOString(), ip: answer.ip, onDevice: answer.onDevice } : null,
    decline: answer?.outcome === 'declined' ? { reason: answer.declineReason!, at: answer.at.toISOString() } : null,
    invoiceId: q.invoiceId,
    followUpVisitRequestId: q.followUpVisitId,
    revisions: revs.map((r) => ({
      revision: r.revision,
      status: r.status,
      createdAt: r.createdAt.toISOString(),
      createdBy: r.createdBy,
      totalsCents: totals.filter((t) => t.revisionId === r.id).map((t) => t.total),
    })),
    createdAt: q.createdAt.toISOString(),
  };
}
