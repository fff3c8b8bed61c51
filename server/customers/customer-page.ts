import { and, eq, ne, sql, type Placeholder, type SQL } from 'drizzle-orm';
import { AGREEMENT_STATUS_LABELS } from '../../shared/agreements';
import { EQUIPMENT_KIND_LABELS } from '../../shared/equipment';
import { formatUsd } from '../../shared/money';
import type { Contact, ContactInput, CustomerCreate, CustomerDetail, CustomerUpdate, Note, NoteInput, TimelineEntry } from '../../shared/schemas/customers';
import type { SessionUser } from '../../shared/schemas/session';
import { VISIT_REASON_LABELS, VISIT_STATUS_LABELS, windowMissed } from '../../shared/visits';
import type { Db } from '../db/client';
import { agreements, contacts, customerNotes, customers, equipment, files, invoices, properties } from '../db/schema';
import { fromJsonRow } from '../db/json-rows';
import { preparedSql } from '../db/prepared-sql';
import { toEquipment } from '../equipment/equipment.service';
import { AppError, conflict, notFound } from '../http/errors';
import { ownedProperty } from '../http/ownership';
import { localDate, notSetUp } from '../company/company';
import { assembleTerms, termRowsJson, termViewsFrom, type TermRow } from '../agreements/term-in-force';
import { coveredThroughLabel, lastPaidTerm, termRangeLabel } from '../../shared/agreement-terms';
import type { AppDeps } from '../deps';
import { customerRow, duplicateEmail, iso, toContact, toFile, toProperty } from './customer-views';

// ---- Create, read, update ----

export async function createCustomer(deps: Pick<AppDeps, 'database'>, input: CustomerCreate): Promise<{ id: string; propertyId: string | null }> {
  const { db } = deps.database;
  return db
    .transaction(async (tx) => {
      const [c] = await tx.insert(customers).values({ name: input.name, email: input.email, phone: input.phone, notes: input.notes }).returning({ id: customers.id });
      let propertyId: string | null = null;
      if (input.property) {
        const [p] = await tx
          .insert(properties)
          .values({ ...input.property, customerId: c!.id })
          .returning({ id: properties.id });
        propertyId = p!.id;
      }
      return { id: c!.id, propertyId };
    })
    .catch(duplicateEmail);
}

/** A visit of the household as a statement reads it (snake_case columns, instants as Date or text). */
export type CustomerVisitRow = {
  id: string;
  property_id: string;
  kind: string;
  reason: string;
  status: string;
  starts_at: Date | string;
  window_start: Date | string;
  window_end: Date | string;
  completed_at: Date | string | null;
  findings: string;
  recommendations: string;
  technician_name: string | null;
};

/** A household's visits as one JSON array of CustomerVisitRow, newest window first: a subquery for statements that bring several things. */
export function customerVisitsJson(customerId: string | Placeholder): SQL {
  return sql`(select coalesce(json_agg(x order by x.window_start desc, x.id), '[]') from (
    select v.id, v.property_id, v.kind, v.reason, v.status, v.starts_at, v.window_start, v.window_end, v.completed_at, v.findings, v.recommendations, u.name as technician_name
    from visits v left join technicians t on t.id = v.technician_id left join users u on u.id = t.user_id
    where v.customer_id = ${customerId}) x)`;
}

/** A household's visits, newest first, with labels and the technician's name. */
export async function customerVisits(db: Db, customerId: string, now: Date): Promise<CustomerDetail['visits']> {
  const { rows } = await db.execute<{ visits: CustomerVisitRow[] }>(sql`select ${customerVisitsJson(customerId)} as visits`);
  return rows[0]!.visits.map((v) => customerVisit(v, now));
}

export function customerVisit(v: CustomerVisitRow, now: Date): CustomerDetail['visits'][number] {
  return {
    id: v.id,
    propertyId: v.property_id,
    kind: v.kind,
    reason: v.reason,
    reasonLabel: VISIT_REASON_LABELS[v.reason as keyof typeof VISIT_REASON_LABELS] ?? v.reason,
    status: v.status,
    statusLabel: VISIT_STATUS_LABELS[v.status as keyof typeof VISIT_STATUS_LABELS] ?? v.status,
    startsAt: new Date(v.starts_at).toISOString(),
    windowStart: new Date(v.window_start).toISOString(),
    windowEnd: new Date(v.window_end).toISOString(),
    windowMissed: windowMissed({ status: v.status, windowEnd: new Date(v.window_end) }, now),
    findings: v.findings,
    recommendations: v.recommendations,
    technicianName: v.technician_name,
  };
}

