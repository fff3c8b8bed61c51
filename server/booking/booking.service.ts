import { and, asc, eq, inArray, isNull, sql } from 'drizzle-orm';
import { DateTime } from 'luxon';
import type { z } from 'zod';
import { availableWindows, nextFreeWindows, planBooking, SchedulingInputError, type ArrivalWindow, type AvailabilityInput } from '../../shared/scheduling';
import {
  URGENT_REASONS,
  visitKindFor,
  type ArrivalWindowView,
  type bookVisitSchema,
  type BookingOptions,
  type BookingProperty,
  type VisitView,
  type windowsQuerySchema,
  type WindowsResponse,
} from '../../shared/schemas/booking';
import type { SessionUser } from '../../shared/schemas/session';
import { canChangeOnline, changeCutoff, changeSentence, type VisitReason } from '../../shared/visits';
import type { AppDeps } from '../deps';
import { recordBooked } from '../visits/visit-status';
import { linkFilesToVisit } from '../uploads/uploads.service';
import { assertCustomerAccess, isStaffOffice } from '../auth/access';
import type { Db, Tx } from '../db/client';
import { agreements, customers, equipment, plans, planVersions, properties, scheduleVersion, visits } from '../db/schema';
import { AppError, notFound } from '../http/errors';
import { oncePerDatabase } from '../db/prepared-sql';
import { assertOwnedRow } from '../http/ownership';
import { sendVisitMail } from './booking.mail';
import { COMPANY_COUNTRY } from '../company/company';
import { keptBy } from '../../shared/kept';
import { cachedWindows, minuteAfter, scheduleSnapshot } from './schedule-cache';
import { loadCompanySettings, loadSchedulingData, type CompanySettings, type SchedulingData } from './scheduling-input';
import { noticeSignature, toView, visitRows, type VisitRow } from './visit-views';
import { formatPhone } from '../../shared/phone';

const BOOKING_LOCK = 730_611;
const MEMBER_STATUSES = ['active', 'renewal_due'] as const;

/** "That window just filled": answered with the next free windows so the caller can pick again. */
export class WindowFullError extends AppError {
  constructor(readonly alternatives: ArrivalWindowView[]) {
    super(409, 'window_full', 'That arrival window just filled. Please pick one of the next free windows.');
  }
}

export function windowView(w: ArrivalWindow): ArrivalWindowView {
  return { start: w.start, end: w.end, localLabel: w.localLabel, capacity: w.capacity, meetsPriorityPromise: w.meetsPriorityPromise };
}

export function engineError(err: unknown): never {
  if (err instanceof SchedulingInputError) {
    throw new AppError(422, 'validation_failed', `Please check ${err.field}.`, { [err.field]: err.message });
  }
  throw err;
}

export function isOverlap(err: unknown): boolean {
  const e = err as { code?: string; cause?: { code?: string } };
  return e?.code === '23P01' || e?.cause?.code === '23P01';
}

interface PropertyContext extends BookingProperty {
  requiredSkill: string | undefined;
  /** The schedule's version, read in the same statement before any schedule data. */
  scheduleVersion: number;
}

async function memberPlans(db: Db | Tx, propertyIds: string[]) {
  if (!propertyIds.length) return new Map<string, { planName: string; hours: number }>();
  const rows = await db
    .select({ propertyId: agreements.propertyId, planName: plans.name, hours: planVersions.priorityWindowHours, endsOn: agreements.endsOn })
    .from(agreements)
    .innerJoin(planVersions, eq(planVersions.id, agreements.planVersionId))
    .innerJoin(plans, eq(plans.id, planVersions.planId))
    .where(and(inArray(agreements.propertyId, propertyIds), inArray(agreements.status, [...MEMBER_STATUSES])))
    .orderBy(asc(agreements.endsOn));
  // Later-ending agreement wins if a property has two.
  return new Map(rows.map((r) => [r.propertyId, { planName: r.planName, hours: r.hours }]));
}

