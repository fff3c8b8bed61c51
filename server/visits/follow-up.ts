import { DateTime } from 'luxon';
import type { Tx } from '../db/client';
import { visits } from '../db/schema';
import { recordBooked, type VisitRow } from './visit-status';

/** A requested visit, unassigned, a week out in the morning, for the office to schedule. */
export async function followUpVisit(tx: Tx, visit: VisitRow, parts: string[], actor: string, timeZone: string): Promise<string> {
  let day = DateTime.fromJSDate(visit.startsAt, { zone: timeZone }).plus({ days: 7 }).startOf('day');
  while (day.weekday > 5) day = day.plus({ days: 1 });
  const windowStart = day.set({ hour: 8 }).toJSDate();
  const windowEnd = day.set({ hour: 12 }).toJSDate();
  const [row] = await tx
    .insert(visits)
    .values({
      customerId: visit.customerId,
      propertyId: visit.propertyId,
      agreementId: visit.agreementId,
      technicianId: null,
      kind: 'service_call',
      reason: 'other',
      status: 'requested',
      windowStart,
      windowEnd,
      startsAt: windowStart,
      endsAt: day.set({ hour: 10 }).toJSDate(),
      notes: `Fit the ordered part${parts.length === 1 ? '' : 's'}: ${parts.join(', ')}.`,
      priority: visit.priority,
    })
    .returning({ id: visits.id });
  await recordBooked(tx, { visitId: row!.id, actor, technicianId: null, note: 'Follow-up to fit ordered parts from an approved quote' });
  return row!.id;
}
