import { and, eq, gt, inArray, isNull, lte } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import { visits } from '../db/schema';
import { recordMail, startSending, type OutboxDeps } from '../mail/outbox';
import { visitMailToQueue } from './booking.mail';
import { loadCompanySettings } from './scheduling-input';
import { loadVisitRow } from './booking.service';

export const DAY_BEFORE_JOB = 'booking.day-before-reminders';

/**
 * Mails each homeowner whose visit window opens within the next 24 hours, once. Per visit, the claim
 * (reminderSentAt, "handed to the mail queue") and the queued mail commit together, so a crash never
 * leaves a claim without its mail; the mail queue then retries the sending until the SMTP server
 * takes it. A second worker or a rerun finds the visit claimed, and the mail's key stops a duplicate.
 */
export async function sendDayBeforeReminders(deps: Pick<AppDeps, 'config'> & OutboxDeps): Promise<number> {
  const { db } = deps.database;
  const now = deps.clock();
  const until = new Date(now.getTime() + 24 * 3_600_000);
  const due = and(inArray(visits.status, ['requested', 'scheduled']), isNull(visits.reminderSentAt), gt(visits.windowStart, now), lte(visits.windowStart, until));
  const candidates = await db.select({ id: visits.id }).from(visits).where(due);
  if (!candidates.length) return 0;
  const c = await loadCompanySettings(db);
  const queued: string[] = [];
  for (const { id } of candidates) {
    const row = await loadVisitRow(db, id);
    const mail = visitMailToQueue('reminder', row, c, deps.config.publicUrl, now, `visit:${id}:reminder:${row.sequence}`);
    const mailId = await db.transaction(async (tx) => {
      const [claimed] = await tx
        .update(visits)
        .set({ reminderSentAt: now })
        .where(and(eq(visits.id, id), due))
        .returning({ id: visits.id });
      if (!claimed || !mail) return null;
      return recordMail(deps, mail, tx);
    });
    if (mailId) queued.push(mailId);
  }
  await startSending(deps, queued);
  return queued.length;
}

export function registerBookingJobs(deps: Pick<AppDeps, 'config'> & OutboxDeps): void {
  deps.jobs.register(
    DAY_BEFORE_JOB,
    async () => {
      await sendDayBeforeReminders(deps);
    },
    { cron: '15 * * * *' },
  );
}
