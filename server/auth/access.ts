import type {} from 'passport';
import { and, eq, notInArray } from 'drizzle-orm';
import type { RequestHandler } from 'express';
import type { Role } from '../../shared/roles';
import type { SessionUser } from '../../shared/schemas/session';
import type { Db, Tx } from '../db/client';
import { technicians, visits } from '../db/schema';
import { forbidden, notFound, unauthenticated } from '../http/errors';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // passport puts the signed-in user on req.user.
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends SessionUser {}
  }
}

/** 401 without a session, 403 for a role not listed. Ownership is checked in the service call. */
export function requireRole(...roles: Role[]): RequestHandler {
  return (req, _res, next) => {
    if (!req.user) throw unauthenticated();
    if (!roles.includes(req.user.role)) throw forbidden();
    next();
  };
}

export const requireUser: RequestHandler = (req, _res, next) => {
  if (!req.user) throw unauthenticated();
  next();
};

/** The signed-in user, for handlers behind requireRole/requireUser. */
export function currentUser(req: Express.Request): SessionUser {
  if (!req.user) throw unauthenticated();
  return req.user;
}

export const isStaffOffice = (u: SessionUser) => u.role === 'office' || u.role === 'owner';

/**
 * May this user read or write this household's records? A homeowner reaches only their own; a
 * technician only households with a visit assigned to them; office and owner reach all.
 * Anything else answers 404, so record ids are not confirmed to outsiders.
 */
export async function assertCustomerAccess(db: Db | Tx, user: SessionUser, customerId: string): Promise<void> {
  if (isStaffOffice(user)) return;
  if (user.role === 'homeowner') {
    if (user.customerId !== customerId) throw notFound();
    return;
  }
  if (user.role === 'technician') {
    const rows = await db
      .select({ id: visits.id })
      .from(visits)
      .innerJoin(technicians, eq(visits.technicianId, technicians.id))
      .where(and(eq(visits.customerId, customerId), eq(technicians.userId, user.id), notInArray(visits.status, ['canceled'])))
      .limit(1);
    if (rows.length) return;
  }
  throw notFound();
}
