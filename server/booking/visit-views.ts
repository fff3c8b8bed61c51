import { eq, sql, type SQL } from 'drizzle-orm';
import { DateTime } from 'luxon';
import type { VisitView } from '../../shared/schemas/booking';
import { windowLabel } from '../../shared/scheduling/clock';
import { canChangeOnline, changeCutoff, changeSentence, VISIT_STATE_WORDS, windowMissed } from '../../shared/visits';
import type { Db, Tx } from '../db/client';
import { customers, properties, technicians, users, visits } from '../db/schema';
import { formatPhone } from '../../shared/phone';
import { COMPANY_COUNTRY } from '../company/company';
import { keptBy } from '../../shared/kept';

// The plan behind a property: an agreement that is active or due for renewal.
const memberPlan = sql<string | null>`(
  select p.name from agreements a
  join plan_versions pv on pv.id = a.plan_version_id
  join plans p on p.id = pv.plan_id
  where a.property_id = ${visits.propertyId} and a.status in ('active', 'renewal_due')
  order by a.ends_on desc limit 1)`;

export interface VisitRow {
  id: string;
  customerId: string;
  customerName: string;
  customerEmail: string | null;
  propertyId: string;
  street: string;
  unit: string | null;
  city: string;
  state: string;
  zip: string;
  area: string;
  kind: VisitView['kind'];
  reason: VisitView['reason'];
  status: VisitView['status'];
  windowStart: Date;
  windowEnd: Date;
  startsAt: Date;
  endsAt: Date;
  technicianId: string | null;
  technicianName: string | null;
  planName: string | null;
  priority: boolean;
  symptoms: string[];
  notes: string;
  sequence: number;
}

export async function visitRows(db: Db | Tx, where: SQL | undefined, order: 'asc' | 'desc' = 'asc'): Promise<VisitRow[]> {
  return db
    .select({
      id: visits.id,
      customerId: visits.customerId,
      customerName: customers.name,
      customerEmail: customers.email,
      propertyId: visits.propertyId,
      street: properties.street,
      unit: properties.unit,
      city: properties.city,
      state: properties.state,
      zip: properties.zip,
      area: properties.area,
      kind: visits.kind,
      reason: visits.reason,
      status: visits.status,
      windowStart: visits.windowStart,
      windowEnd: visits.windowEnd,
      startsAt: visits.startsAt,
      endsAt: visits.endsAt,
      technicianId: visits.technicianId,
      technicianName: users.name,
      planName: memberPlan,
      priority: visits.priority,
      symptoms: visits.symptoms,
      notes: visits.notes,
      sequence: visits.sequence,
    })
    .from(visits)
    .innerJoin(customers, eq(customers.id, visits.customerId))
    .innerJoin(properties, eq(properties.id, visits.propertyId))
    .leftJoin(technicians, eq(technicians.id, visits.technicianId))
    .leftJoin(users, eq(users.id, technicians.userId))
    .where(where)
    .orderBy(order === 'asc' ? visits.windowStart : sql`${visits.windowStart} desc`);
}

/** What the homeowner sees of an assignment: the technician (once one is named) and the window. */
export function noticeSignature(v: Pick<VisitRow, 'status' | 'technicianId' | 'windowStart' | 'windowEnd'>): string {
  const tech = VISIT_STATE_WORDS[v.status].namesTechnician ? (v.technicianId ?? '') : '';
  return `${tech}|${v.windowStart.toISOString()}|${v.windowEnd.toISOString()}`;
}

export function addressOf(r: Pick<VisitRow, 'street' | 'unit' | 'city' | 'state' | 'zip'>): string {
  return `${r.street}${r.unit ? `, ${r.unit}` : ''}, ${r.city}, ${r.state} ${r.zip}`;
}

// A board or list of visits repeats the same instants (visits start at the day's slot times), and
// each local time or label costs several time-zone lookups: each is worked out once per zone and
// instant. Pure functions of their key, so what is kept never goes stale.
const KEPT = 20_000;
const isoKept = keptBy<string>(KEPT);
const labelKept = keptBy<string>(KEPT);
const sentenceKept = keptBy<string>(KEPT);

/** The instant as local ISO time in the zone ("2031-06-02T08:00:00.000-05:00"). */
export function isoIn(at: Date, timeZone: string): string {
  const ms = at.getTime();
  return isoKept(`${timeZone}|${ms}`, () => DateTime.fromMillis(ms, { zone: timeZone }).toISO()!);
}

/** The window as the homeowner reads it, with the zone named on days the clocks change. */
export function labelFor(start: Date, end: Date, timeZone: string): string {
  return labelKept(`${timeZone}|${start.getTime()}|${end.getTime()}`, () => {
    const s = DateTime.fromJSDate(start, { zone: timeZone });
    const showZone = s.startOf('day').offset !== s.endOf('day').offset;
    return windowLabel(start.getTime(), end.getTime(), timeZone, showZone);
  });
}

/**
 * The first instant after `now` at which `toView`'s answer for this row changes with the clock
 * alone, or Infinity: the change cut-off (online changes close) and the end of the window (a window
 * that passed unstarted is flagged). Kept beside `toView` so that a view kept until then is exact.
 */
export function viewChangesAt(r: Pick<VisitRow, 'status' | 'windowStart' | 'windowEnd'>, ctx: { cancelCutoffHours: number; now: Date }): number {
  // Asked of the same rules toView uses, at the only instants either can turn.
  const flags = (at: Date) => `${canChangeOnline(r, ctx, at)}|${windowMissed(r, at)}`;
  const now = flags(ctx.now);
  const turns = [changeCutoff(r, ctx).getTime(), r.windowEnd.getTime()].filter((t) => t > ctx.now.getTime() && flags(new Date(t)) !== now);
  return turns.length ? Math.min(...turns) : Infinity;
}

export function toView(r: VisitRow, ctx: { timeZone: string; cancelCutoffHours: number; phone: string; now: Date }): VisitView {
  const until = changeCutoff(r, ctx);
  const canChange = canChangeOnline(r, ctx, ctx.now);
  return {
    id: r.id,
    customerId: r.customerId,
    customerName: r.customerName,
    propertyId: r.propertyId,
    address: addressOf(r),
    area: r.area,
    kind: r.kind,
    reason: r.reason,
    status: r.status,
    windowStart: isoIn(r.windowStart, ctx.timeZone),
    windowEnd: isoIn(r.windowEnd, ctx.timeZone),
    windowLabel: labelFor(r.windowStart, r.windowEnd, ctx.timeZone),
    startsAt: isoIn(r.startsAt, ctx.timeZone),
    endsAt: isoIn(r.endsAt, ctx.timeZone),
    technicianId: r.technicianId,
    technicianName: r.technicianName,
    member: r.planName !== null,
    planName: r.planName,
    priority: r.priority,
    symptoms: r.symptoms,
    notes: r.notes,
    sequence: r.sequence,
    changeableUntil: isoIn(until, ctx.timeZone),
    canChange,
    changeNotice: canChange
      ? sentenceKept(`${ctx.timeZone}|${until.getTime()}`, () => changeSentence(true, until, '', ctx.timeZone))
      : changeSentence(false, until, formatPhone(ctx.phone, COMPANY_COUNTRY), ctx.timeZone),
    officePhone: ctx.phone,
    windowMissed: windowMissed(r, ctx.now),
  };
}
