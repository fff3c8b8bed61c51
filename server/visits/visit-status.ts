import { eq } from 'drizzle-orm';
import type { PgUpdateSetSource } from 'drizzle-orm/pg-core';
import { canTransition, VISIT_STATUS_LABELS, type VisitStatus } from '../../shared/visits';
import type { Tx } from '../db/client';
import { visitEvents, visits, type VisitEventAction } from '../db/schema';
import { AppError, notFound } from '../http/errors';

export type VisitRow = typeof visits.$inferSelect;

export interface VisitStatusChange {
  visitId: string;
  to: VisitStatus;
  /** The user who made the change; null for the system (jobs). */
  actor: string | null;
  /** When it happened; the database's clock when absent. */
  at?: Date;
  note?: string;
  /** What the history calls it: a plain status change unless the visit was also assigned or moved. */
  action?: VisitEventAction;
  /** Other columns changed with the status in the same write (technician, times, sequence...). */
  changes?: PgUpdateSetSource<typeof visits>;
}

const lower = (s: VisitStatus) => VISIT_STATUS_LABELS[s].toLowerCase();

/** The 409 for a status the table does not allow after the current one. */
export function refusedTransition(from: VisitStatus, to: VisitStatus): AppError {
  return new AppError(409, 'bad_transition', `A visit that is ${lower(from)} cannot become ${lower(to)}.`, { status: `not allowed after ${lower(from)}` });
}

/**
 * The one way to change a visit's status, inside the caller's transaction: locks the row, checks
 * the transition against the shared table, writes the visit and one line of its history.
 * Staying in the same status is a change only when something else changes with it (an
 * assignment or a move); a repeated plain status change writes nothing and answers changed: false.
 */
export async function changeVisitStatus(tx: Tx, change: VisitStatusChange): Promise<{ before: VisitRow; after: VisitRow; changed: boolean }> {
  const { visitId, to } = change;
  const action = change.action ?? (to === 'canceled' ? 'canceled' : 'status');
  const [before] = await tx.select().from(visits).where(eq(visits.id, visitId)).for('update');
  if (!before) throw notFound('That visit');
  const moving = before.status !== to;
  if (!moving && (action === 'status' || action === 'canceled')) return { before, after: before, changed: false };
  if (moving && !canTransition(before.status, to)) throw refusedTransition(before.status, to);
  const [after] = await tx
    .update(visits)
    .set({ ...change.changes, status: to, ...(change.at ? { updatedAt: change.at } : {}) })
    .where(eq(visits.id, visitId))
    .returning();
  await tx.insert(visitEvents).values({
    visitId,
    ...(change.at ? { at: change.at } : {}),
    actorUserId: change.actor,
    action,
    fromStatus: before.status,
    toStatus: to,
    technicianId: after!.technicianId,
    note: change.note ?? '',
  });
  return { before, after: after!, changed: true };
}

/** The first line of a new visit's history: it starts as requested. */
export async function recordBooked(tx: Tx, entry: { visitId: string; actor: string | null; technicianId: string | null; note: string }): Promise<void> {
  await tx
    .insert(visitEvents)
    .values({ visitId: entry.visitId, actorUserId: entry.actor, action: 'booked', toStatus: 'requested', technicianId: entry.technicianId, note: entry.note });
}
