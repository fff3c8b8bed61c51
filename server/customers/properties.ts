import { eq, inArray } from 'drizzle-orm';
import type { Property, PropertyInput, PropertyUpdate } from '../../shared/schemas/customers';
import type { Db, Tx } from '../db/client';
import { properties } from '../db/schema';
import { conflict, notFound } from '../http/errors';
import type { AppDeps } from '../deps';
import { customerRow, toProperty, type PropertyRow } from './customer-views';

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
