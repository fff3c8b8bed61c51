import { and, gt, inArray, isNull, lte } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import { visits } from '../db/schema';
import { sendVisitMail } from './booking.mail';
import { loadCompanySettings } from './scheduling-input';
import { loadVisitRow } from './booking.service';

export const DAY_BEFORE_JOB = 'booking.day-before-reminders';

/**
 * Claims visits whose window opens within the next 24 hours and mails each homeowner once.
 * The claim comes first, so a second worker or a retried run never sends twice.
 */
export async function sendDayBeforeReminders(deps: Pick<AppDeps, 'config' | 'database' | 'clock' | 'logger' | 'mailer'>): Promise<number> {
  const { db } = deps.database;
  const now = deps.clock();
  const until = new Date(now.getTime() + 24 * 3_600_000);
  const claimed = await db
    .update(visits)
    .set({ reminderSentAt: now })
    .where(and(inArray(visits.status, ['requested', 'scheduled']), isNull(visits.reminderSentAt), gt(visits.windowStart, now), lte(visits.windowStart, until)))
    .returning({ id: visits.id });
  if (!claimed.length) return 0;
  const c = await loadCompanySettings(db);
  let sent = 0;
  for (const { id } of claimed) {
    const row = await loadVisitRow(db, id);
    if (await sendVisitMail(deps, 'reminder', row, c)) sent++;
  }
  return sent;
}

export function registerBookingJobs(deps: Pick<AppDeps, 'config' | 'database' | 'clock' | 'logger' | 'mailer' | 'jobs'>): void {
  deps.jobs.register(DAY_BEFORE_JOB, async () => {
    await sendDayBeforeReminders(deps);
  }, { cron: '15 * * * *' });
}

