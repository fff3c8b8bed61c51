import { sql } from 'drizzle-orm';
import { DateTime } from 'luxon';
import type { z } from 'zod';
import { availableWindows, planBooking } from '../../shared/scheduling';
import { type cancelSchema, type rescheduleSchema, type VisitView } from '../../shared/schemas/booking';
import type { SessionUser } from '../../shared/schemas/session';
import type { AppDeps } from '../deps';
import { changeVisitStatus } from '../visits/visit-status';
import { visits } from '../db/schema';
import { sendVisitMail } from './booking.mail';
import { loadCompanySettings } from './scheduling-input';
import { noticeSignature, toView } from './visit-views';
import { recordNotice } from './assignment-notice';
import {
  alternativesAfter,
  engineError,
  engineInput,
  isOverlap,
  loadVisitRow,
  lockDays,
  propertyContext,
  visitForChange,
  WindowFullError,
  type EngineCall,
} from './booking.service';

// Changes to a booked visit: moving it to another window, and canceling it.

export async function rescheduleVisit(
  deps: Pick<AppDeps, 'config' | 'database' | 'clock' | 'logger' | 'mailer' | 'jobs'>,
  user: SessionUser,
  id: string,
  body: z.output<typeof rescheduleSchema>,
): Promise<VisitView> {
  const { db } = deps.database;
  const now = deps.clock();
  const before = await visitForChange(db, user, id, now);
  const property = await propertyContext(db, user, before.propertyId, before.reason);
  let call: EngineCall | undefined;
  try {
    await db.transaction(async (tx) => {
      const company = await loadCompanySettings(tx);
      await lockDays(tx, [before.windowStart, new Date(body.windowStart)], company.timeZone);
      const current = await visitForChange(tx, user, id, now);
      call = await engineInput(tx, now, property, current.reason, DateTime.fromISO(body.windowStart, { zone: company.timeZone }).toISODate()!, 1, id);
      let plan;
      try {
        // A cheap one-day check first: planBooking would search two weeks ahead for alternatives inside the lock.
        if (!availableWindows(call.input).some((w) => Date.parse(w.start) === Date.parse(body.windowStart))) throw new WindowFullError([]);
        plan = planBooking(call.input, body.windowStart);
      } catch (err) {
        engineError(err);
      }
      if (!plan.ok) throw new WindowFullError([]);
      await changeVisitStatus(tx, {
        visitId: id,
        // A different technician must be confirmed again by the office.
        to: current.status === 'scheduled' && current.technicianId === plan.visit.technicianId ? 'scheduled' : 'requested',
        actor: user.id,
        action: 'rescheduled',
        note: `Moved to ${plan.visit.window.localLabel}`,
        changes: {
          technicianId: plan.visit.technicianId,
          windowStart: new Date(plan.visit.window.start),
          windowEnd: new Date(plan.visit.window.end),
          startsAt: new Date(plan.visit.start),
          endsAt: new Date(plan.visit.end),
          sequence: sql`${visits.sequence} + 1`,
          reminderSentAt: null,
          updatedAt: now,
        },
      });
    });
  } catch (err) {
    if ((isOverlap(err) || err instanceof WindowFullError) && call) throw new WindowFullError(await alternativesAfter(db, call, body.windowStart, id));
    throw err;
  }
  const row = await loadVisitRow(db, id);
  const company = await loadCompanySettings(db);
  await recordNotice(db, id, noticeSignature(row));
  await sendVisitMail(deps, 'reschedule', row, company);
  return toView(row, { timeZone: company.timeZone, cancelCutoffHours: company.cancelCutoffHours, phone: company.phone, now });
}

export async function cancelVisit(
  deps: Pick<AppDeps, 'config' | 'database' | 'clock' | 'logger' | 'mailer' | 'jobs'>,
  user: SessionUser,
  id: string,
  body: z.output<typeof cancelSchema>,
): Promise<VisitView> {
  const { db } = deps.database;
  const now = deps.clock();
  await db.transaction(async (tx) => {
    await visitForChange(tx, user, id, now);
    await changeVisitStatus(tx, {
      visitId: id,
      to: 'canceled',
      actor: user.id,
      note: body.reason || (user.role === 'homeowner' ? 'Canceled online by the homeowner' : 'Canceled by the office'),
      changes: { sequence: sql`${visits.sequence} + 1`, updatedAt: now },
    });
  });
  const row = await loadVisitRow(db, id);
  const company = await loadCompanySettings(db);
  await sendVisitMail(deps, 'cancellation', row, company);
  return toView(row, { timeZone: company.timeZone, cancelCutoffHours: company.cancelCutoffHours, phone: company.phone, now });
}
