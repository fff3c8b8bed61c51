import { count, desc, eq } from 'drizzle-orm';
import { auditEvents, users } from '../db/schema';
import type { AuditPage } from '../../shared/schemas/auth';
import type { AppDeps } from '../deps';

/** One page of the audit log, newest first, counted on the server. */
export async function listAuditEvents(deps: Pick<AppDeps, 'database'>, q: { page: number; pageSize: number; action?: string }): Promise<AuditPage> {
  const { db } = deps.database;
  const where = q.action ? eq(auditEvents.action, q.action) : undefined;
  const [{ total }] = await db.select({ total: count() }).from(auditEvents).where(where);
  const rows = await db
    .select({ e: auditEvents, actorName: users.name })
    .from(auditEvents)
    .leftJoin(users, eq(users.id, auditEvents.actorUserId))
    .where(where)
    .orderBy(desc(auditEvents.at), desc(auditEvents.id))
    .limit(q.pageSize)
    .offset(q.page * q.pageSize);
  return {
    total,
    page: q.page,
    pageSize: q.pageSize,
    items: rows.map(({ e, actorName }) => ({
      id: e.id,
      at: e.at.toISOString(),
      actorUserId: e.actorUserId,
      actorName,
      action: e.action,
      subject: e.subject,
      ip: e.ip,
      details: e.details,
    })),
  };
}