/** The skill a technician needs for this property and reason, read from its equipment. */
export function requiredSkillFor(kinds: string[], reason: VisitReason): string | undefined {
  if (kinds.includes('geothermal_heat_pump')) return 'geothermal';
  if (reason === 'no_heat' && kinds.includes('gas_furnace') && !kinds.includes('heat_pump')) return 'gas_furnace';
  const coolingOnlyDuctless = kinds.includes('ductless') && !kinds.includes('condensing_unit') && !kinds.includes('heat_pump');
  if (coolingOnlyDuctless && reason !== 'thermostat') return 'ductless';
  return undefined;
}

/** Where a property is and what plan covers it, as the booking screens show it. */
function propertyView(
  p: { id: string; customerId: string; customerName: string; label: string; street: string; unit: string | null; city: string; state: string; zip: string; area: string },
  plan: { planName: string; hours: number } | undefined,
) {
  return {
    id: p.id,
    customerId: p.customerId,
    customerName: p.customerName,
    label: p.label,
    address: `${p.street}${p.unit ? `, ${p.unit}` : ''}, ${p.city}, ${p.state} ${p.zip}`,
    area: p.area,
    member: !!plan,
    planName: plan?.planName ?? null,
    priorityWindowHours: plan?.hours ?? null,
  };
}

// Built once per database and sent as a prepared statement: offers are asked for all the time,
// and building this select anew cost more than running it.
const propertyQuery = oncePerDatabase((db) =>
  db
    .select({
      id: properties.id,
      customerId: properties.customerId,
      customerName: customers.name,
      label: properties.label,
      street: properties.street,
      unit: properties.unit,
      city: properties.city,
      state: properties.state,
      zip: properties.zip,
      area: properties.area,
      archivedAt: properties.archivedAt,
      // The covering plan (the later-ending agreement if two) and the equipment kinds, in the same statement.
      planName: sql<string | null>`(select ${plans.name} from ${agreements}
        join ${planVersions} on ${planVersions.id} = ${agreements.planVersionId} join ${plans} on ${plans.id} = ${planVersions.planId}
        where ${agreements.propertyId} = ${properties.id} and ${agreements.status} in ('active', 'renewal_due')
        order by ${agreements.endsOn} desc, ${agreements.id} desc limit 1)`,
      planHours: sql<number | null>`(select ${planVersions.priorityWindowHours} from ${agreements}
        join ${planVersions} on ${planVersions.id} = ${agreements.planVersionId}
        where ${agreements.propertyId} = ${properties.id} and ${agreements.status} in ('active', 'renewal_due')
        order by ${agreements.endsOn} desc, ${agreements.id} desc limit 1)`,
      kinds: sql<string[]>`array(select ${equipment.kind} from ${equipment} where ${equipment.propertyId} = ${properties.id} and ${equipment.archivedAt} is null)`,
      scheduleVersion: sql<number>`coalesce((select ${scheduleVersion.version} from ${scheduleVersion} limit 1), 0)`,
    })
    .from(properties)
    .innerJoin(customers, eq(customers.id, properties.customerId))
    .where(eq(properties.id, sql.placeholder('propertyId')))
    .limit(1)
    .prepare('property_context'),
);

export async function propertyContext(db: Db, user: SessionUser, propertyId: string, reason: VisitReason): Promise<PropertyContext> {
  const [p] = await propertyQuery(db).execute({ propertyId });
  await assertOwnedRow(db, user, p, 'propertyId', { what: 'That property' });
  const plan = p.planName !== null && p.planHours !== null ? { planName: p.planName, hours: p.planHours } : undefined;
  return {
    ...propertyView(p, plan),
    requiredSkill: requiredSkillFor(p.kinds, reason),
    scheduleVersion: Number(p.scheduleVersion),
  };
}

