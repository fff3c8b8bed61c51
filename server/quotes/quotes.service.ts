import { and, desc, eq, gte, inArray, sql, type SQL } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { formatUsd } from '../../shared/money';
import { formatTermDay } from '../../shared/agreement-terms';
import { EDITABLE_QUOTE_STATUSES, type QuoteCreate, type QuoteListQuery, type QuoteSend, type QuoteStats, type QuoteUpdate, type QuoteView } from '../../shared/schemas/pricebook';
import type { PlanSavings, QuotePage, QuotePreview } from '../../shared/schemas/quotes';
import type { SessionUser } from '../../shared/schemas/session';
import type { AppDeps } from '../deps';
import type { Db, Tx } from '../db/client';
import { customers, files, invoices, quoteOptions, quoteRevisions, quotes, visits } from '../db/schema';
import { assertCustomerAccess, isStaffOffice } from '../auth/access';
import { AppError, notFound } from '../http/errors';
import { companyRow, localDate } from '../company/company';
import { queueMail } from '../mail/outbox';
import { renderEmail } from '../integrations/mail-layout';
import { coverageContext, invalidFields, priceOptions } from './pricing';
import { copyOptions, quoteView, revisionRow, writeOptions, type QuoteRow } from './quotes.store';
import { reachableVisit, technicianOf } from './visit-access';

type Deps = Pick<AppDeps, 'database' | 'clock'>;
export type MailDeps = Pick<AppDeps, 'database' | 'clock' | 'config' | 'mailer' | 'jobs' | 'logger'>;

export const frozen = (status: string) => new AppError(409, 'quote_frozen', `This quote is ${status}; start a new revision to change it.`);
export const staleRevision = () => new AppError(409, 'revision_conflict', 'This quote was changed on another device; reload it to see the latest revision.');

/** The quote, when this user may reach it: staff through the visit, a homeowner their own household's sent ones. */
export async function reachableQuote(db: Db | Tx, user: SessionUser, id: string, lock = false): Promise<QuoteRow> {
  const base = db.select().from(quotes).where(eq(quotes.id, id));
  const [q] = lock ? await base.for('update') : await base;
  if (!q) throw notFound('That quote');
  if (user.role === 'homeowner') {
    if (user.customerId !== q.customerId || q.status === 'draft') throw notFound('That quote');
  } else await reachableVisit(db, user, q.visitId);
  return q;
}

/** Every photo a quote shows is one taken on its visit; any other id is refused, naming its place in the list. */
async function assertVisitPhotos(tx: Tx, visitId: string, photoIds: readonly string[]): Promise<void> {
  if (!photoIds.length) return;
  const found = await tx
    .select({ id: files.id })
    .from(files)
    .where(and(inArray(files.id, [...new Set(photoIds)]), eq(files.visitId, visitId)));
  const ours = new Set(found.map((f) => f.id));
  const refused = photoIds.flatMap((id, i) => (ours.has(id) ? [] : [[`photoIds.${i}`, 'Choose a photo from this visit.'] as const]));
  if (refused.length) throw invalidFields(Object.fromEntries(refused));
}

async function build(tx: Tx, visitId: string, body: Omit<QuoteCreate, 'visitId'>) {
  await assertVisitPhotos(tx, visitId, body.photoIds);
  const [v] = await tx.select().from(visits).where(eq(visits.id, visitId));
  const { taxRateBps } = await companyRow(tx);
  const ctx = await coverageContext(tx, v!, body.equipmentId, taxRateBps);
  return { ctx, priced: await priceOptions(tx, body.options, ctx) };
}

