import { DateTime } from 'luxon';
import type { Db, Tx } from '../db/client';
import { company } from '../db/schema';

export interface CompanySettings {
  name: string;
  phone: string;
  email: string;
  street: string;
  city: string;
  state: string;
  zip: string;
  timeZone: string;
  taxRateBps: number;
}

export async function companySettings(db: Db | Tx): Promise<CompanySettings> {
  const [row] = await db.select().from(company).limit(1);
  if (!row) throw new Error('company settings row is missing');
  return row;
}

/** Today's calendar date where the company works (renewal dates are local dates). */
export function localDate(at: Date, timeZone: string): string {
  return DateTime.fromJSDate(at).setZone(timeZone).toISODate() as string;
}
