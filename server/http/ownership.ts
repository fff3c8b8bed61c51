import { eq } from 'drizzle-orm';
import type { SessionUser } from '../../shared/schemas/session';
import { assertCustomerAccess } from '../auth/access';
import type { Db, Tx } from '../db/client';
import { customers, equipment, properties, visits } from '../db/schema';
import { AppError } from './errors';

// Ids a request names in its body or query string are checked the way ids in the path are:
// the record must exist and belong to a household the caller may reach. One answer for "no such
// record" and "not yours" (422 naming the field), so an outsider learns nothing about other
// households' ids, and nothing is written before the check.

/** The one answer for an id in a body or query that the caller may not use. */
export function notInHousehold(field: string, what = 'That record'): AppError {
  return new AppError(422, 'validation_failed', `Please check ${field}.`, { [field]: `${what} was not found for this household.` });
}

interface Owned {
  customerId: string;
  archivedAt?: Date | null;
}

export interface OwnedRule {
  /** The household the record must belong to as well (e.g. the customer in the path). */
  within?: string;
  /** Archived records count as missing unless this is set. */
  archivedToo?: boolean;
  /** Says what the record is, for the message. */
  what?: string;
}

/**
 * The check itself, for a row the caller has already looked up: it exists, is not archived, sits
 * in the household `within` names (when given) and is reachable by the user (homeowner: their
 * own; technician: households with a visit assigned to them; office and owner: all).
 */
export async function assertOwnedRow<R extends Owned>(db: Db | Tx, user: SessionUser, row: R | undefined, field: string, rule: OwnedRule = {}): Promise<R> {
  const refused = notInHousehold(field, rule.what);
  if (!row || (row.archivedAt && !rule.archivedToo)) throw refused;
  if (rule.within !== undefined && row.customerId !== rule.within) throw refused;
  await assertCustomerAccess(db, user, row.customerId).catch(() => {
    throw refused;
  });
  return row;
}

/** A household named in a body or query. */
export async function ownedCustomer(db: Db | Tx, user: SessionUser, id: string, field: string, rule: OwnedRule = {}) {
  const [row] = await db.select().from(customers).where(eq(customers.id, id)).limit(1);
  return assertOwnedRow(db, user, row && { ...row, customerId: row.id }, field, { what: 'That household', ...rule });
}

/** A property named in a body or query. */
export async function ownedProperty(db: Db | Tx, user: SessionUser, id: string, field: string, rule: OwnedRule = {}) {
  const [row] = await db.select().from(properties).where(eq(properties.id, id)).limit(1);
  return assertOwnedRow(db, user, row, field, { what: 'That property', ...rule });
}

/** A unit of equipment named in a body or query, with its property's household. */
export async function ownedEquipment(db: Db | Tx, user: SessionUser, id: string, field: string, rule: OwnedRule = {}) {
  const [row] = await db
    .select({ id: equipment.id, propertyId: equipment.propertyId, customerId: properties.customerId, archivedAt: equipment.archivedAt })
    .from(equipment)
    .innerJoin(properties, eq(properties.id, equipment.propertyId))
    .where(eq(equipment.id, id))
    .limit(1);
  return assertOwnedRow(db, user, row, field, { what: 'That equipment', ...rule });
}

/** A visit named in a body or query. */
export async function ownedVisit(db: Db | Tx, user: SessionUser, id: string, field: string, rule: OwnedRule = {}) {
  const [row] = await db.select({ id: visits.id, customerId: visits.customerId, propertyId: visits.propertyId }).from(visits).where(eq(visits.id, id)).limit(1);
  return assertOwnedRow(db, user, row, field, { what: 'That visit', ...rule });
}
