import { DateTime } from 'luxon';
import type { Db, Tx } from '../db/client';
import { company } from '../db/schema';

/** Today's date in the company's time zone, as an ISO date: equipment age and warranty count from it. */
export async function companyToday(db: Db | Tx, now: Date): Promise<string> {
  const [row] = await db.select({ timeZone: company.timeZone }).from(company).limit(1);
  return DateTime.fromJSDate(now).setZone(row?.timeZone ?? 'America/Chicago').toISODate()!;
}