export async function previewQuote(deps: Deps, user: SessionUser, body: QuoteCreate): Promise<QuotePreview> {
  const { db } = deps.database;
  return db.transaction(async (tx) => {
    await reachableVisit(tx, user, body.visitId);
    const { priced } = await build(tx, body.visitId, body);
    const views = priced.options.map((o, i) => ({
      id: `preview-${i + 1}`,
      title: o.title,
      description: o.description,
      subtotalCents: o.coverage.subtotalCents,
      savingsCents: o.coverage.savingsCents,
      taxableCents: o.coverage.taxableCents,
      taxCents: o.coverage.taxCents,
      totalCents: o.coverage.totalCents,
      lines: o.coverage.lines.map((l, k) => ({
        ...l,
        id: `preview-${i + 1}-${k + 1}`,
        itemId: o.lines[k]!.itemId,
        itemVersionId: o.lines[k]!.itemVersionId,
        taskId: o.lines[k]!.taskId,
        group: l.group ?? null,
        sku: o.lines[k]!.sku,
        stockLocationId: o.lines[k]!.stockLocationId,
      })),
    }));
    return { options: views, coverageNotes: priced.notes };
  });
}

export async function createQuote(deps: Deps, user: SessionUser, body: QuoteCreate): Promise<QuoteView> {
  const { db } = deps.database;
  const id = await db.transaction(async (tx) => {
    const visit = await reachableVisit(tx, user, body.visitId);
    const { ctx, priced } = await build(tx, body.visitId, body);
    const [q] = await tx.insert(quotes).values({ visitId: visit.id, customerId: visit.customerId, propertyId: visit.propertyId, createdBy: user.id }).returning({ id: quotes.id });
    const [rev] = await tx
      .insert(quoteRevisions)
      .values({
        quoteId: q!.id,
        revision: 1,
        equipmentId: body.equipmentId,
        note: body.note,
        photoIds: body.photoIds,
        validDays: body.validDays,
        taxRateBps: ctx.taxRateBps,
        coverageNotes: priced.notes,
        createdBy: user.id,
      })
      .returning({ id: quoteRevisions.id });
    await writeOptions(tx, rev!.id, priced.options);
    return q!.id;
  });
  return readQuote(deps, user, id);
}

export async function updateQuote(deps: Deps, user: SessionUser, id: string, body: QuoteUpdate): Promise<QuoteView> {
  const { db } = deps.database;
  await db.transaction(async (tx) => {
    const q = await reachableQuote(tx, user, id, true);
    if (!EDITABLE_QUOTE_STATUSES.includes(q.status)) throw frozen(q.status);
    if (body.revision !== q.revision) throw staleRevision();
    const { ctx, priced } = await build(tx, q.visitId, body);
    const rev = await revisionRow(tx, q.id, q.revision);
    await tx
      .update(quoteRevisions)
      .set({
        status: 'draft',
        equipmentId: body.equipmentId,
        note: body.note,
        photoIds: body.photoIds,
        validDays: body.validDays,
        taxRateBps: ctx.taxRateBps,
        coverageNotes: priced.notes,
      })
      .where(eq(quoteRevisions.id, rev.id));
    await writeOptions(tx, rev.id, priced.options);
    // A changed quote is sent again before the homeowner can answer it.
    await tx.update(quotes).set({ status: 'draft', updatedAt: deps.clock() }).where(eq(quotes.id, q.id));
  });
  return readQuote(deps, user, id);
}

/** A new draft revision copied from the current, frozen one; the earlier revision stays as it was. */
export async function reviseQuote(deps: Deps, user: SessionUser, id: string, revision: number): Promise<QuoteView> {
  const { db } = deps.database;
  await db.transaction(async (tx) => {
    const q = await reachableQuote(tx, user, id, true);
    if (revision !== q.revision) throw staleRevision();
    if (EDITABLE_QUOTE_STATUSES.includes(q.status)) throw new AppError(409, 'quote_editable', 'This quote can still be edited; no new revision is needed.');
    const from = await revisionRow(tx, q.id, q.revision);
    const { id: _id, createdAt: _c, ...rest } = from;
    const [rev] = await tx
      .insert(quoteRevisions)
      .values({ ...rest, revision: q.revision + 1, status: 'draft', createdBy: user.id })
      .returning({ id: quoteRevisions.id });
    await copyOptions(tx, from.id, rev!.id);
    await tx
      .update(quotes)
      .set({ revision: q.revision + 1, status: 'draft', sentAt: null, sentTo: null, validUntil: null, updatedAt: deps.clock() })
      .where(eq(quotes.id, q.id));
  });
  return readQuote(deps, user, id);
}

