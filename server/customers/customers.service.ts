import { and, asc, desc, eq, inArray, isNotNull, isNull, ne, sql, type SQL } from 'drizzle-orm';
import { AGREEMENT_STATUS_LABELS } from '../../shared/agreements';
import { EQUIPMENT_KIND_LABELS } from '../../shared/equipment';
import type {
  Contact,
  ContactInput,
  CustomerCreate,
  CustomerDetail,
  CustomerListQuery,
  CustomerPage,
  CustomerUpdate,
  Note,
  NoteInput,
  Property,
  PropertyInput,
  PropertyUpdate,
  StoredFile,
  TimelineEntry,
} from '../../shared/schemas/customers';
import type { SessionUser } from '../../shared/schemas/session';
import { VISIT_REASON_LABELS, VISIT_STATUS_LABELS } from '../../shared/visits';
import type { Db, Tx } from '../db/client';
import { agreements, contacts, customerNotes, customers, files, invoices, planVersions, plans, properties, users, visits } from '../db/schema';
import { equipmentForProperties } from '../equipment/equipment.service';
import { AppError, conflict, notFound } from '../http/errors';
import { companyToday } from '../company/company';
import type { AppDeps } from '../deps';

type CustomerRow = typeof customers.$inferSelect;
type PropertyRow = typeof properties.$inferSelect;

const iso = (d: Date | null) => (d ? d.toISOString() : null);

export function toProperty(p: PropertyRow): Property {
  return {
    id: p.id,
    customerId: p.customerId,
    label: p.label,
    street: p.street,
    unit: p.unit,
    city: p.city,
    state: p.state,
    zip: p.zip,
    area: p.area,
    accessNotes: p.accessNotes,
    gateCode: p.gateCode,
    pets: p.pets,
    archived: p.archivedAt !== null,
  };
}

export function toFile(f: typeof files.$inferSelect): StoredFile {
  return {
    id: f.id,
    category: f.category,
    contentType: f.contentType,
    originalName: f.originalName,
    sizeBytes: f.sizeBytes,
    width: f.width,
    height: f.height,
    caption: f.caption,
    propertyId: f.propertyId,
    equipmentId: f.equipmentId,
    visitId: f.visitId,
    url: `/api/files/${f.id}`,
    thumbUrl: f.thumbKey ? `/api/files/${f.id}/thumb` : null,
    createdAt: f.createdAt.toISOString(),
  };
}

const toContact = (c: typeof contacts.$inferSelect): Contact => ({ id: c.id, name: c.name, relationship: c.relationship, email: c.email, phone: c.phone, isPrimary: c.isPrimary });

/** A duplicate live e-mail answers 409 naming the field, not a bare constraint name. */
function duplicateEmail(err: unknown): never {
  const e = err as { cause?: { code?: string; constraint?: string } };
  if (e?.cause?.code === '23505' && e.cause.constraint === 'customers_live_email_key') {
    throw new AppError(409, 'duplicate', 'Another household already uses that e-mail address. Open it, or merge the two.', { email: 'Another household already uses this e-mail address.' });
  }
  throw err;
}

// ---- Search and list ----

const escapeLike = (s: string) => s.replace(/[\\%_]/g, (c) => `\\${c}`);

/**
 * Search terms against the one indexed search column. A phone number typed with dashes or
 * brackets matches by its digits; several words must all match (name plus street, say).
 */
export function searchTerms(q: string): string[] {
  const trimmed = q.trim().toLowerCase();
  if (/^[\d\s().+-]+$/.test(trimmed) && trimmed.replace(/\D/g, '').length >= 3) return [trimmed.replace(/\D/g, '')];
  return trimmed.split(/\s+/).filter(Boolean).slice(0, 6);
}

export function searchWhere(q: string | undefined): SQL | undefined {
  if (!q) return undefined;
  const terms = searchTerms(q);
  if (!terms.length) return undefined;
  return and(...terms.map((t) => sql`${customers.searchText} ilike ${`%${escapeLike(t)}%`}`));
}

