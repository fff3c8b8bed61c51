/**
 * Ids a request carries in its body or query string, each sent by a caller who may use the route
 * but not that record. Every row names the route, the field and who sends it; the access matrix
 * runs them and checks the answer (refused: 404/422 naming the field; ignored: the caller's own
 * data only) and that no row of either household changed.
 *
 * `S` is a fresh homeowner's own household (the caller); `V` is another fresh household (the victim)
 * no technician visits; `B` is another seeded household. Office and owner reach every household,
 * so their rows send an id that matches no record.
 */
import { sql } from 'drizzle-orm';
import type { Db } from '../../server/db/client';

export interface BodyFixtures {
  /** The caller's own household and home. */
  customerS: string;
  propertyS: string;
  /** Another household: its home, a unit there and an uploaded photo. */
  customerV: string;
  propertyV: string;
  equipmentV: string;
  fileV: string;
  /** A visit still to come, at a seeded household (not the caller's). */
  visitB: string;
  /** A visit the technician session is assigned to. */
  visitTech: string;
  /** The household of that visit. */
  customerTech: string;
  activePlan: string;
  /** An arrival window open at the caller's home, for a booking that is valid but for one field. */
  windowS: string;
}

export type Caller = 'homeownerS' | 'technician' | 'office';
export interface BodyIdRow {
  who: Caller;
  /** The route, then the field carrying the id ("photoIds", "items.0.equipmentId"). */
  route: string;
  field: string;
  /** refused: 404 or 422 naming the field; ignored: 2xx, nothing of V in the answer, nothing written. */
  expect: 'refused' | 'ignored';
  path?: (f: BodyFixtures) => string;
  body?: (f: BodyFixtures) => Record<string, unknown>;
  query?: (f: BodyFixtures) => Record<string, string>;
  /** Multipart fields (with one small file attached). */
  form?: (f: BodyFixtures) => Record<string, string>;
}

const NO_SUCH_ID = '00000000-0000-4000-8000-000000000000';
const labor = (equipmentId: string | null = null) => ({
  source: 'custom',
  description: 'Clean the coil',
  kind: 'labor',
  category: 'repair_labor',
  quantity: 1,
  unitCents: 9500,
  taxable: false,
  equipmentId,
});
const quote = (f: BodyFixtures, extra: { equipmentId?: string; photoIds?: string[] }) => ({
  visitId: f.visitTech,
  photoIds: extra.photoIds ?? [],
  options: [{ title: 'Clean the coil', lines: [labor(extra.equipmentId)] }],
});
const book = (f: BodyFixtures, extra: Record<string, unknown>) => ({ propertyId: f.propertyS, reason: 'tune_up', windowStart: f.windowS, noEmergency: true, ...extra });