export async function bookingOptions(deps: Pick<AppDeps, 'database'>, user: SessionUser, customerId: string | undefined): Promise<BookingOptions> {
  const { db } = deps.database;
  const c = await loadCompanySettings(db);
  const target = user.role === 'homeowner' ? user.customerId : customerId;
  if (!target) throw new AppError(422, 'validation_failed', 'Please choose the household.', { customerId: 'is required' });
  await assertCustomerAccess(db, user, target);
  const rows = await db
    .select({
      id: properties.id,
      customerId: properties.customerId,
      customerName: customers.name,
      label: properties.label,
      street: properties.street,
      unit: properties.unit,
      city: properties.city,
      state: properties.state,
      zip: properties.zip,
      area: properties.area,
    })
    .from(properties)
    .innerJoin(customers, eq(customers.id, properties.customerId))
    .where(and(eq(properties.customerId, target), isNull(properties.archivedAt)))
    .orderBy(asc(properties.label));
  const plansBy = await memberPlans(
    db,
    rows.map((r) => r.id),
  );
  return {
    cancelCutoffHours: c.cancelCutoffHours,
    companyPhone: c.phone,
    timeZone: c.timeZone,
    properties: rows.map((r) => propertyView(r, plansBy.get(r.id))),
  };
}

export interface EngineCall {
  input: AvailabilityInput;
  property: PropertyContext;
  company: CompanySettings;
  reason: VisitReason;
  urgent: boolean;
  /** The schedule's range the input covers. */
  range: { from: Date; to: Date };
}

/** Reads everything the engine needs for this caller over local dates [from, from + days]. */
export async function engineInput(
  db: Db | Tx,
  now: Date,
  property: PropertyContext,
  reason: VisitReason,
  from: string | undefined,
  days: number,
  excludeVisitId?: string,
  lookAheadDays = 0,
  // Where the company settings and schedule come from; by default read now on `db`.
  sources?: { company: CompanySettings; schedule(range: { from: Date; to: Date }): Promise<SchedulingData> },
): Promise<EngineCall> {
  const company = sources?.company ?? (await loadCompanySettings(db));
  const span = engineSpan(company.timeZone, now, from, days, lookAheadDays);
  const data = sources ? await sources.schedule(span.range) : await loadSchedulingData(db, span.range, { excludeVisitId });
  const urgent = URGENT_REASONS.includes(reason);
  return {
    company,
    property,
    reason,
    urgent,
    range: span.range,
    input: {
      settings: company.settings,
      technicians: data.technicians,
      booked: data.booked,
      request: {
        visitKind: visitKindFor(reason),
        ...(property.requiredSkill ? { requiredSkill: property.requiredSkill } : {}),
        member: property.member,
        urgent,
        from: span.from,
        to: span.to,
        now: span.now,
        ...(property.priorityWindowHours ? { priorityPromiseHours: property.priorityWindowHours } : {}),
      },
    },
  };
}

interface EngineSpan {
  /** The first and last local days offered, and now in UTC, as the engine reads them. */
  from: string;
  to: string;
  now: string;
  /** The schedule to read: widened by a day each side (visits straddling midnight), plus any look-ahead. */
  range: { from: Date; to: Date };
}

// A pure function of its arguments, asked again for every offer within the same minute.
const spanKept = keptBy<EngineSpan>(5_000);

/** The days an offer covers in the company's zone: from the day asked (never before today) for `days` days. */
export function engineSpan(timeZone: string, now: Date, from: string | undefined, days: number, lookAheadDays = 0): EngineSpan {
  return spanKept(`${timeZone}|${now.getTime()}|${from ?? ''}|${days}|${lookAheadDays}`, () => {
    const nowLocal = DateTime.fromJSDate(now, { zone: timeZone });
    const start = from ? DateTime.fromISO(from, { zone: timeZone }) : nowLocal;
    const first = start < nowLocal.startOf('day') ? nowLocal : start;
    const last = first.plus({ days });
    return {
      from: first.toISODate()!,
      to: last.toISODate()!,
      now: DateTime.fromJSDate(now, { zone: 'UTC' }).toISO()!,
      range: {
        from: first.startOf('day').minus({ days: 1 }).toJSDate(),
        to: last
          .endOf('day')
          .plus({ days: 1 + lookAheadDays })
          .toJSDate(),
      },
    };
  });
}