// Written out in full: drizzle renders ${'$'}{customers.id} unqualified in a select list, where "id" would mean p.id.
const firstProperty = (col: 'street' | 'city') =>
  sql<string | null>`(select p.${sql.raw(col)} from properties p where p.customer_id = "customers"."id" and p.archived_at is null order by p.created_at, p.id limit 1)`;

export async function listCustomers(deps: Pick<AppDeps, 'database'>, q: CustomerListQuery): Promise<CustomerPage> {
  const { db } = deps.database;
  const where = and(
    q.status === 'active' ? isNull(customers.archivedAt) : q.status === 'archived' ? isNotNull(customers.archivedAt) : undefined,
    searchWhere(q.q),
  );
  const street = firstProperty('street');
  const city = firstProperty('city');
  const sortCol = { name: sql`lower(${customers.name})`, email: sql`lower(${customers.email})`, createdAt: sql`${customers.createdAt}`, city }[q.sort];
  const dir = q.dir === 'desc' ? desc : asc;
  const [rows, [count]] = await Promise.all([
    db
      .select({
        id: customers.id,
        name: customers.name,
        email: customers.email,
        phone: customers.phone,
        street,
        city,
        propertyCount: sql<number>`(select count(*)::int from properties p where p.customer_id = "customers"."id" and p.archived_at is null)`,
        archivedAt: customers.archivedAt,
        createdAt: customers.createdAt,
      })
      .from(customers)
      .where(where)
      .orderBy(q.dir === 'desc' ? sql`${sortCol} desc nulls last` : sql`${sortCol} asc nulls last`, dir(customers.id))
      .limit(q.pageSize)
      .offset(q.page * q.pageSize),
    db.select({ n: sql<number>`count(*)::int` }).from(customers).where(where),
  ]);
  return {
    items: rows.map(({ archivedAt, createdAt, ...r }) => ({ ...r, archived: archivedAt !== null, createdAt: createdAt.toISOString() })),
    total: count?.n ?? 0,
    page: q.page,
    pageSize: q.pageSize,
  };
}

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

async function customerRow(db: Db | Tx, id: string): Promise<CustomerRow> {
  const [c] = await db.select().from(customers).where(eq(customers.id, id)).limit(1);
  if (!c) throw notFound('That household');
  return c;
}