type JsonRow = Record<string, unknown>;
type CustomerPageRow = {
  customer: JsonRow | null;
  time_zone: string | null;
  contacts: JsonRow[];
  properties: JsonRow[];
  equipment: JsonRow[];
  agreements: { a: JsonRow; plan: string }[];
  terms: TermRow[];
  plan_names: Record<string, string>;
  visits: CustomerVisitRow[];
  invoices: JsonRow[];
  notes: { n: JsonRow; author: string | null }[];
  files: JsonRow[];
};

// The household with everything it holds, and the company's zone for "today": one statement,
// with or without what was archived.
function customerPageSql(p: { id: Placeholder<'id'> }, includeArchived: boolean): SQL {
  const archived = (t: string) => (includeArchived ? sql`true` : sql.raw(`${t}.archived_at is null`));
  return sql`
    select
      (select to_json(c) from customers c where c.id = ${p.id}) as customer,
      (select time_zone from company where id = 1) as time_zone,
      (select coalesce(json_agg(x order by x.is_primary desc, x.created_at), '[]') from contacts x where x.customer_id = ${p.id}) as contacts,
      (select coalesce(json_agg(x order by x.created_at, x.id), '[]') from properties x where x.customer_id = ${p.id} and ${archived('x')}) as properties,
      (select coalesce(json_agg(e order by e.created_at, e.id), '[]')
         from equipment e join properties x on x.id = e.property_id
         where x.customer_id = ${p.id} and ${archived('x')} and ${archived('e')}) as equipment,
      (select coalesce(json_agg(json_build_object('a', to_json(a), 'plan', pl.name) order by a.starts_on desc), '[]')
         from agreements a join plan_versions pv on pv.id = a.plan_version_id join plans pl on pl.id = pv.plan_id
         where a.customer_id = ${p.id}) as agreements,
      ${termRowsJson(sql`t.agreement_id in (select a.id from agreements a where a.customer_id = ${p.id})`)} as terms,
      (select coalesce(json_object_agg(pv.id, pl.name), '{}')
         from plan_versions pv join plans pl on pl.id = pv.plan_id
         where pv.id in (select t.plan_version_id from agreement_terms t join agreements a on a.id = t.agreement_id where a.customer_id = ${p.id}
                         union select a.plan_version_id from agreements a where a.customer_id = ${p.id})) as plan_names,
      ${customerVisitsJson(p.id)} as visits,
      (select coalesce(json_agg(x order by x.created_at desc), '[]') from invoices x where x.customer_id = ${p.id}) as invoices,
      (select coalesce(json_agg(json_build_object('n', to_json(n), 'author', u.name) order by n.created_at desc), '[]')
         from customer_notes n left join users u on u.id = n.author_user_id where n.customer_id = ${p.id}) as notes,
      (select coalesce(json_agg(x order by x.created_at desc), '[]') from files x where x.customer_id = ${p.id} and x.archived_at is null) as files`;
}
const customerPageStatement = preparedSql<CustomerPageRow, 'id'>('customer_page', ['id'], (p) => customerPageSql(p, false));
const customerPageWithArchived = preparedSql<CustomerPageRow, 'id'>('customer_page_archived', ['id'], (p) => customerPageSql(p, true));