export async function readQuote(deps: Pick<AppDeps, 'database'>, user: SessionUser, id: string, revision?: number): Promise<QuoteView> {
  const { db } = deps.database;
  const q = await reachableQuote(db, user, id);
  if (revision !== undefined && (revision < 1 || revision > q.revision)) throw notFound('That quote revision');
  return quoteView(db, q, revision);
}

export async function sendQuote(deps: MailDeps, user: SessionUser, id: string, body: QuoteSend): Promise<QuoteView> {
  const { db } = deps.database;
  const mail = await db.transaction(async (tx) => {
    const q = await reachableQuote(tx, user, id, true);
    if (!EDITABLE_QUOTE_STATUSES.includes(q.status)) throw frozen(q.status);
    if (body.revision !== q.revision) throw staleRevision();
    const [c] = await tx.select({ email: customers.email, name: customers.name }).from(customers).where(eq(customers.id, q.customerId));
    const to = body.email ?? c?.email;
    if (!to) throw new AppError(422, 'validation_failed', 'Please check email.', { email: 'This household has no e-mail address; give one to send the quote to.' });
    const rev = await revisionRow(tx, q.id, q.revision);
    const company = await companyRow(tx);
    const now = deps.clock();
    const validUntil = DateTime.fromISO(localDate(now, company.timeZone)).plus({ days: rev.validDays }).toISODate()!;
    await tx.update(quotes).set({ status: 'sent', sentAt: now, sentTo: to, validUntil, updatedAt: now }).where(eq(quotes.id, q.id));
    await tx.update(quoteRevisions).set({ status: 'sent' }).where(eq(quoteRevisions.id, rev.id));
    const totals = await tx
      .select({ total: quoteOptions.totalCents, title: quoteOptions.title })
      .from(quoteOptions)
      .where(eq(quoteOptions.revisionId, rev.id))
      .orderBy(quoteOptions.position);
    const url = `${deps.config.publicUrl}/portal/quotes/${q.id}`;
    const content = renderEmail({
      title: `Your quote from ${company.name}`,
      paragraphs: [
        `Hello ${c?.name ?? ''},`,
        ...(rev.note ? [rev.note] : []),
        ...totals.map((t) => `${t.title}: ${formatUsd(t.total)}`),
        `The prices hold through ${formatTermDay(validUntil)}. Choose an option and approve it online, or tell us why not.`,
      ],
      action: { label: 'See the quote', url },
    });
    return { key: `quote-sent:${q.id}:${q.revision}`, to, subject: `Your quote #${q.number} from ${company.name}`, ...content };
  });
  await queueMail(deps, { kind: 'quote_sent', key: mail.key, message: { to: mail.to, subject: mail.subject, html: mail.html, text: mail.text } });
  return readQuote(deps, user, id);
}

const maxTotal = sql<number>`coalesce((select max(o.total_cents) from quote_options o join quote_revisions r on r.id = o.revision_id where r.quote_id = ${quotes.id} and r.revision = ${quotes.revision}), 0)::int`;

async function visibleWhere(db: Db | Tx, user: SessionUser): Promise<SQL | undefined> {
  if (isStaffOffice(user)) return undefined;
  if (user.role === 'homeowner') return and(eq(quotes.customerId, user.customerId ?? '00000000-0000-0000-0000-000000000000'), sql`${quotes.status} <> 'draft'`);
  const t = await technicianOf(db, user);
  return inArray(
    quotes.visitId,
    db
      .select({ id: visits.id })
      .from(visits)
      .where(eq(visits.technicianId, t?.id ?? '00000000-0000-0000-0000-000000000000')),
  );
}

