/**
 * Who may call which /api route. Every route the routers in server/routes.ts declare must have a
 * row in ROUTES below; the first test fails and lists any route without one (and any row whose
 * route is gone).
 *
 * To add a row: copy the route's "METHOD /api/full/:path" as the key, list the roles that may
 * call it in `allow` (or 'public'), and say how to fill its path parameters:
 *   'GET /api/customers/:customerId': { allow: ['homeowner', 'technician', 'office', 'owner'], owned: true },
 * `owned: true` means the parameters point at homeowner A's records, so homeowner B must get
 * 404/403 even when homeowners are allowed. Parameters named in FILL (customerId, propertyId,
 * visitId, equipmentId, agreementId) fill themselves with homeowner A's ids; give others with
 * `params: { id: (f) => f.visitA }` (add what you need to Fixtures and the beforeAll). The
 * technician session is the one assigned to visitA. Bodies default to {}: an allowed role then gets
 * a 422 from the route's own validation, which still proves it passed authorisation. Mark rows
 * that sign the caller out with `throwaway: true` so they run on spare accounts.
 *
 * Not allowed: anonymous must get 401; any other role 403 or 404. Allowed: never 401/403, and
 * never 404 for homeowner A's own records.
 */
import { randomUUID } from 'node:crypto';
import { hash } from '@node-rs/argon2';
import { and, asc, eq, inArray } from 'drizzle-orm';
import type { Router } from 'express';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { apiRouters } from '../server/routes';
import { agreements, customers, equipment, files, plans, properties, technicians, users, visits } from '../server/db/schema';
import type { Role } from '../shared/roles';
import { testApp } from './support/app';
import { anonymous, signInHomeowner, signInStaff, type Signed } from './support/auth';
import { BODY_IDS, householdRowCounts, type BodyFixtures, type BodyIdRow } from './support/body-ids';

const STAFF_PASSWORD = 'matrix-spare-lantern-42';

interface Fixtures {
  customerA: string;
  customerB: string;
  /** A unit at propertyA and household A's agreement, where the seed has them. */
  equipmentA: string | null;
  agreementA: string | null;
  /** A spare office member the owner may change; never one of the sessions below. */
  spareStaffId: string;
  /** Household A's home, and a completed visit there assigned to the technician session. */
  propertyA: string;
  visitA: string;
}

type Allow = 'public' | Role[];
interface Row {
  allow: Allow;
  owned?: boolean;
  /** A value, or one built from the fixtures (to name household A's records in the body). */
  body?: unknown;
  throwaway?: boolean;
  params?: Record<string, (f: Fixtures) => string>;
}

// Parameters that fill themselves with homeowner A's records.
const FILL: Record<string, (f: Fixtures) => string> = {
  customerId: (f) => f.customerA,
  propertyId: (f) => f.propertyA,
  visitId: (f) => f.visitA,
  equipmentId: (f) => must(f.equipmentA, 'equipmentA'),
  agreementId: (f) => must(f.agreementA, 'agreementA'),
};

function must(v: string | null, name: string): string {
  if (!v) throw new Error(`the seed has no ${name} for homeowner A`);
  return v;
}

const SIGNED_IN: Role[] = ['homeowner', 'technician', 'office', 'owner'];

// Billing routes take a well-formed id that matches no record: the row checks roles; household ownership is tested in test/agreements.test.ts and test/billing.test.ts.
const NO_SUCH_ID = '00000000-0000-4000-8000-000000000000';

