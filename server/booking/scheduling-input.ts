import { and, eq, gt, inArray, isNotNull, isNull, lt, ne, sql } from 'drizzle-orm';
import { DateTime } from 'luxon';
import type { BookedVisit, SchedulingSettings, Technician, WeeklyHours } from '../../shared/scheduling';
import { ACTIVE_STATUSES } from '../../shared/schemas/booking';
import type { VisitKind } from '../../shared/visits';
import type { Db, Tx } from '../db/client';
import { bookingSettings, company, technicianTimeOff, technicians, users, visits } from '../db/schema';
import type { BusinessHours } from '../db/schema/company';
import type { WeeklyHours as TechHours } from '../db/schema/technicians';
import { companyRow } from '../company/company';
import { loadedForRequest, oncePerRequest, rememberForRequest } from '../runtime/request-memo';

const DAY_KEYS = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'] as const;

/** Company hours ('1' = Monday, {open, close} or null) in the engine's shape. */
export function businessHoursToWeekly(hours: BusinessHours): WeeklyHours {
  const out: WeeklyHours = {};
  DAY_KEYS.forEach((key, i) => {
    const h = hours[String(i + 1) as keyof BusinessHours];
    if (h) out[key] = [{ open: h.open, close: h.close }];
  });
  return out;
}

/** Technician hours ('1' = Monday, {start, end}) in the engine's shape. */
export function technicianHoursToWeekly(hours: TechHours): WeeklyHours {
  const out: WeeklyHours = {};
  DAY_KEYS.forEach((key, i) => {
    const h = hours[String(i + 1) as keyof TechHours];
    if (h) out[key] = [{ open: h.start, close: h.end }];
  });
  return out;
}

export interface CompanySettings {
  name: string;
  phone: string;
  email: string;
  timeZone: string;
  cancelCutoffHours: number;
  windowMinutes: number;
  settings: SchedulingSettings;
  visitMinutes: Record<VisitKind, number>;
}

type BookingSettingsRow = typeof bookingSettings.$inferSelect;

// The booking settings, once per request. When the request has not read the company row yet,
// both come in one statement and the company row is kept for the request as companyRow reads it.
const bookingSettingsRow = (db: Db | Tx): Promise<BookingSettingsRow | undefined> =>
  oncePerRequest('booking_settings', async () => {
    if (loadedForRequest('company')) return (await db.select().from(bookingSettings).limit(1))[0];
    const [row] = await db
      .select({ c: company, b: bookingSettings })
      .from(company)
      .leftJoin(bookingSettings, sql`true`)
      .where(eq(company.id, 1))
      .limit(1);
    rememberForRequest('company', row?.c);
    return row?.b ?? undefined;
  });

export async function loadCompanySettings(db: Db | Tx): Promise<CompanySettings> {
  const b = await bookingSettingsRow(db);
  const c = await companyRow(db);
  const visitMinutes = { tune_up: b?.tuneUpMinutes ?? 90, service_call: b?.serviceCallMinutes ?? 120 };
  return {
    name: c.name,
    phone: c.phone,
    email: c.email,
    timeZone: c.timeZone,
    cancelCutoffHours: c.cancelCutoffHours,
    windowMinutes: c.arrivalWindowMinutes,
    visitMinutes,
    settings: {
      timeZone: c.timeZone,
      businessHours: businessHoursToWeekly(c.businessHours),
      visitMinutes,
      travelBufferMinutes: b?.travelBufferMinutes ?? 30,
      leadTimeMinutes: c.leadTimeMinutes,
      // The engine never holds back more than 90 %: some ordinary booking must stay possible.
      heldBackShare: Math.min(0.9, Math.max(0, c.heldBackPct / 100)),
      windowMinutes: c.arrivalWindowMinutes,
    },
  };
}

export interface SchedulingData {
  technicians: Technician[];
  booked: BookedVisit[];
  names: Map<string, string>;
}

/** Active technicians, their time off and the visits holding their time between two instants. */
export async function loadSchedulingData(db: Db | Tx, range: { from: Date; to: Date }, options: { excludeVisitId?: string } = {}): Promise<SchedulingData> {
  const techRows = await db
    .select({ id: technicians.id, weeklyHours: technicians.weeklyHours, skills: technicians.skills, name: users.name })
    .from(technicians)
    .innerJoin(users, eq(users.id, technicians.userId))
    // A turned-off account takes no new work.
    .where(and(eq(technicians.active, true), isNull(users.disabledAt)));
  const ids = techRows.map((t) => t.id);
  const offRows = ids.length
    ? await db
        .select()
        .from(technicianTimeOff)
        .where(and(inArray(technicianTimeOff.technicianId, ids), lt(technicianTimeOff.startsAt, range.to), gt(technicianTimeOff.endsAt, range.from)))
    : [];
  const visitRows = await db
    .select({ technicianId: visits.technicianId, startsAt: visits.startsAt, endsAt: visits.endsAt, priority: visits.priority })
    .from(visits)
    .where(
      and(
        isNotNull(visits.technicianId),
        inArray(visits.status, [...ACTIVE_STATUSES]),
        lt(visits.startsAt, range.to),
        gt(visits.endsAt, range.from),
        options.excludeVisitId ? ne(visits.id, options.excludeVisitId) : undefined,
      ),
    );
  const iso = (d: Date) => d.toISOString();
  return {
    names: new Map(techRows.map((t) => [t.id, t.name])),
    technicians: techRows.map((t) => ({
      id: t.id,
      weeklyHours: technicianHoursToWeekly(t.weeklyHours),
      skills: t.skills,
      timeOff: offRows.filter((o) => o.technicianId === t.id).map((o) => ({ start: iso(o.startsAt), end: iso(o.endsAt) })),
    })),
    booked: visitRows.map((v) => ({ technicianId: v.technicianId!, start: iso(v.startsAt), end: iso(v.endsAt), priority: v.priority })),
  };
}

/** Instants covering local dates from..to in the zone, widened by a day for visits that straddle midnight. */
export function rangeFor(from: string, to: string, timeZone: string): { from: Date; to: Date } {
  const a = DateTime.fromISO(from, { zone: timeZone }).startOf('day').minus({ days: 1 });
  const b = DateTime.fromISO(to, { zone: timeZone }).endOf('day').plus({ days: 1 });
  return { from: a.toJSDate(), to: b.toJSDate() };
}
