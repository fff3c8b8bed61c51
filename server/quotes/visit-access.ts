import { eq } from 'drizzle-orm';
import type { SessionUser } from '../../shared/schemas/session';
import type { Db, Tx } from '../db/client';
import { technicians, visits } from '../db/schema';
import { isStaffOffice } from '../auth/access';
import { notFound } from '../http/errors';
import type { VisitRow } from '../visits/visit-status';

/** The technician row of a signed-in technician, or null. */
export async function technicianOf(db: Db | Tx, user: SessionUser): Promise<{ id: string } | null> {
  if (user.role !== 'technician') return null;
  const [t] = await db.select({ id: technicians.id }).from(technicians).where(eq(technicians.userId, user.id));
  return t ?? null;
}

/**
 * The visit, when this staff member may work on it: office and owner any, a technician only one
 * assigned to them. Anything else is 404, so visit ids are not confirmed.
 */
export async function reachableVisit(db: Db | Tx, user: SessionUser, visitId: string): Promise<VisitRow> {
  const [v] = await db.select().from(visits).where(eq(visits.id, visitId));
  if (!v) throw notFound('That visit');
  if (isStaffOffice(user)) return v;
  if (user.role === 'technician') {
    const t = await technicianOf(db, user);
    if (t && v.technicianId === t.id) return v;
  }
  throw notFound('That visit');
}