/** Everything about one household, with one timeline across its records (newest first). */
export async function getCustomer(deps: Pick<AppDeps, 'database' | 'clock'>, id: string, opts: { includeArchived?: boolean } = {}): Promise<CustomerDetail> {
  const { db } = deps.database;
  const now = deps.clock();
  const {
    rows: [r],
  } = await (opts.includeArchived ? customerPageWithArchived : customerPageStatement)(db, { id });
  if (!r?.customer) throw notFound('That household');
  if (r.time_zone === null) throw notSetUp();
  const c = fromJsonRow(customers, r.customer);
  const today = localDate(now, r.time_zone);
  const contactRows = r.contacts.map((x) => fromJsonRow(contacts, x));
  const propertyRows = r.properties.map((x) => fromJsonRow(properties, x));
  const agreementRows = r.agreements.map((x) => ({ a: fromJsonRow(agreements, x.a), plan: x.plan }));
  const visitRows = r.visits.map((v) => customerVisit(v, now));
  const invoiceRows = r.invoices.map((x) => fromJsonRow(invoices, x));
  const noteRows = r.notes.map((x) => ({ n: fromJsonRow(customerNotes, x.n), author: x.author }));
  const fileRows = r.files.map((x) => fromJsonRow(files, x));
  const equipmentRows = r.equipment.map((x) => toEquipment(fromJsonRow(equipment, x), today));
  const propertyOut = propertyRows.map((p) => ({ ...toProperty(p), equipment: equipmentRows.filter((e) => e.propertyId === p.id) }));
  const visitOut = visitRows;
  const termViews = termViewsFrom(
    assembleTerms(
      agreementRows.map(({ a }) => a),
      r.terms,
    ),
    new Map(Object.entries(r.plan_names)),
    today,
  );
  const agreementOut = agreementRows.map(({ a, plan }) => ({
    id: a.id,
    propertyId: a.propertyId,
    plan,
    status: a.status,
    statusLabel: AGREEMENT_STATUS_LABELS[a.status],
    startsOn: a.startsOn,
    endsOn: a.endsOn,
    lastDayLabel: coveredThroughLabel(lastPaidTerm(termViews.get(a.id)!) ?? a),
    priceCents: a.priceCents,
    terms: termViews.get(a.id)!,
  }));
  const invoiceOut = invoiceRows.map((i) => ({
    id: i.id,
    number: i.number,
    status: i.status,
    totalCents: i.totalCents,
    paidCents: i.paidCents,
    issuedAt: iso(i.issuedAt),
    createdAt: i.createdAt.toISOString(),
  }));
  const noteOut: Note[] = noteRows.map(({ n, author }) => ({
    id: n.id,
    body: n.body,
    audience: n.audience,
    propertyId: n.propertyId,
    authorName: author,
    createdAt: n.createdAt.toISOString(),
  }));
  const fileOut = fileRows.map(toFile);

  const timeline: TimelineEntry[] = [
    { at: c.createdAt.toISOString(), kind: 'created' as const, title: 'Household added', detail: c.name, refId: c.id },
    ...propertyRows.map((p) => ({
      at: p.createdAt.toISOString(),
      kind: 'property' as const,
      title: `Property added: ${p.label}`,
      detail: `${p.street}, ${p.city}, ${p.state} ${p.zip}`,
      refId: p.id,
    })),
    ...equipmentRows.map((e) => ({
      at: e.installedOn ? `${e.installedOn}T12:00:00.000Z` : c.createdAt.toISOString(),
      kind: 'equipment' as const,
      title: `${e.installedOn ? 'Installed' : 'Recorded'}: ${EQUIPMENT_KIND_LABELS[e.kind]}`,
      detail: [e.make, e.model].filter(Boolean).join(' '),
      refId: e.id,
    })),
    ...agreementOut.map((a) => ({
      at: `${a.startsOn}T12:00:00.000Z`,
      kind: 'agreement' as const,
      title: `Agreement: ${a.plan}`,
      detail: `${a.statusLabel}, ${termRangeLabel(a)}`,
      refId: a.id,
    })),
    ...visitOut.map((v) => ({
      at: v.startsAt,
      kind: 'visit' as const,
      title: `${v.reasonLabel} visit (${v.statusLabel})${v.windowMissed ? ' · window passed, not started' : ''}`,
      detail: [v.findings, v.recommendations && `Recommended: ${v.recommendations}`].filter(Boolean).join(' '),
      refId: v.id,
    })),
    ...invoiceOut.map((i) => ({
      at: i.issuedAt ?? i.createdAt,
      kind: 'invoice' as const,
      title: i.number ? `Invoice ${i.number}` : 'Draft invoice',
      detail: `${formatUsd(i.totalCents)}, ${i.status}`,
      refId: i.id,
    })),
    ...noteOut.map((n) => ({
      at: n.createdAt,
      kind: 'note' as const,
      title: n.audience === 'technician' ? 'Note for the technician' : 'Office note',
      detail: n.body,
      refId: n.id,
    })),
    ...fileOut.map((f) => ({
      at: f.createdAt,
      kind: 'file' as const,
      title: `${f.contentType === 'application/pdf' ? 'Document' : 'Photo'} added`,
      detail: f.originalName,
      refId: f.id,
    })),
    ...(c.archivedAt
      ? [
          {
            at: c.archivedAt.toISOString(),
            kind: (c.mergedIntoId ? 'merged' : 'archived') as TimelineEntry['kind'],
            title: c.mergedIntoId ? 'Merged into another household' : 'Archived',
            detail: '',
            refId: c.mergedIntoId,
          },
        ]
      : []),
  ].sort((a, b) => (a.at < b.at ? 1 : a.at > b.at ? -1 : 0));

  return {
    id: c.id,
    name: c.name,
    email: c.email,
    phone: c.phone,
    notes: c.notes,
    archived: c.archivedAt !== null,
    mergedIntoId: c.mergedIntoId,
    createdAt: c.createdAt.toISOString(),
    contacts: contactRows.map(toContact),
    properties: propertyOut,
    agreements: agreementOut,
    visits: visitOut,
    invoices: invoiceOut,
    householdNotes: noteOut,
    files: fileOut,
    timeline,
  };
}