export async function windowsFor(deps: Pick<AppDeps, 'database' | 'clock'>, user: SessionUser, q: z.output<typeof windowsQuerySchema>): Promise<WindowsResponse> {
  const { db } = deps.database;
  const property = await propertyContext(db, user, q.propertyId, q.reason);
  if (q.visitId) await visitForChange(db, user, q.visitId, deps.clock());
  let call: EngineCall;
  let windows: ArrivalWindow[];
  try {
    if (q.visitId) {
      // Moving a visit leaves its own time out of the schedule: read fresh.
      call = await engineInput(db, deps.clock(), property, q.reason, q.from, q.days, q.visitId);
      windows = availableWindows(call.input);
    } else {
      // New bookings: from this process's snapshot of the schedule while its version (read with the
      // property) is current, narrowed to the days asked only when the engine has to answer anew.
      const now = minuteAfter(deps.clock());
      const snap = await scheduleSnapshot(db, (tz) => engineSpan(tz, now, q.from, q.days).range, property.scheduleVersion);
      call = await engineInput(db, now, property, q.reason, q.from, q.days, undefined, 0, { company: snap.company, schedule: async () => snap.data });
      windows = cachedWindows(snap, call.input, call.range);
    }
  } catch (err) {
    engineError(err);
  }
  return {
    windows: windows.map(windowView),
    member: property.member,
    urgent: call.urgent,
    priorityWindowHours: property.priorityWindowHours,
    timeZone: call.company.timeZone,
  };
}

/** Serialises bookings per local day so the held-back share is counted once; the EXCLUDE stays the last line. */
export async function lockDays(tx: Tx, instants: Date[], timeZone: string): Promise<void> {
  const days = [...new Set(instants.map((d) => Math.floor(DateTime.fromJSDate(d, { zone: timeZone }).startOf('day').toSeconds() / 86_400)))].sort((a, b) => a - b);
  for (const day of days) await tx.execute(sql`select pg_advisory_xact_lock(${BOOKING_LOCK}, ${day})`);
}

export async function alternativesAfter(db: Db | Tx, call: EngineCall, after: string, excludeVisitId?: string): Promise<ArrivalWindowView[]> {
  // Fresh read: the data inside the losing transaction may predate the winner.
  const fresh = await engineInput(db, new Date(Date.parse(call.input.request.now)), call.property, call.reason, call.input.request.from, 1, excludeVisitId, 15);
  return nextFreeWindows(fresh.input, { after, count: 3 }).map(windowView);
}

export async function loadVisitRow(db: Db | Tx, id: string): Promise<VisitRow> {
  const [row] = await visitRows(db, eq(visits.id, id));
  if (!row) throw notFound('That visit');
  return row;
}