const ROUTES: Record<string, Row> = {
  'POST /api/webhooks/stripe': { allow: 'public' },
  // Signed by the token in its link, for a mail program's one-click opt-out (RFC 8058).
  'GET /api/unsubscribe': { allow: 'public' },
  'POST /api/unsubscribe': { allow: 'public' },
  'GET /api/plans': { allow: SIGNED_IN },
  'GET /api/plans/:id/versions': { allow: ['office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/plans': { allow: ['owner'] },
  'PUT /api/plans/:id': { allow: ['owner'], params: { id: () => NO_SUCH_ID } },
  'PATCH /api/plans/:id': { allow: ['owner'], params: { id: () => NO_SUCH_ID } },
  'GET /api/agreements/mine': { allow: ['homeowner'] },
  'POST /api/agreements/enroll': { allow: ['homeowner', 'office', 'owner'] },
  'GET /api/agreements/:id': { allow: SIGNED_IN, params: { id: () => NO_SUCH_ID } },
  'POST /api/agreements/:id/renew': { allow: ['homeowner', 'office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/agreements/:id/auto-renew': { allow: ['homeowner', 'office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/agreements/:id/card': { allow: ['homeowner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/agreements/:id/manual-renewal': { allow: ['office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/agreements/:id/change-tier': { allow: ['office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/agreements/:id/cancel': { allow: ['office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'GET /api/invoices': { allow: ['homeowner', 'office', 'owner'] },
  'POST /api/invoices': { allow: ['office', 'owner'] },
  'POST /api/invoices/checkout-return': { allow: SIGNED_IN },
  'GET /api/invoices/:id': { allow: SIGNED_IN, params: { id: () => NO_SUCH_ID } },
  'GET /api/invoices/:id/pdf': { allow: SIGNED_IN, params: { id: () => NO_SUCH_ID } },
  'POST /api/invoices/:id/checkout': { allow: ['homeowner', 'office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/invoices/:id/issue': { allow: ['office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/invoices/:id/void': { allow: ['office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/invoices/:id/payments': { allow: ['office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/invoices/:id/refunds': { allow: ['office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'GET /api/renewals': { allow: ['office', 'owner'] },
  'GET /api/renewals/export.csv': { allow: ['office', 'owner'] },
  'POST /api/renewals/notices': { allow: ['office', 'owner'] },
  'GET /api/health': { allow: 'public' },
  'GET /api/health/slow': { allow: 'public' },
  'GET /api/reminders/preview': { allow: ['office', 'owner'] },
  'GET /api/settings/company': { allow: ['owner'] },
  'PUT /api/settings/company': { allow: ['owner'] },
  'GET /api/reminders/campaigns': { allow: ['office', 'owner'] },
  'POST /api/reminders/campaigns': { allow: ['office', 'owner'] },
  'GET /api/reminders/campaigns/:id': { allow: ['office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'GET /api/reminders/preview/messages': { allow: ['office', 'owner'] },
  'POST /api/reminders/campaigns/:id/actions': { allow: ['office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'GET /api/reminders/campaigns/:id/deliveries': { allow: ['office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'GET /api/reminders/campaigns/:id/recipients': { allow: ['office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'GET /api/reminders/households/:customerId/sends': { allow: ['office', 'owner'], params: { customerId: () => NO_SUCH_ID } },
  'GET /api/session': { allow: 'public' },
  'POST /api/auth/staff/sign-in': { allow: 'public' },
  'POST /api/auth/link': { allow: 'public' },
  'POST /api/auth/link/confirm': { allow: 'public' },
  'POST /api/auth/password/forgot': { allow: 'public' },
  'POST /api/auth/password/set': { allow: 'public' },
  'POST /api/auth/sign-out': { allow: SIGNED_IN, throwaway: true },
  'POST /api/auth/sign-out-everywhere': { allow: SIGNED_IN, throwaway: true },
  'POST /api/auth/household-invitations': { allow: ['office', 'owner'] },
  'GET /api/auth/staff': { allow: ['owner'] },
  'POST /api/auth/staff/invite': { allow: ['owner'] },
  'PATCH /api/auth/staff/:id': { allow: ['owner'], params: { id: (f) => f.spareStaffId } },
  'POST /api/auth/staff/:id/sign-out-everywhere': { allow: ['owner'], params: { id: (f) => f.spareStaffId } },
  'GET /api/audit': { allow: ['owner'] },
  'GET /api/field/visits/today': { allow: ['technician', 'owner'] },
  'GET /api/field/visits/:id': { allow: ['technician', 'owner'], params: { id: (f) => f.visitA } },
  'PUT /api/field/visits/:id/readings': { allow: ['technician', 'owner'], params: { id: (f) => f.visitA } },
  'PUT /api/field/visits/:id/checklist': { allow: ['technician', 'owner'], params: { id: (f) => f.visitA } },
  'PUT /api/field/visits/:id/troubleshooting': { allow: ['technician', 'owner'], params: { id: (f) => f.visitA } },
  'PUT /api/field/visits/:id/notes': { allow: ['technician', 'owner'], params: { id: (f) => f.visitA } },
  'POST /api/field/visits/:id/complete': { allow: ['technician', 'owner'], params: { id: (f) => f.visitA } },
  'GET /api/portal/readings/properties/:propertyId': { allow: SIGNED_IN, owned: true, params: { propertyId: (f) => f.propertyA } },
  'GET /api/portal/visit-summaries/:id': { allow: SIGNED_IN, owned: true, params: { id: (f) => f.visitA } },
  'GET /api/booking/options': { allow: ['homeowner', 'office', 'owner'] },
  'GET /api/booking/windows': { allow: ['homeowner', 'office', 'owner'] },
  'GET /api/booking/visits': { allow: ['homeowner', 'office', 'owner'] },
  'POST /api/booking/visits': { allow: ['homeowner', 'office', 'owner'] },
  'GET /api/booking/visits/:id': { allow: SIGNED_IN, owned: true, params: { id: (f) => f.visitA } },
  'POST /api/booking/visits/:id/reschedule': { allow: ['homeowner', 'office', 'owner'], owned: true, params: { id: (f) => f.visitA } },
  'POST /api/booking/visits/:id/cancel': { allow: ['homeowner', 'office', 'owner'], owned: true, params: { id: (f) => f.visitA } },
  'GET /api/dispatch/board': { allow: ['office', 'owner'] },
  'GET /api/dispatch/households': { allow: ['office', 'owner'] },
  'POST /api/dispatch/visits/:id/assign': { allow: ['office', 'owner'], params: { id: (f) => f.visitA } },
  'POST /api/dispatch/visits/:id/status': { allow: ['technician', 'office', 'owner'], params: { id: (f) => f.visitA } },
  'GET /api/dispatch/visits/:id/events': { allow: ['office', 'owner'], params: { id: (f) => f.visitA } },
  'POST /api/dispatch/time-off': { allow: ['office', 'owner'] },
  'DELETE /api/dispatch/time-off/:id': { allow: ['office', 'owner'], params: { id: (f) => f.visitA } },
  'GET /api/schedule/week': { allow: ['technician', 'office', 'owner'] },
  'POST /api/schedule/feed-token': { allow: ['technician'] },
  'DELETE /api/schedule/feed-token': { allow: ['technician'] },
  'GET /api/schedule/feed/:file': { allow: 'public', params: { file: () => `${'a'.repeat(32)}.ics` } },
  // Households, properties, equipment, files, imports, My home. Writes that would change household A use NO_SUCH_ID (or an empty body that fails validation).
  'GET /api/customers': { allow: ['office', 'owner'] },
  'GET /api/customers/export.csv': { allow: ['office', 'owner'] },
  'POST /api/customers': { allow: ['office', 'owner'] },
  'GET /api/customers/:id': { allow: ['technician', 'office', 'owner'], params: { id: (f) => f.customerA } },
  'PATCH /api/customers/:id': { allow: ['office', 'owner'], params: { id: (f) => f.customerA } },
  'POST /api/customers/:id/archive': { allow: ['office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/customers/:id/restore': { allow: ['office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/customers/:id/merge': { allow: ['office', 'owner'], params: { id: (f) => f.customerA } },
  'POST /api/customers/:id/contacts': { allow: ['office', 'owner'], params: { id: (f) => f.customerA } },
  'PUT /api/customers/:id/contacts/:contactId': { allow: ['office', 'owner'], params: { id: (f) => f.customerA, contactId: () => NO_SUCH_ID } },
  'DELETE /api/customers/:id/contacts/:contactId': { allow: ['office', 'owner'], params: { id: (f) => f.customerA, contactId: () => NO_SUCH_ID } },
  'POST /api/customers/:id/notes': { allow: ['technician', 'office', 'owner'], params: { id: (f) => f.customerA } },
  'POST /api/customers/:id/properties': { allow: ['office', 'owner'], params: { id: (f) => f.customerA } },
  'GET /api/properties/:id': { allow: ['technician', 'office', 'owner'], params: { id: (f) => f.propertyA } },
  'PATCH /api/properties/:id': { allow: ['office', 'owner'], params: { id: (f) => f.propertyA } },
  'POST /api/properties/:id/archive': { allow: ['office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/properties/:id/restore': { allow: ['office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'GET /api/equipment': { allow: ['technician', 'office', 'owner'] },
  'POST /api/equipment': { allow: ['technician', 'office', 'owner'] },
  'GET /api/equipment/:id': { allow: ['technician', 'office', 'owner'], params: { id: (f) => must(f.equipmentA, 'equipmentA') } },
  'PATCH /api/equipment/:id': { allow: ['technician', 'office', 'owner'], params: { id: (f) => must(f.equipmentA, 'equipmentA') } },
  'POST /api/equipment/:id/archive': { allow: ['office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/equipment/:id/restore': { allow: ['office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/files': { allow: SIGNED_IN },
  'GET /api/files/:id': { allow: SIGNED_IN, params: { id: () => NO_SUCH_ID } },
  'GET /api/files/:id/thumb': { allow: SIGNED_IN, params: { id: () => NO_SUCH_ID } },
  'POST /api/files/:id/archive': { allow: ['technician', 'office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/imports/preview': { allow: ['office', 'owner'] },
  'POST /api/imports/check': { allow: ['office', 'owner'] },
  'POST /api/imports/run': { allow: ['office', 'owner'] },
  'GET /api/my-home': { allow: ['homeowner'] },
  // The household comes from the session: there is no other household's summary to ask for.
  'GET /api/my-home/summary': { allow: ['homeowner'] },
  'GET /api/office-home': { allow: ['office', 'owner'] },
  'GET /api/reports/:report': { allow: ['office', 'owner'], params: { report: () => 'agreements' } },
  'GET /api/reports/:report/export.csv': { allow: ['office', 'owner'], params: { report: () => 'revenue' } },
  // Price book, quotes, work invoices and stock: unknown ids check roles; ownership is in test/quotes.test.ts.
  'GET /api/price-book/items': { allow: ['technician', 'office', 'owner'] },
  'GET /api/price-book/items/:id': { allow: ['technician', 'office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/price-book/items': { allow: ['owner'] },
  'PATCH /api/price-book/items/:id': { allow: ['owner'], params: { id: () => NO_SUCH_ID } },
  'GET /api/price-book/tasks': { allow: ['technician', 'office', 'owner'] },
  'POST /api/price-book/tasks': { allow: ['owner'] },
  'PATCH /api/price-book/tasks/:id': { allow: ['owner'], params: { id: () => NO_SUCH_ID } },
  'GET /api/price-book/export.csv': { allow: ['office', 'owner'] },
  'POST /api/price-book/import/preview': { allow: ['owner'] },
  'POST /api/price-book/import/check': { allow: ['owner'] },
  'POST /api/price-book/import/run': { allow: ['owner'] },
  'GET /api/quotes': { allow: ['technician', 'office', 'owner'] },
  'GET /api/quotes/stats': { allow: ['office', 'owner'] },
  'GET /api/quotes/savings/:customerId': { allow: ['technician', 'office', 'owner'], owned: true },
  'POST /api/quotes/preview': { allow: ['technician', 'office', 'owner'] },
  'POST /api/quotes': { allow: ['technician', 'office', 'owner'] },
  'GET /api/quotes/:id': { allow: ['technician', 'office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'PUT /api/quotes/:id': { allow: ['technician', 'office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/quotes/:id/revise': { allow: ['technician', 'office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/quotes/:id/send': { allow: ['technician', 'office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/quotes/:id/approve': { allow: ['technician', 'office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/quotes/:id/decline': { allow: ['technician', 'office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'GET /api/portal/quotes': { allow: ['homeowner'] },
  'GET /api/portal/quotes/savings': { allow: ['homeowner'] },
  'GET /api/portal/quotes/:id': { allow: ['homeowner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/portal/quotes/:id/approve': { allow: ['homeowner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/portal/quotes/:id/decline': { allow: ['homeowner'], params: { id: () => NO_SUCH_ID } },
  'POST /api/work-invoices/preview': { allow: ['technician', 'office', 'owner'] },
  'POST /api/work-invoices': { allow: ['technician', 'office', 'owner'] },
  'GET /api/work-invoices': { allow: ['technician', 'office', 'owner'] },
  'POST /api/work-invoices/:id/checkout': { allow: ['technician', 'office', 'owner'], params: { id: () => NO_SUCH_ID } },
  'GET /api/stock/locations': { allow: ['technician', 'office', 'owner'] },
  'POST /api/stock/locations': { allow: ['office', 'owner'] },
  'GET /api/stock/levels': { allow: ['technician', 'office', 'owner'] },
  'PUT /api/stock/levels/:locationId': { allow: ['office', 'owner'], params: { locationId: () => NO_SUCH_ID } },
  'POST /api/stock/restocks': { allow: ['office', 'owner'] },
  'POST /api/stock/transfers': { allow: ['office', 'owner'] },
  'GET /api/stock/movements': { allow: ['technician', 'office', 'owner'] },
  'POST /api/stock/visits/:visitId/parts-used': { allow: ['technician', 'office', 'owner'] },
  'POST /api/stock/replacements': { allow: ['technician', 'office', 'owner'] },
  'GET /api/stock/parts-to-load': { allow: ['technician'] },
  'PATCH /api/my-home/contact': { allow: ['homeowner'] },
  'PATCH /api/my-home/properties/:id': { allow: ['homeowner'], owned: true, params: { id: (f) => f.propertyA } },
  'POST /api/my-home/notes': { allow: ['homeowner'] },
  'GET /api/my-reminders': { allow: ['homeowner'] },
  'PUT /api/my-reminders/preferences': { allow: ['homeowner'] },
  // Homeowner B marking household A's filter changed gets 404 (the body names A's equipment).
  'POST /api/my-reminders/filter-changed': { allow: ['homeowner'], owned: true, body: (f: Fixtures) => ({ equipmentId: must(f.equipmentA, 'equipmentA') }) },
};

type Who = 'anonymous' | 'homeownerA' | 'homeownerB' | 'technician' | 'office' | 'owner';
const WHO: Who[] = ['anonymous', 'homeownerA', 'homeownerB', 'technician', 'office', 'owner'];
const roleOf = (w: Who): Role | null => (w === 'anonymous' ? null : w.startsWith('homeowner') ? 'homeowner' : (w as Role));

interface Layer {
  route?: { path: string; methods: Record<string, boolean> };
  handle: { stack?: Layer[] };
  rawPath?: string | string[];
  name: string;
}

/** Every METHOD + full path the routers declare, nested routers included. */
function declaredRoutes(ctx: ReturnType<typeof testApp>): string[] {
  const out = new Set<string>();
  const join = (a: string, b: string) => `${a}/${b}`.replace(/\/+/g, '/').replace(/(.)\/$/, '$1');
  const walk = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route) {
        for (const [m, on] of Object.entries(layer.route.methods)) if (on && m !== '_all') out.add(`${m.toUpperCase()} ${join(prefix, layer.route.path)}`);
      } else if (layer.handle?.stack) {
        const raw = Array.isArray(layer.rawPath) ? layer.rawPath[0] : layer.rawPath;
        walk(layer.handle.stack, join(prefix, typeof raw === 'string' ? raw : '/'));
      }
    }
  };
  for (const r of apiRouters) walk((r.build(ctx.deps) as unknown as Router & { stack: Layer[] }).stack, r.path);
  return [...out].sort();
}

const ctx = testApp();
const sessions = {} as Record<Who, Signed>;
const spare = {} as Record<Who, () => Promise<Signed>>;
let fixtures: Fixtures;
let ip = 0;

async function spareStaff(role: 'technician' | 'office' | 'owner'): Promise<string> {
  const email = `matrix-${role}-${randomUUID().slice(0, 8)}@bluestem-comfort.test`;
  await ctx.database.db.insert(users).values({ email, name: `Matrix ${role}`, role, passwordHash: await hash(STAFF_PASSWORD) });
  return email;
}
async function spareHomeowner(): Promise<string> {
  const email = `matrix-home-${randomUUID().slice(0, 8)}@example.test`;
  const [c] = await ctx.database.db.insert(customers).values({ name: 'Matrix household', email }).returning();
  await ctx.database.db.insert(users).values({ email, name: 'Matrix homeowner', role: 'homeowner', customerId: c.id });
  return email;
}

beforeAll(async () => {
  const db = ctx.database.db;
  const [a] = await db.select().from(users).where(eq(users.email, 'dana.whitfield@example.test'));
  const [b] = await db.select().from(users).where(eq(users.email, 'sam.oduya@example.test'));
  // The technician session is one with a visit at household A, so "their" records exist.
  const [tech] = await db
    .select({ email: users.email, visitId: visits.id, propertyId: visits.propertyId })
    .from(visits)
    .innerJoin(technicians, eq(technicians.id, visits.technicianId))
    .innerJoin(users, eq(users.id, technicians.userId))
    .where(and(eq(visits.customerId, a.customerId!), eq(visits.status, 'done')))
    // The oldest is a seeded visit with a demo technician, whatever other tests add meanwhile.
    .orderBy(asc(visits.startsAt))
    .limit(1);
  const spareOffice = await spareStaff('office');
  const [spareRow] = await db.select({ id: users.id }).from(users).where(eq(users.email, spareOffice));
  const [unit] = await db.select({ id: equipment.id }).from(equipment).where(eq(equipment.propertyId, tech.propertyId)).limit(1);
  const [agr] = await db.select({ id: agreements.id }).from(agreements).where(eq(agreements.customerId, a.customerId!)).limit(1);
  fixtures = {
    customerA: a.customerId!,
    customerB: b.customerId!,
    spareStaffId: spareRow.id,
    propertyA: tech.propertyId,
    visitA: tech.visitId,
    equipmentA: unit?.id ?? null,
    agreementA: agr?.id ?? null,
  };

  sessions.anonymous = await anonymous(ctx);
  sessions.homeownerA = await signInHomeowner(ctx, a.email);
  sessions.homeownerB = await signInHomeowner(ctx, b.email);
  sessions.technician = await signInStaff(ctx, tech.email);
  sessions.office = await signInStaff(ctx, 'teo.marchetti@bluestem-comfort.test');
  sessions.owner = await signInStaff(ctx, 'rosalind.okafor@bluestem-comfort.test');

  spare.anonymous = () => anonymous(ctx);
  spare.homeownerA = async () => signInHomeowner(ctx, await spareHomeowner());
  spare.homeownerB = spare.homeownerA;
  spare.technician = async () => signInStaff(ctx, await spareStaff('technician'), STAFF_PASSWORD);
  spare.office = async () => signInStaff(ctx, await spareStaff('office'), STAFF_PASSWORD);
  spare.owner = async () => signInStaff(ctx, await spareStaff('owner'), STAFF_PASSWORD);
});
afterAll(() => ctx.close());

function fillPath(path: string, row: Row): string {
  return path.replace(/:(\w+)/g, (_m, name: string) => {
    const fill = row.params?.[name] ?? FILL[name];
    if (!fill) throw new Error(`No value for :${name} in ${path}: add params: { ${name}: (f) => … } to its row`);
    return encodeURIComponent(fill(fixtures));
  });
}

async function call(s: Signed, method: string, path: string, body: unknown) {
  const m = method.toLowerCase() as 'get' | 'post' | 'put' | 'patch' | 'delete';
  // Distinct documentation-range addresses (RFC 5737) keep per-address limits out of the way.
  const req = s.agent[m](path)
    .set('X-XSRF-TOKEN', s.csrf)
    .set('X-Forwarded-For', `203.0.113.${(ip++ % 200) + 20}`);
  return m === 'get' ? req : req.send((body ?? {}) as object);
}

describe('access matrix', () => {
  it('has a row for every /api route, and no row for a route that is gone', () => {
    const declared = declaredRoutes(ctx);
    const missing = declared.filter((k) => !(k in ROUTES));
    const stale = Object.keys(ROUTES).filter((k) => !declared.includes(k));
    expect(missing, 'add a row to ROUTES in test/access-matrix.test.ts for each of these').toEqual([]);
    expect(stale, 'these rows have no route any more').toEqual([]);
  });

  const rows = Object.entries(ROUTES);
  it.each(rows)('%s', async (key, row) => {
    const [method, path] = key.split(' ');
    const url = fillPath(path, row);
    for (const who of WHO) {
      const s = row.throwaway && who !== 'anonymous' ? await spare[who]() : sessions[who];
      const res = await call(s, method, url, typeof row.body === 'function' ? (row.body as (f: Fixtures) => unknown)(fixtures) : row.body);
      const label = `${key} as ${who} answered ${res.status} ${JSON.stringify(res.body?.error ?? '')}`;
      expect(res.status, label).toBeLessThan(500);
      const role = roleOf(who);
      if (row.allow === 'public') continue;
      const allowed = role !== null && row.allow.includes(role) && !(row.owned && who === 'homeownerB');
      if (!allowed) {
        if (who === 'anonymous') expect(res.status, label).toBe(401);
        else expect([403, 404], label).toContain(res.status);
      } else {
        expect([401, 403], label).not.toContain(res.status);
        if (row.owned) expect(res.status, label).not.toBe(404);
      }
    }
  });
});

// ---- Ids in bodies and query strings (rows in test/support/body-ids.ts) ----

const ONE_PIXEL_PNG = Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8BQDwAEhQGAhKmMIQAAAABJRU5ErkJggg==', 'base64');
let bodyFx: BodyFixtures;
let homeownerS: Signed;

async function household(name: string) {
  const db = ctx.database.db;
  const email = `matrix-body-${randomUUID().slice(0, 8)}@example.test`;
  const [c] = await db.insert(customers).values({ name, email }).returning();
  const [p] = await db.insert(properties).values({ customerId: c.id, street: '12 Sedge Row', city: 'Larkspur Bend', state: 'KS', zip: '66000', area: 'North' }).returning();
  return { email, customerId: c.id, propertyId: p.id };
}

async function sendBodyRow(s: Signed, row: BodyIdRow) {
  const [method, route] = row.route.split(' ');
  const url = row.path ? row.path(bodyFx) : route;
  const m = method.toLowerCase() as 'get' | 'post';
  const req = s.agent[m](url)
    .set('X-XSRF-TOKEN', s.csrf)
    .set('X-Forwarded-For', `203.0.113.${(ip++ % 200) + 20}`);
  if (row.query) req.query(row.query(bodyFx));
  if (row.form) {
    for (const [k, v] of Object.entries(row.form(bodyFx))) req.field(k, v);
    return req.attach('files', ONE_PIXEL_PNG, { filename: 'p.png', contentType: 'image/png' });
  }
  return m === 'get' ? req : req.send(row.body?.(bodyFx) ?? {});
}

describe('access matrix: ids in bodies and query strings', () => {
  beforeAll(async () => {
    const db = ctx.database.db;
    const s = await household('Matrix caller household');
    await db.insert(users).values({ email: s.email, name: 'Matrix caller', role: 'homeowner', customerId: s.customerId });
    const v = await household('Matrix other household');
    const [unit] = await db.insert(equipment).values({ propertyId: v.propertyId, kind: 'gas_furnace' }).returning();
    const [file] = await db
      .insert(files)
      .values({
        customerId: v.customerId,
        propertyId: v.propertyId,
        storageKey: `matrix/${randomUUID()}.png`,
        category: 'other',
        contentType: 'image/png',
        originalName: 'p.png',
        sizeBytes: 1,
      })
      .returning();
    const [visitB] = await db
      .select({ id: visits.id })
      .from(visits)
      .where(inArray(visits.status, ['requested', 'scheduled']))
      .orderBy(asc(visits.startsAt))
      .limit(1);
    const [visitTech] = await db.select({ customerId: visits.customerId }).from(visits).where(eq(visits.id, fixtures.visitA));
    const [plan] = await db.select({ id: plans.id }).from(plans).where(eq(plans.active, true)).limit(1);
    homeownerS = await signInHomeowner(ctx, s.email);
    const offer = await homeownerS.agent.get('/api/booking/windows').query({ propertyId: s.propertyId, reason: 'tune_up' }).expect(200);
    bodyFx = {
      customerS: s.customerId,
      propertyS: s.propertyId,
      customerV: v.customerId,
      propertyV: v.propertyId,
      equipmentV: unit.id,
      fileV: file.id,
      visitB: visitB.id,
      visitTech: fixtures.visitA,
      customerTech: visitTech!.customerId,
      activePlan: plan.id,
      windowS: offer.body.windows[0].start,
    };
  });

  it('covers every route that takes an id in its body or query from a caller it serves', () => {
    const keys = new Set(Object.keys(ROUTES));
    expect(BODY_IDS.map((r) => r.route).filter((r) => !keys.has(r))).toEqual([]);
  });

  it.each(BODY_IDS.map((r) => [`${r.route} ${r.field} from ${r.who}`, r] as const))('%s', async (_label, row) => {
    const s = row.who === 'homeownerS' ? homeownerS : sessions[row.who];
    const households = [bodyFx.customerS, bodyFx.customerV];
    const before = await householdRowCounts(ctx.database.db, households);
    const res = await sendBodyRow(s, row);
    const label = `${row.route} answered ${res.status} ${JSON.stringify(res.body?.error ?? '')}`;
    if (row.expect === 'ignored') {
      expect([200, 202], label).toContain(res.status);
      expect(JSON.stringify(res.body), label).not.toContain(bodyFx.customerV);
      expect(JSON.stringify(res.body), label).not.toContain(bodyFx.propertyV);
    } else {
      expect([404, 422], label).toContain(res.status);
      if (res.status === 422) expect(Object.keys(res.body.error.fields ?? {}), label).toContain(row.field);
    }
    expect(await householdRowCounts(ctx.database.db, households), 'nothing of either household changed').toEqual(before);
  });
});
