// Invented people and places for the quote, work-invoice and stock tests: a technician of their
// own with a truck, households with a home, a system and (optionally) an agreement, visits today,
// and price-book parts no other test touches. Test files run side by side on one database.
import { hash } from '@node-rs/argon2';
import { randomUUID } from 'node:crypto';
import { DateTime } from 'luxon';
import * as t from '../../server/db/schema';
import { DEMO_STAFF_PASSWORD, STAFF } from '../../server/db/seed/scenario';
import { CSRF_HEADER_NAME, signInHomeowner, signInStaff, type Signed } from './auth';
import type { TestContext } from './app';

export const ZONE = 'America/Chicago';

export const post = (s: Signed, url: string, body: unknown) =>
  s.agent
    .post(url)
    .set(CSRF_HEADER_NAME, s.csrf)
    .send(body as object);
export const put = (s: Signed, url: string, body: unknown) =>
  s.agent
    .put(url)
    .set(CSRF_HEADER_NAME, s.csrf)
    .send(body as object);

export const signInRole = (ctx: TestContext, role: 'owner' | 'office') => signInStaff(ctx, STAFF.find((s) => s.role === role)!.email);

export interface Tech {
  id: string;
  userId: string;
  email: string;
  truckId: string;
  signed: Signed;
}

/** A technician with a truck of their own, signed in. */
export async function newTechnician(ctx: TestContext, office: Signed, label: string): Promise<Tech> {
  const db = ctx.database.db;
  const email = `${label}.${randomUUID().slice(0, 8)}@work.test`;
  const [u] = await db
    .insert(t.users)
    .values({ email, name: `Tamsin ${label}`, role: 'technician', passwordHash: await hash(DEMO_STAFF_PASSWORD) })
    .returning({ id: t.users.id });
  const [tech] = await db
    .insert(t.technicians)
    .values({ userId: u!.id, skills: ['refrigerant', 'gas_furnace'], weeklyHours: { '1': { start: '08:00', end: '17:00' } } })
    .returning({ id: t.technicians.id });
  const truck = await post(office, '/api/stock/locations', { kind: 'truck', name: `Truck ${email}`, technicianId: tech!.id });
  if (truck.status !== 201) throw new Error(`truck: ${truck.status} ${JSON.stringify(truck.body)}`);
  return { id: tech!.id, userId: u!.id, email, truckId: truck.body.id, signed: await signInStaff(ctx, email) };
}

export interface Home {
  customerId: string;
  propertyId: string;
  equipmentId: string;
  email: string;
  agreementId: string | null;
  homeowner: Signed;
}

/** A household with a home and a furnace, optionally on a plan version (agreement in force today). */
export async function newHome(ctx: TestContext, o: { planVersionId?: string; warrantyEndsOn?: string | null } = {}): Promise<Home> {
  const db = ctx.database.db;
  const tag = randomUUID().slice(0, 8);
  const email = `home.${tag}@example.test`;
  const [c] = await db
    .insert(t.customers)
    .values({ name: `Fernhill household ${tag}`, email })
    .returning({ id: t.customers.id });
  await db.insert(t.users).values({ email, name: `Ada Fernhill ${tag}`, role: 'homeowner', customerId: c!.id });
  const [p] = await db
    .insert(t.properties)
    .values({ customerId: c!.id, street: `${100 + Math.floor(Math.random() * 800)} Sedge Row`, city: 'Larkspur Bend', state: 'MO', zip: '64790' })
    .returning({ id: t.properties.id });
  const [e] = await db
    .insert(t.equipment)
    .values({ propertyId: p!.id, kind: 'gas_furnace', make: 'Corvane', model: 'GF80', warrantyEndsOn: o.warrantyEndsOn ?? null })
    .returning({ id: t.equipment.id });
  let agreementId: string | null = null;
  if (o.planVersionId) {
    const today = DateTime.now().setZone(ZONE);
    const [a] = await db
      .insert(t.agreements)
      .values({
        customerId: c!.id,
        propertyId: p!.id,
        planVersionId: o.planVersionId,
        status: 'active',
        startsOn: today.minus({ months: 2 }).toISODate()!,
        endsOn: today.plus({ months: 10 }).toISODate()!,
        systemsCount: 1,
        priceCents: 17900,
      })
      .returning({ id: t.agreements.id });
    agreementId = a!.id;
  }
  return { customerId: c!.id, propertyId: p!.id, equipmentId: e!.id, email, agreementId, homeowner: await signInHomeowner(ctx, email) };
}

let slot = 0;
/** A service call today for this technician at this home, in an hour of its own (no two overlap). */
export async function visitToday(ctx: TestContext, tech: Tech, home: Home, status: 'scheduled' | 'on_site' | 'done' = 'scheduled'): Promise<string> {
  const start = DateTime.now()
    .setZone(ZONE)
    .startOf('day')
    .plus({ hours: 1 + (slot++ % 22) });
  const [v] = await ctx.database.db
    .insert(t.visits)
    .values({
      customerId: home.customerId,
      propertyId: home.propertyId,
      agreementId: home.agreementId,
      technicianId: tech.id,
      kind: 'service_call',
      reason: 'no_heat',
      status,
      windowStart: start.toJSDate(),
      windowEnd: start.plus({ minutes: 50 }).toJSDate(),
      startsAt: start.toJSDate(),
      endsAt: start.plus({ minutes: 50 }).toJSDate(),
    })
    .returning({ id: t.visits.id });
  return v!.id;
}

/** A part of our own in the price book (a relay: no specification needed). */
export async function newPart(owner: Signed, label: string, unitCents = 4200): Promise<string> {
  const sku = `RLY-${label}-${randomUUID().slice(0, 6)}`.toUpperCase();
  const res = await post(owner, '/api/price-book/items', { sku, name: `Fan relay ${label}`, kind: 'part', category: 'relay', unitCents, costCents: 1500, taxable: true });
  if (res.status !== 201) throw new Error(`part: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body.id;
}

/** A shop of our own, so counts here are ours alone. */
export async function newShop(office: Signed): Promise<string> {
  const res = await post(office, '/api/stock/locations', { kind: 'shop', name: `Shop ${randomUUID().slice(0, 8)}` });
  if (res.status !== 201) throw new Error(`shop: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body.id;
}