export async function bookVisit(
  deps: Pick<AppDeps, 'config' | 'database' | 'clock' | 'logger' | 'mailer' | 'jobs'>,
  user: SessionUser,
  body: z.output<typeof bookVisitSchema>,
): Promise<VisitView> {
  const { db } = deps.database;
  const now = deps.clock();
  const property = await propertyContext(db, user, body.propertyId, body.reason);
  const windowStart = new Date(body.windowStart);
  let call: EngineCall | undefined;
  let id: string;
  try {
    id = await db.transaction(async (tx) => {
      const company = await loadCompanySettings(tx);
      await lockDays(tx, [windowStart], company.timeZone);
      call = await engineInput(tx, now, property, body.reason, DateTime.fromJSDate(windowStart, { zone: company.timeZone }).toISODate()!, 1);
      let plan;
      try {
        // A cheap one-day check first: planBooking would search two weeks ahead for alternatives inside the lock.
        if (!availableWindows(call.input).some((w) => Date.parse(w.start) === Date.parse(body.windowStart))) throw new WindowFullError([]);
        plan = planBooking(call.input, body.windowStart);
      } catch (err) {
        engineError(err);
      }
      // The next free windows are worked out after the lock is released, from a wider read.
      if (!plan.ok) throw new WindowFullError([]);
      const [row] = await tx
        .insert(visits)
        .values({
          customerId: property.customerId,
          propertyId: property.id,
          agreementId: await memberAgreementId(tx, property.id),
          technicianId: plan.visit.technicianId,
          kind: visitKindFor(body.reason),
          reason: body.reason,
          status: 'requested',
          windowStart: new Date(plan.visit.window.start),
          windowEnd: new Date(plan.visit.window.end),
          startsAt: new Date(plan.visit.start),
          endsAt: new Date(plan.visit.end),
          symptoms: body.symptoms,
          notes: body.notes,
          photoIds: body.photoIds,
          // The confirmation tells the window and no technician (a request names none).
          noticeSignature: noticeSignature({ status: 'requested', technicianId: null, windowStart: new Date(plan.visit.window.start), windowEnd: new Date(plan.visit.window.end) }),
          priority: property.member || call.urgent,
        })
        .returning({ id: visits.id });
      await linkFilesToVisit(tx, { customerId: property.customerId, visitId: row!.id }, body.photoIds);
      await recordBooked(tx, {
        visitId: row!.id,
        actor: user.id,
        technicianId: plan.visit.technicianId,
        note: isStaffOffice(user) ? 'Booked by the office for a caller' : 'Booked online',
      });
      return row!.id;
    });
  } catch (err) {
    if ((isOverlap(err) || err instanceof WindowFullError) && call) throw new WindowFullError(await alternativesAfter(db, call, body.windowStart));
    throw err;
  }
  const row = await loadVisitRow(db, id);
  const company = await loadCompanySettings(db);
  await sendVisitMail(deps, 'confirmation', row, company);
  return toView(row, { timeZone: company.timeZone, cancelCutoffHours: company.cancelCutoffHours, phone: company.phone, now });
}

async function memberAgreementId(db: Db | Tx, propertyId: string): Promise<string | null> {
  const [a] = await db
    .select({ id: agreements.id })
    .from(agreements)
    .where(and(eq(agreements.propertyId, propertyId), inArray(agreements.status, [...MEMBER_STATUSES])))
    .orderBy(sql`${agreements.endsOn} desc`)
    .limit(1);
  return a?.id ?? null;
}

/** A visit the user may see; homeowners only their household's, technicians only their own. */
export async function visitFor(db: Db | Tx, user: SessionUser, id: string): Promise<VisitRow> {
  const row = await loadVisitRow(db, id);
  await assertCustomerAccess(db, user, row.customerId);
  return row;
}

/** Authorisation for a visit route before its body is read: someone else's visit is a 404. */
export async function authoriseVisit(deps: Pick<AppDeps, 'database'>, user: SessionUser, id: string): Promise<void> {
  await visitFor(deps.database.db, user, id);
}

/** A visit the user may move or cancel now: open, and before the cut-off for homeowners. */
export async function visitForChange(db: Db | Tx, user: SessionUser, id: string, now: Date): Promise<VisitRow> {
  const row = await visitFor(db, user, id);
  if (user.role === 'technician') throw new AppError(403, 'forbidden', 'Technicians change visits from the dispatch board through the office.');
  if (row.status !== 'requested' && row.status !== 'scheduled') {
    throw new AppError(409, 'not_changeable', 'This visit can no longer be changed online.');
  }
  if (user.role === 'homeowner') {
    const c = await loadCompanySettings(db);
    if (!canChangeOnline(row, c, now)) {
      throw new AppError(
        409,
        'past_cutoff',
        `Online changes closed ${c.cancelCutoffHours} hours before the arrival window. ${changeSentence(false, changeCutoff(row, c), formatPhone(c.phone, COMPANY_COUNTRY), c.timeZone)}`,
      );
    }
  }
  return row;
}