export async function updateCustomer(deps: Pick<AppDeps, 'database'>, id: string, input: CustomerUpdate): Promise<void> {
  const { db } = deps.database;
  const c = await customerRow(db, id);
  if (c.mergedIntoId) throw conflict('This household was merged into another; edit that one instead.');
  const email = input.email !== undefined ? input.email : c.email;
  const phone = input.phone !== undefined ? input.phone : c.phone;
  if (email === null && phone === null)
    throw new AppError(422, 'validation_failed', 'Please check email.', { email: 'Give an e-mail address or a phone number so we can reach the household.' });
  await db
    .update(customers)
    .set({ ...input, updatedAt: new Date() })
    .where(eq(customers.id, id))
    .catch(duplicateEmail);
}

/** Archive hides a household from lists and booking; nothing is deleted, so its history stays. */
export async function setCustomerArchived(deps: Pick<AppDeps, 'database' | 'clock'>, id: string, archived: boolean): Promise<void> {
  const { db } = deps.database;
  const now = deps.clock();
  const c = await customerRow(db, id);
  if (c.mergedIntoId && !archived) throw conflict('This household was merged into another and stays archived.');
  await db
    .update(customers)
    .set({ archivedAt: archived ? (c.archivedAt ?? now) : null, updatedAt: now })
    .where(eq(customers.id, id))
    .catch(duplicateEmail);
}

// ---- Contacts and notes ----

export async function addContact(deps: Pick<AppDeps, 'database'>, customerId: string, input: ContactInput): Promise<Contact> {
  const { db } = deps.database;
  await customerRow(db, customerId);
  return db.transaction(async (tx) => {
    if (input.isPrimary) await tx.update(contacts).set({ isPrimary: false }).where(eq(contacts.customerId, customerId));
    const [row] = await tx
      .insert(contacts)
      .values({ ...input, customerId })
      .returning();
    return toContact(row!);
  });
}

export async function updateContact(deps: Pick<AppDeps, 'database'>, customerId: string, contactId: string, input: ContactInput): Promise<Contact> {
  const { db } = deps.database;
  return db.transaction(async (tx) => {
    if (input.isPrimary)
      await tx
        .update(contacts)
        .set({ isPrimary: false })
        .where(and(eq(contacts.customerId, customerId), ne(contacts.id, contactId)));
    const [row] = await tx
      .update(contacts)
      .set(input)
      .where(and(eq(contacts.id, contactId), eq(contacts.customerId, customerId)))
      .returning();
    if (!row) throw notFound('That contact');
    return toContact(row);
  });
}

/** A contact has no history of its own, so it may be removed outright. */
export async function removeContact(deps: Pick<AppDeps, 'database'>, customerId: string, contactId: string): Promise<void> {
  const { db } = deps.database;
  const rows = await db
    .delete(contacts)
    .where(and(eq(contacts.id, contactId), eq(contacts.customerId, customerId)))
    .returning({ id: contacts.id });
  if (!rows.length) throw notFound('That contact');
}

export async function addNote(deps: Pick<AppDeps, 'database'>, customerId: string, user: SessionUser, input: NoteInput): Promise<Note> {
  const { db } = deps.database;
  await customerRow(db, customerId);
  if (input.propertyId) await ownedProperty(db, user, input.propertyId, 'propertyId', { within: customerId, archivedToo: true, what: 'That home' });
  const [row] = await db.insert(customerNotes).values({ customerId, propertyId: input.propertyId, audience: input.audience, body: input.body, authorUserId: user.id }).returning();
  return { id: row!.id, body: row!.body, audience: row!.audience, propertyId: row!.propertyId, authorName: user.name, createdAt: row!.createdAt.toISOString() };
}