export const BODY_IDS: BodyIdRow[] = [
  { who: 'homeownerS', route: 'POST /api/booking/visits', field: 'propertyId', expect: 'refused', body: (f) => book(f, { propertyId: f.propertyV }) },
  { who: 'homeownerS', route: 'POST /api/booking/visits', field: 'photoIds', expect: 'refused', body: (f) => book(f, { photoIds: [f.fileV] }) },
  { who: 'homeownerS', route: 'GET /api/booking/windows', field: 'propertyId', expect: 'refused', query: (f) => ({ propertyId: f.propertyV, reason: 'tune_up' }) },
  { who: 'homeownerS', route: 'GET /api/booking/windows', field: 'visitId', expect: 'refused', query: (f) => ({ propertyId: f.propertyS, reason: 'tune_up', visitId: f.visitB }) },
  { who: 'homeownerS', route: 'GET /api/booking/options', field: 'customerId', expect: 'ignored', query: (f) => ({ customerId: f.customerV }) },
  { who: 'homeownerS', route: 'GET /api/booking/visits', field: 'customerId', expect: 'ignored', query: (f) => ({ customerId: f.customerV }) },
  { who: 'homeownerS', route: 'GET /api/invoices', field: 'customerId', expect: 'ignored', query: (f) => ({ customerId: f.customerV }) },
  { who: 'homeownerS', route: 'POST /api/agreements/enroll', field: 'propertyId', expect: 'refused', body: (f) => ({ propertyId: f.propertyV, planId: f.activePlan }) },
  { who: 'homeownerS', route: 'POST /api/my-home/notes', field: 'propertyId', expect: 'refused', body: (f) => ({ propertyId: f.propertyV, body: 'Gate code is 1234.' }) },
  { who: 'homeownerS', route: 'POST /api/files', field: 'customerId', expect: 'refused', form: (f) => ({ customerId: f.customerV }) },
  { who: 'homeownerS', route: 'POST /api/files', field: 'propertyId', expect: 'refused', form: (f) => ({ propertyId: f.propertyV }) },
  { who: 'homeownerS', route: 'POST /api/files', field: 'equipmentId', expect: 'refused', form: (f) => ({ equipmentId: f.equipmentV }) },
  { who: 'homeownerS', route: 'POST /api/files', field: 'visitId', expect: 'refused', form: (f) => ({ visitId: f.visitB }) },
  { who: 'homeownerS', route: 'POST /api/files', field: 'propertyId', expect: 'refused', form: (f) => ({ customerId: f.customerS, propertyId: f.propertyV }) },
  { who: 'technician', route: 'POST /api/equipment', field: 'propertyId', expect: 'refused', body: (f) => ({ propertyId: f.propertyV, kind: 'gas_furnace' }) },
  { who: 'technician', route: 'POST /api/quotes', field: 'options.0.lines.0.equipmentId', expect: 'refused', body: (f) => quote(f, { equipmentId: f.equipmentV }) },
  { who: 'technician', route: 'POST /api/quotes', field: 'photoIds.0', expect: 'refused', body: (f) => quote(f, { photoIds: [f.fileV] }) },
  { who: 'technician', route: 'POST /api/quotes/preview', field: 'options.0.lines.0.equipmentId', expect: 'refused', body: (f) => quote(f, { equipmentId: f.equipmentV }) },
  { who: 'technician', route: 'POST /api/quotes/preview', field: 'photoIds.0', expect: 'refused', body: (f) => quote(f, { photoIds: [f.fileV] }) },
  {
    who: 'technician',
    route: 'POST /api/work-invoices',
    field: 'lines.0.equipmentId',
    expect: 'refused',
    body: (f) => ({ customerId: f.customerTech, visitId: f.visitTech, lines: [labor(f.equipmentV)], sendPayLink: false }),
  },
  {
    who: 'technician',
    route: 'POST /api/work-invoices/preview',
    field: 'lines.0.equipmentId',
    expect: 'refused',
    body: (f) => ({ customerId: f.customerTech, visitId: f.visitTech, lines: [labor(f.equipmentV)] }),
  },
  { who: 'technician', route: 'POST /api/files', field: 'equipmentId', expect: 'refused', form: (f) => ({ equipmentId: f.equipmentV }) },
  { who: 'technician', route: 'POST /api/files', field: 'propertyId', expect: 'refused', form: (f) => ({ propertyId: f.propertyV }) },
  {
    who: 'office',
    route: 'POST /api/customers/:id/notes',
    field: 'propertyId',
    expect: 'refused',
    path: (f) => `/api/customers/${f.customerS}/notes`,
    body: (f) => ({ propertyId: f.propertyV, audience: 'office', body: 'Dog in the yard.' }),
  },
  {
    who: 'office',
    route: 'POST /api/customers/:id/merge',
    field: 'sourceId',
    expect: 'refused',
    path: (f) => `/api/customers/${f.customerS}/merge`,
    body: () => ({ sourceId: NO_SUCH_ID }),
  },
  {
    who: 'office',
    route: 'POST /api/invoices',
    field: 'customerId',
    expect: 'refused',
    body: () => ({ customerId: NO_SUCH_ID, lines: [{ kind: 'parts', description: 'Capacitor', quantity: 1, unitCents: 4500, taxable: true }] }),
  },
  { who: 'office', route: 'POST /api/renewals/notices', field: 'agreementIds', expect: 'ignored', body: () => ({ agreementIds: [NO_SUCH_ID] }) },
  { who: 'office', route: 'POST /api/auth/household-invitations', field: 'customerId', expect: 'refused', body: () => ({ customerId: NO_SUCH_ID }) },
  {
    who: 'office',
    route: 'POST /api/dispatch/visits/:id/assign',
    field: 'technicianId',
    expect: 'refused',
    path: (f) => `/api/dispatch/visits/${f.visitB}/assign`,
    body: () => ({ technicianId: NO_SUCH_ID }),
  },
  {
    who: 'office',
    route: 'POST /api/dispatch/time-off',
    field: 'technicianId',
    expect: 'refused',
    body: () => ({ technicianId: NO_SUCH_ID, startsAt: new Date(Date.now() + 86_400_000).toISOString(), endsAt: new Date(Date.now() + 93_600_000).toISOString() }),
  },
];

/**
 * Row counts of every table with a customer_id column, for the given households, plus their
 * equipment (keyed through properties): one statement.
 */
export async function householdRowCounts(db: Db, customerIds: string[]): Promise<Record<string, number>> {
  const tables = await db.execute<{ table_name: string }>(
    sql`select table_name from information_schema.columns where table_schema = 'public' and column_name = 'customer_id' order by table_name`,
  );
  const ids = sql.join(
    customerIds.map((id) => sql`${id}::uuid`),
    sql`, `,
  );
  const parts = tables.rows.map((t) => sql`select ${t.table_name}::text as t, count(*)::int as n from ${sql.identifier(t.table_name)} where customer_id in (${ids})`);
  parts.push(sql`select 'equipment'::text as t, count(*)::int as n from equipment e join properties p on p.id = e.property_id where p.customer_id in (${ids})`);
  const rows = await db.execute<{ t: string; n: number }>(sql.join(parts, sql` union all `));
  return Object.fromEntries(rows.rows.map((r) => [r.t, r.n]));
}
