import { and, eq, sql } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import type { Db, Tx } from '../db/client';
import { visits } from '../db/schema';
import { queueMail, type OutboxDeps } from '../mail/outbox';
import { visitMailToQueue } from './booking.mail';
import { loadVisitRow } from './booking.service';
import { loadCompanySettings } from './scheduling-input';
import { noticeSignature } from './visit-views';

/**
 * The homeowner hears about an assignment once it settles: each office change queues this job a
 * few minutes ahead, one waiting job per visit (pg-boss "short" policy with the visit as
 * singletonKey), and the job tells the homeowner only what differs from the last notice they had.
 */
export const VISIT_NOTICE_JOB = 'visit.assignment_notice';

/** Records what the homeowner was just told, inside the caller's transaction. */
export async function recordNotice(tx: Db | Tx, visitId: string, signature: string): Promise<void> {
  await tx.update(visits).set({ noticeSignature: signature }).where(eq(visits.id, visitId));
}

/** Queues the settled-assignment notice; a mail problem never undoes the office's change. */
export async function scheduleAssignmentNotice(deps: Pick<AppDeps, 'config' | 'jobs' | 'logger'>, visitId: string): Promise<void> {
  try {
    await deps.jobs.send(VISIT_NOTICE_JOB, { visitId }, { startAfter: deps.config.VISIT_NOTICE_DELAY_SECONDS, singletonKey: visitId });
  } catch (err) {
    deps.logger.error({ err, visitId }, 'assignment notice was not queued');
  }
}

export type NoticeOutcome = 'sent' | 'unchanged' | 'not_assigned';

/** The job: e-mails the homeowner the assignment as it stands now, if it differs from their last notice. */
export async function sendAssignmentNotice(deps: Pick<AppDeps, 'config'> & OutboxDeps, visitId: string): Promise<NoticeOutcome> {
  const { db } = deps.database;
  const row = await loadVisitRow(db, visitId);
  if (!row.technicianId || !['scheduled', 'on_the_way'].includes(row.status)) return 'not_assigned';
  const signature = noticeSignature(row);
  const [before] = await db.select({ sig: visits.noticeSignature }).from(visits).where(eq(visits.id, visitId));
  // Claim the change: a second run of the job, or a parallel one, finds it already told.
  const claimed = await db
    .update(visits)
    .set({ noticeSignature: signature })
    .where(and(eq(visits.id, visitId), sql`${visits.noticeSignature} is distinct from ${signature}`))
    .returning({ id: visits.id });
  if (!claimed.length) return 'unchanged';
  const previousWindow = before?.sig ? before.sig.slice(before.sig.indexOf('|')) : null;
  const kind = previousWindow === null || previousWindow === signature.slice(signature.indexOf('|')) ? 'assigned' : 'reschedule';
  const c = await loadCompanySettings(db);
  const mail = visitMailToQueue(kind, row, c, deps.config.publicUrl, deps.clock(), `visit:${visitId}:notice:${row.sequence}:${signature}`);
  if (mail) await queueMail(deps, mail);
  return 'sent';
}

export function registerNoticeJobs(deps: Pick<AppDeps, 'config'> & OutboxDeps): void {
  deps.jobs.register<{ visitId: string }>(
    VISIT_NOTICE_JOB,
    async ({ visitId }) => {
      await sendAssignmentNotice(deps, visitId);
    },
    // "short": at most one waiting job per singletonKey, so later changes join the one already queued.
    { queue: { name: VISIT_NOTICE_JOB, policy: 'short' } },
  );
}