/** Everything about one household, with one timeline across its records (newest first). */
export async function getCustomer(deps: Pick<AppDeps, 'database' | 'clock'>, id: string, opts: { includeArchived?: boolean } = {}): Promise<CustomerDetail> {
  const { db } = deps.database;
  const now = deps.clock();
  const c = await customerRow(db, id);
  const today = await companyToday(deps);
  const [contactRows, propertyRows, agreementRows, visitRows, invoiceRows, noteRows, fileRows] = await Promise.all([
    db.select().from(contacts).where(eq(contacts.customerId, id)).orderBy(desc(contacts.isPrimary), asc(contacts.createdAt)),
    db
      .select()
      .from(properties)
      .where(and(eq(properties.customerId, id), opts.includeArchived ? undefined : isNull(properties.archivedAt)))
      .orderBy(asc(properties.createdAt), asc(properties.id)),
    db
      .select({ a: agreements, plan: plans.name })
      .from(agreements)
      .innerJoin(planVersions, eq(agreements.planVersionId, planVersions.id))
      .innerJoin(plans, eq(planVersions.planId, plans.id))
      .where(eq(agreements.customerId, id))
      .orderBy(desc(agreements.startsOn)),
    db.execute<{ id: string; property_id: string; kind: string; reason: string; status: string; starts_at: Date; completed_at: Date | null; findings: string; recommendations: string; technician_name: string | null }>(sql`
      select v.id, v.property_id, v.kind, v.reason, v.status, v.starts_at, v.completed_at, v.findings, v.recommendations, u.name as technician_name
      from visits v left join technicians t on t.id = v.technician_id left join users u on u.id = t.user_id
      where v.customer_id = ${id} order by v.starts_at desc`),
    db.select().from(invoices).where(eq(invoices.customerId, id)).orderBy(desc(invoices.createdAt)),
    db
      .select({ n: customerNotes, author: users.name })
      .from(customerNotes)
      .leftJoin(users, eq(customerNotes.authorUserId, users.id))
      .where(eq(customerNotes.customerId, id))
      .orderBy(desc(customerNotes.createdAt)),
    db
      .select()
      .from(files)
      .where(and(eq(files.customerId, id), isNull(files.archivedAt)))
      .orderBy(desc(files.createdAt)),
  ]);
  const equipmentRows = await equipmentForProperties(
    db,
    propertyRows.map((p) => p.id),
    today,
    opts.includeArchived,
  );
  const propertyOut = propertyRows.map((p) => ({ ...toProperty(p), equipment: equipmentRows.filter((e) => e.propertyId === p.id) }));
  const visitOut = visitRows.rows.map((v) => ({
    id: v.id,
    propertyId: v.property_id,
    kind: v.kind,
    reason: v.reason,
    reasonLabel: VISIT_REASON_LABELS[v.reason as keyof typeof VISIT_REASON_LABELS] ?? v.reason,
    status: v.status,
    statusLabel: VISIT_STATUS_LABELS[v.status as keyof typeof VISIT_STATUS_LABELS] ?? v.status,
    startsAt: new Date(v.starts_at).toISOString(),
    findings: v.findings,
    recommendations: v.recommendations,
    technicianName: v.technician_name,
  }));
  const agreementOut = agreementRows.map(({ a, plan }) => ({ id: a.id, propertyId: a.propertyId, plan, status: a.status, statusLabel: AGREEMENT_STATUS_LABELS[a.status], startsOn: a.startsOn, endsOn: a.endsOn, priceCents: a.priceCents }));
  const invoiceOut = invoiceRows.map((i) => ({ id: i.id, number: i.number, status: i.status, totalCents: i.totalCents, paidCents: i.paidCents, issuedAt: iso(i.issuedAt), createdAt: i.createdAt.toISOString() }));
  const noteOut: Note[] = noteRows.map(({ n, author }) => ({ id: n.id, body: n.body, audience: n.audience, propertyId: n.propertyId, authorName: author, createdAt: n.createdAt.toISOString() }));
  const fileOut = fileRows.map(toFile);

  const timeline: TimelineEntry[] = [
    { at: c.createdAt.toISOString(), kind: 'created' as const, title: 'Household added', detail: c.name, refId: c.id },
    ...propertyRows.map((p) => ({ at: p.createdAt.toISOString(), kind: 'property' as const, title: `Property added: ${p.label}`, detail: `${p.street}, ${p.city}, ${p.state} ${p.zip}`, refId: p.id })),
    ...equipmentRows.map((e) => ({
      at: e.installedOn ? `${e.installedOn}T12:00:00.000Z` : c.createdAt.toISOString(),
      kind: 'equipment' as const,
      title: `${e.installedOn ? 'Installed' : 'Recorded'}: ${EQUIPMENT_KIND_LABELS[e.kind]}`,
      detail: [e.make, e.model].filter(Boolean).join(' '),
      refId: e.id,
    })),
    ...agreementOut.map((a) => ({ at: `${a.startsOn}T12:00:00.000Z`, kind: 'agreement' as const, title: `Agreement: ${a.plan}`, detail: `${a.statusLabel}, ${a.startsOn} to ${a.endsOn}`, refId: a.id })),
    ...visitOut.map((v) => ({ at: v.startsAt, kind: 'visit' as const, title: `${v.reasonLabel} visit (${v.statusLabel})`, detail: [v.findings, v.recommendations && `Recommended: ${v.recommendations}`].filter(Boolean).join(' '), refId: v.id })),
    ...invoiceOut.map((i) => ({ at: i.issuedAt ?? i.createdAt, kind: 'invoice' as const, title: i.number ? `Invoice ${i.number}` : 'Draft invoice', detail: `${(i.totalCents / 100).toFixed(2)} USD, ${i.status}`, refId: i.id })),
    ...noteOut.map((n) => ({ at: n.createdAt, kind: 'note' as const, title: n.audience === 'technician' ? 'Note for the technician' : 'Office note', detail: n.body, refId: n.id })),
    ...fileOut.map((f) => ({ at: f.createdAt, kind: 'file' as const, title: `${f.contentType === 'application/pdf' ? 'Document' : 'Photo'} added`, detail: f.originalName, refId: f.id })),
    ...(c.archivedAt ? [{ at: c.archivedAt.toISOString(), kind: (c.mergedIntoId ? 'merged' : 'archived') as TimelineEntry['kind'], title: c.mergedIntoId ? 'Merged into another household' : 'Archived', detail: '', refId: c.mergedIntoId }] : []),
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
  if (email === null && phone === null) throw new AppError(422, 'validation_failed', 'Please check email.', { email: 'Give an e-mail address or a phone number so we can reach the household.' });
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

// ---- Merge ----

interface ForeignKey {
  table: string;
  column: string;
}

/** Every single-column foreign key that points at customers.id, whichever feature owns the table. */
async function customerReferences(tx: Tx): Promise<ForeignKey[]> {
  const res = await tx.execute<{ table: string; column: string }>(sql`
    select cl.relname as table, a.attname as column
    from pg_constraint c
    join pg_class cl on cl.oid = c.conrelid
    join pg_namespace n on n.oid = cl.relnamespace and n.nspname = current_schema()
    join pg_attribute a on a.attrelid = c.conrelid and a.attnum = c.conkey[1]
    where c.contype = 'f' and c.confrelid = 'customers'::regclass and array_length(c.conkey, 1) = 1
    order by cl.relname, a.attname`);
  return res.rows.filter((r) => !(r.table === 'customers' && r.column === 'merged_into_id'));
}

export interface MergeResult {
  targetId: string;
  sourceId: string;
  moved: Record<string, number>;
  /** Rows that could not move because the target already has its own (one-per-household rows). */
  keptOnSource: string[];
}

/**
 * Moves every record of the duplicate (source) onto the kept household (target), in one
 * transaction: properties with their equipment, agreements, visits, invoices, contacts, notes,
 * files and portal sign-ins. The source is archived and points at the target.
 */
export async function mergeCustomers(deps: Pick<AppDeps, 'database' | 'clock'>, targetId: string, sourceId: string, user: SessionUser): Promise<MergeResult> {
  const { db } = deps.database;
  const now = deps.clock();
  if (targetId === sourceId) throw new AppError(422, 'validation_failed', 'Please check sourceId.', { sourceId: 'Choose a different household to merge in.' });
  return db.transaction(async (tx) => {
    // Lock both in a fixed order so two merges of the same pair cannot deadlock.
    const locked = await tx.execute<{ id: string }>(sql`select id from customers where id in (${targetId}, ${sourceId}) order by id for update`);
    if (locked.rows.length !== 2) throw notFound('That household');
    const target = await customerRow(tx, targetId);
    const source = await customerRow(tx, sourceId);
    if (target.archivedAt) throw conflict('The household you keep is archived; restore it first.');
    if (source.mergedIntoId) throw conflict('That household was already merged.');

    const moved: Record<string, number> = {};
    const keptOnSource: string[] = [];
    for (const fk of await customerReferences(tx)) {
      const table = sql.identifier(fk.table);
      const column = sql.identifier(fk.column);
      try {
        const res = await tx.transaction((sp) => sp.execute(sql`update ${table} set ${column} = ${targetId} where ${column} = ${sourceId}`));
        if (res.rowCount) moved[fk.table] = (moved[fk.table] ?? 0) + res.rowCount;
      } catch (err) {
        const code = (err as { cause?: { code?: string } }).cause?.code ?? (err as { code?: string }).code;
        if (code !== '23505') throw err;
        keptOnSource.push(fk.table);
      }
    }

    // The duplicate's own details become a contact on the kept household, so none are lost.
    const sameEmail = !source.email || source.email === target.email;
    const samePhone = !source.phone || source.phone === target.phone;
    await tx
      .update(customers)
      .set({ archivedAt: now, mergedIntoId: targetId, updatedAt: now })
      .where(eq(customers.id, sourceId));
    const fill: Partial<typeof customers.$inferInsert> = {};
    if (!target.email && source.email) fill.email = source.email;
    if (!target.phone && source.phone) fill.phone = source.phone;
    if (source.notes) fill.notes = [target.notes, source.notes].filter(Boolean).join('\n\n');
    if (Object.keys(fill).length) await tx.update(customers).set({ ...fill, updatedAt: now }).where(eq(customers.id, targetId));
    if ((!sameEmail && fill.email === undefined) || (!samePhone && fill.phone === undefined) || source.name !== target.name) {
      await tx.insert(contacts).values({ customerId: targetId, name: source.name, relationship: 'From merged record', email: fill.email ? null : source.email, phone: fill.phone ? null : source.phone });
    }
    await tx.insert(customerNotes).values({ customerId: targetId, authorUserId: user.id, audience: 'office', body: `Merged the duplicate record "${source.name}" into this household.` });
    return { targetId, sourceId, moved, keptOnSource };
  });
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
    if (input.isPrimary) await tx.update(contacts).set({ isPrimary: false }).where(and(eq(contacts.customerId, customerId), ne(contacts.id, contactId)));
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
  if (input.propertyId) {
    const [p] = await db
      .select({ id: properties.id })
      .from(properties)
      .where(and(eq(properties.id, input.propertyId), eq(properties.customerId, customerId)))
      .limit(1);
    if (!p) throw new AppError(422, 'validation_failed', 'Please check propertyId.', { propertyId: 'Choose one of this household’s properties.' });
  }
  const [row] = await db
    .insert(customerNotes)
    .values({ customerId, propertyId: input.propertyId, audience: input.audience, body: input.body, authorUserId: user.id })
    .returning();
  return { id: row!.id, body: row!.body, audience: row!.audience, propertyId: row!.propertyId, authorName: user.name, createdAt: row!.createdAt.toISOString() };
}

// ---- Properties ----

export async function addProperty(deps: Pick<AppDeps, 'database'>, customerId: string, input: PropertyInput): Promise<Property> {
  const { db } = deps.database;
  const c = await customerRow(db, customerId);
  if (c.archivedAt) throw conflict('This household is archived; restore it before adding a property.');
  const [row] = await db
    .insert(properties)
    .values({ ...input, customerId })
    .returning();
  return toProperty(row!);
}

export async function propertyRow(db: Db | Tx, id: string): Promise<PropertyRow> {
  const [p] = await db.select().from(properties).where(eq(properties.id, id)).limit(1);
  if (!p) throw notFound('That property');
  return p;
}

export async function updateProperty(deps: Pick<AppDeps, 'database'>, id: string, input: PropertyUpdate): Promise<Property> {
  const { db } = deps.database;
  const [row] = await db.update(properties).set(input).where(eq(properties.id, id)).returning();
  if (!row) throw notFound('That property');
  return toProperty(row);
}

export async function setPropertyArchived(deps: Pick<AppDeps, 'database' | 'clock'>, id: string, archived: boolean): Promise<Property> {
  const { db } = deps.database;
  const now = deps.clock();
  const [row] = await db
    .update(properties)
    .set({ archivedAt: archived ? now : null })
    .where(eq(properties.id, id))
    .returning();
  if (!row) throw notFound('That property');
  return toProperty(row);
}

/** Household ids for a set of properties (for access checks on property-scoped routes). */
export async function customersOfProperties(db: Db | Tx, ids: string[]): Promise<Map<string, string>> {
  if (!ids.length) return new Map();
  const rows = await db.select({ id: properties.id, customerId: properties.customerId }).from(properties).where(inArray(properties.id, ids));
  return new Map(rows.map((r) => [r.id, r.customerId]));
}

