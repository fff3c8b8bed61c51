import { and, asc, desc, eq, isNull } from 'drizzle-orm';
import { homeAccessSchema, type HomeContact, type MyHome, type Note } from '../../shared/schemas/customers';
import type { SessionUser } from '../../shared/schemas/session';
import { groupServiceHistory, technicianToTell, type VisitStatus } from '../../shared/visits';
import type { Db } from '../db/client';
import { customerNotes, customers, files, properties, users } from '../db/schema';
import { equipmentForProperties } from '../equipment/equipment.service';
import { notFound, parse } from '../http/errors';
import { ownedProperty } from '../http/ownership';
import { customerVisits, updateCustomer } from './customer-page';
import { toFile, toProperty } from './customer-views';
import { companyToday } from '../company/company';
import type { AppDeps } from '../deps';

function household(user: SessionUser): string {
  if (!user.customerId) throw notFound('Your household');
  return user.customerId;
}

/** The homeowner's own homes, equipment, visit history, photos and documents. */
export async function myHome(deps: Pick<AppDeps, 'database' | 'clock'>, user: SessionUser): Promise<MyHome> {
  const { db } = deps.database;
  const customerId = household(user);
  // Each record once, side by side (the office's customer page loads far more than this needs).
  const [[c], today, props, visitRows, fileRows, noteRows] = await Promise.all([
    db.select().from(customers).where(eq(customers.id, customerId)).limit(1),
    companyToday(deps),
    db
      .select()
      .from(properties)
      .where(and(eq(properties.customerId, customerId), isNull(properties.archivedAt)))
      .orderBy(asc(properties.createdAt)),
    customerVisits(db, customerId, deps.clock()),
    db
      .select()
      .from(files)
      .where(and(eq(files.customerId, customerId), isNull(files.archivedAt)))
      .orderBy(desc(files.createdAt)),
    db
      .select({ n: customerNotes, author: users.name })
      .from(customerNotes)
      .leftJoin(users, eq(customerNotes.authorUserId, users.id))
      .where(and(eq(customerNotes.customerId, customerId), eq(customerNotes.audience, 'technician')))
      .orderBy(desc(customerNotes.createdAt)),
  ]);
  if (!c) throw notFound('Your household');
  const equipment = await equipmentForProperties(
    db,
    props.map((p) => p.id),
    today,
  );
  return {
    household: { id: c.id, name: c.name, email: c.email, phone: c.phone },
    properties: props.map((p) => ({ ...toProperty(p), equipment: equipment.filter((e) => e.propertyId === p.id) })),
    // Canceled visits are noise in a service history; the rest is grouped by the one rule.
    ...groupServiceHistory(
      visitRows.map((v) => ({
        id: v.id,
        propertyId: v.propertyId,
        reasonLabel: v.reasonLabel,
        statusLabel: v.statusLabel,
        status: v.status,
        startsAt: v.startsAt,
        windowStart: v.windowStart,
        windowEnd: v.windowEnd,
        findings: v.findings,
        recommendations: v.recommendations,
        technicianName: technicianToTell(v.status as VisitStatus, v.technicianName),
      })),
      deps.clock(),
    ),
    files: fileRows.map(toFile),
    notes: noteRows.map(({ n, author }) => ({ id: n.id, body: n.body, audience: n.audience, propertyId: n.propertyId, authorName: author, createdAt: n.createdAt.toISOString() })),
  };
}

export async function updateMyContact(deps: Pick<AppDeps, 'database'>, user: SessionUser, input: HomeContact): Promise<void> {
  await updateCustomer(deps, household(user), input);
}

async function ownProperty(db: Db, user: SessionUser, propertyId: string) {
  const [p] = await db
    .select()
    .from(properties)
    .where(and(eq(properties.id, propertyId), eq(properties.customerId, household(user))))
    .limit(1);
  if (!p) throw notFound('That home');
  return p;
}

/** Ownership first, then the body: another household's home answers 404 whatever is sent. */
export async function updateMyAccess(deps: Pick<AppDeps, 'database'>, user: SessionUser, propertyId: string, body: unknown) {
  const { db } = deps.database;
  await ownProperty(db, user, propertyId);
  const input = parse(homeAccessSchema, body);
  const [row] = await db.update(properties).set(input).where(eq(properties.id, propertyId)).returning();
  return toProperty(row!);
}

export async function addMyNote(deps: Pick<AppDeps, 'database'>, user: SessionUser, input: { body: string; propertyId: string }): Promise<Note> {
  const { db } = deps.database;
  await ownedProperty(db, user, input.propertyId, 'propertyId', { within: household(user), archivedToo: true, what: 'That home' });
  const [row] = await db
    .insert(customerNotes)
    .values({ customerId: household(user), propertyId: input.propertyId, audience: 'technician', body: input.body, authorUserId: user.id })
    .returning();
  return { id: row!.id, body: row!.body, audience: row!.audience, propertyId: row!.propertyId, authorName: user.name, createdAt: row!.createdAt.toISOString() };
}