export async function listQuotes(deps: Deps, user: SessionUser, q: QuoteListQuery): Promise<QuotePage> {
  const { db } = deps.database;
  const where: (SQL | undefined)[] = [await visibleWhere(db, user)];
  if (q.status === 'open') where.push(inArray(quotes.status, ['draft', 'sent']));
  else if (q.status) where.push(eq(quotes.status, q.status));
  if (q.customerId) where.push(eq(quotes.customerId, q.customerId));
  if (q.visitId) where.push(eq(quotes.visitId, q.visitId));
  const cond = and(...where);
  const [{ total }] = (await db
    .select({ total: sql<number>`count(*)::int` })
    .from(quotes)
    .where(cond)) as [{ total: number }];
  const order = { createdAt: quotes.createdAt, totalCents: maxTotal, status: quotes.status }[q.sort];
  const rows = await db
    .select({ q: quotes, customerName: customers.name, totalCents: maxTotal })
    .from(quotes)
    .innerJoin(customers, eq(quotes.customerId, customers.id))
    .where(cond)
    .orderBy(q.dir === 'asc' ? sql`${order} asc` : sql`${order} desc`, desc(quotes.createdAt))
    .limit(q.pageSize)
    .offset(q.page * q.pageSize);
  const now = deps.clock().getTime();
  return {
    items: rows.map((r) => ({
      id: r.q.id,
      number: r.q.number,
      customerName: r.customerName,
      status: r.q.status,
      revision: r.q.revision,
      totalCents: r.totalCents,
      ageDays: Math.floor((now - r.q.createdAt.getTime()) / 86_400_000),
      createdAt: r.q.createdAt.toISOString(),
    })),
    total,
    page: q.page,
    pageSize: q.pageSize,
  };
}

export async function quoteStats(deps: Deps, periodDays: number): Promise<QuoteStats> {
  const { db } = deps.database;
  const since = new Date(deps.clock().getTime() - periodDays * 86_400_000);
  const [open] = await db
    .select({ count: sql<number>`count(*)::int`, value: sql<number>`coalesce(sum(${maxTotal}), 0)::int` })
    .from(quotes)
    .where(inArray(quotes.status, ['draft', 'sent']));
  const [done] = await db
    .select({
      approved: sql<number>`count(*) filter (where ${quotes.status} = 'approved')::int`,
      decided: sql<number>`count(*) filter (where ${quotes.status} in ('approved', 'declined', 'expired'))::int`,
    })
    .from(quotes)
    .where(gte(quotes.createdAt, since));
  return { open: { count: open!.count, valueCents: open!.value }, approvalRateBps: done!.decided ? Math.round((done!.approved * 10_000) / done!.decided) : null, periodDays };
}

/** "Your plan saved you $X this year": the discounts on the household's issued service invoices this calendar year. */
export async function planSavings(deps: Deps, user: SessionUser, customerId: string): Promise<PlanSavings> {
  const { db } = deps.database;
  await assertCustomerAccess(db, user, customerId);
  const { timeZone } = await companyRow(db);
  const year = DateTime.fromJSDate(deps.clock(), { zone: timeZone }).year;
  const start = DateTime.fromObject({ year, month: 1, day: 1 }, { zone: timeZone }).toJSDate();
  const [row] = await db
    .select({ cents: sql<number>`coalesce(sum(${invoices.discountCents}), 0)::int`, n: sql<number>`count(*) filter (where ${invoices.discountCents} > 0)::int` })
    .from(invoices)
    .where(
      and(
        eq(invoices.customerId, customerId),
        eq(invoices.purpose, 'service'),
        inArray(invoices.status, ['open', 'paid', 'partially_refunded', 'refunded']),
        gte(invoices.issuedAt, start),
      ),
    );
  const cents = row!.cents;
  return {
    customerId,
    year,
    savingsCents: cents,
    invoiceCount: row!.n,
    sentence: cents > 0 ? `Your plan saved you ${formatUsd(cents)} this year.` : `No plan savings on repairs yet in ${year}.`,
  };
}
