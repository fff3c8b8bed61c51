import { and, asc, eq, gt, ilike, inArray, isNull, lt, or, sql } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { gzipSync } from 'node:zlib';
import type { z } from 'zod';
import {
  type assignSchema,
  type boardQuerySchema,
  type BoardResponse,
  type statusChangeSchema,
  type timeOffSchema,
  type VisitEventView,
  type VisitView,
} from '../../shared/schemas/booking';
import type { SessionUser } from '../../shared/schemas/session';
import { canTransition, VISIT_STATUS_LABELS, type VisitStatus } from '../../shared/visits';
import type { AppDeps } from '../deps';
import { sendVisitMail } from '../booking/booking.mail';
import { scheduleAssignmentNotice } from '../booking/assignment-notice';
import { loadVisitRow, requiredSkillFor } from '../booking/booking.service';
import { loadCompanySettings, technicianHoursToWeekly } from '../booking/scheduling-input';
import { deleteTimeOff, insertTimeOff } from '../booking/time-off';
import { toView, viewChangesAt, visitRows, type VisitRow } from '../booking/visit-views';
import { oncePerDatabase } from '../db/prepared-sql';
import { boardVersion, customers, equipment, properties, technicianTimeOff, technicians, users, visitEvents, visits } from '../db/schema';
import { AppError, notFound } from '../http/errors';
import { changeVisitStatus, refusedTransition } from '../visits/visit-status';

const SKILL_LABELS: Record<string, string> = { geothermal: 'geothermal', gas_furnace: 'gas furnace', ductless: 'ductless', refrigerant: 'refrigerant' };

// The queue of work to confirm shows the soonest requests and those of the days on screen;
// `unassignedTotal` says how many wait in all.
export const QUEUE_SHOWN = 50;

// Waiting for the office: a request to confirm, or open work that no technician holds.
const queuedVisit = sql`(${visits.status} = 'requested' or (${visits.technicianId} is null and ${visits.status} in ('scheduled', 'on_the_way', 'on_site', 'no_show')))`;

// The columns named alike in the statement and in VisitRow, and the snake_case rest.
type BoardVisitRow = Pick<
  VisitRow,
  'id' | 'street' | 'unit' | 'city' | 'state' | 'zip' | 'area' | 'kind' | 'reason' | 'status' | 'priority' | 'symptoms' | 'notes' | 'sequence'
> & {
  part: 'board' | 'queue';
  customer_id: string;
  customer_name: string;
  customer_email: string | null;
  property_id: string;
  window_start: string | Date;
  window_end: string | Date;
  starts_at: string | Date;
  ends_at: string | Date;
  technician_id: string | null;
  technician_name: string | null;
  plan_name: string | null;
};

interface BoardTechnicianJson {
  id: string;
  name: string;
  skills: string[];
  truck: string;
  timeOff: { id: string; startsAt: string; endsAt: string; reason: string }[];
}

/** One board as the route sends it: the JSON, and the same gzip-compressed once, on first asking. */
export interface BoardAnswer {
  body: string;
  gzipped(): Buffer;
}

interface KeptBoard {
  version: number;
  builtAt: number;
  validUntil: number;
  answer: BoardAnswer;
}

// Boards kept per process and database: a day or a week for each filter the office uses.
const MAX_BOARDS = 32;
const keptBoards = oncePerDatabase(() => new Map<string, KeptBoard>());

function boardAnswer(body: string): BoardAnswer {
  let zipped: Buffer | undefined;
  return { body, gzipped: () => (zipped ??= gzipSync(body)) };
}

/**
 * The board, kept per process: triggers bump `board_version` at the commit of every write the
 * board shows, so reading that version (one indexed row) says whether a kept board is still the
 * board; the views that change with the clock alone (online changes closing, a window passing
 * unstarted) say until when (`viewChangesAt`). The version is read before anything else, so a write
 * committed while a board is built only makes the board newer than its label.
 */
export async function keptBoard(deps: Pick<AppDeps, 'database' | 'clock'>, q: z.output<typeof boardQuerySchema>): Promise<BoardAnswer> {
  const { db } = deps.database;
  const [row] = await db.select({ version: boardVersion.version }).from(boardVersion).limit(1);
  const version = Number(row?.version ?? 0);
  const key = JSON.stringify([q.from, q.days, q.kind ?? null, q.area ?? null, q.technicianId ?? null]);
  const boards = keptBoards(db);
  const now = deps.clock().getTime();
  const kept = boards.get(key);
  if (kept && kept.version === version && kept.builtAt <= now && now < kept.validUntil) return kept.answer;
  const built = await board(deps, q);
  const answer = boardAnswer(JSON.stringify(built.board));
  if (!kept || kept.version <= version) {
    boards.delete(key);
    if (boards.size >= MAX_BOARDS) boards.delete(boards.keys().next().value!);
    boards.set(key, { version, builtAt: built.now.getTime(), validUntil: built.validUntil, answer });
  }
  return answer;
}

/**
 * The board in a fixed number of statements whatever the calendar holds: the company's settings,
 * then the technicians (with their time off), the areas and the size of the queue in one, then the
 * visits on screen together with the soonest of the queue in one more. Each visit's address,
 * household, technician and plan are looked up by key, row by row, so the work grows with the
 * visits shown and not with the households on file.
 */
async function board(deps: Pick<AppDeps, 'database' | 'clock'>, q: z.output<typeof boardQuerySchema>): Promise<{ board: BoardResponse; now: Date; validUntil: number }> {
  const { db } = deps.database;
  const c = await loadCompanySettings(db);
  const start = DateTime.fromISO(q.from, { zone: c.timeZone }).startOf('day');
  const end = start.plus({ days: q.days });
  const from = start.toJSDate();
  const to = end.toJSDate();
  const filters =
    and(q.kind ? eq(visits.kind, q.kind) : undefined, q.area ? sql`${visits.propertyId} in (select p.id from properties p where p.area = ${q.area})` : undefined) ?? sql`true`;
  const [head] = (
    await db.execute<{ technicians: BoardTechnicianJson[]; areas: string[] | null; unassigned_total: number }>(sql`
      select
        (select coalesce(json_agg(json_build_object(
            'id', t.id, 'name', u.name, 'skills', t.skills, 'truck', t.truck,
            'timeOff', (select coalesce(json_agg(json_build_object('id', o.id, 'startsAt', o.starts_at, 'endsAt', o.ends_at, 'reason', o.reason) order by o.starts_at, o.id), '[]')
                        from technician_time_off o where o.technician_id = t.id and o.starts_at < ${to} and o.ends_at > ${from})
          ) order by u.name, t.id), '[]')
         from technicians t join users u on u.id = t.user_id
         where t.active ${q.technicianId ? sql`and t.id = ${q.technicianId}` : sql``}) as technicians,
        -- Distinct areas by walking the area index, one probe per area rather than a scan of every property.
        (with recursive a(area) as (
           (select area from properties order by area limit 1)
           union all
           select (select p.area from properties p where p.area > a.area order by p.area limit 1) from a where a.area is not null)
         select array_agg(area order by area) from a where area is not null and area <> '') as areas,
        (select count(*)::int from ${visits} where ${queuedVisit} and ${filters}) as unassigned_total`)
  ).rows;
  const picked = sql`${visits.id}, ${visits.customerId}, ${visits.propertyId}, ${visits.kind}, ${visits.reason}, ${visits.status},
    ${visits.windowStart}, ${visits.windowEnd}, ${visits.startsAt}, ${visits.endsAt}, ${visits.technicianId}, ${visits.priority},
    ${visits.symptoms}, ${visits.notes}, ${visits.sequence}
    from ${visits}`;
  const onScreen = sql`tstzrange(${visits.windowStart}, ${visits.windowEnd}, '[)') && tstzrange(${from}, ${to}, '[)')`;
  // "offset 0" keeps each lookup a probe by key per visit: the planner may not fold it into a hash
  // join over every home or household.
  const { rows } = await db.execute<BoardVisitRow>(sql`
    select b.*, p.street, p.unit, p.city, p.state, p.zip, p.area, c.name as customer_name, c.email as customer_email, tu.name as technician_name,
      (select pl.name from agreements a
        join plan_versions pv on pv.id = a.plan_version_id
        join plans pl on pl.id = pv.plan_id
        where a.property_id = b.property_id and a.status in ('active', 'renewal_due')
        order by a.ends_on desc limit 1) as plan_name
    from (
      (select 'board' as part, ${picked}
        where ${onScreen} and not ${queuedVisit} and ${filters} ${q.technicianId ? sql`and ${visits.technicianId} = ${q.technicianId}` : sql``})
      union all
      (
        -- The queue ignores the technician filter (unassigned work belongs to no one yet) and spans
        -- every date: a request for next month waits for the office as much as one for today. It
        -- shows the soonest, and always the waiting work of the days on screen.
        (select 'queue' as part, ${picked} where ${queuedVisit} and ${filters} order by ${visits.windowStart}, ${visits.id} limit ${QUEUE_SHOWN})
        union
        (select 'queue', ${picked} where ${onScreen} and ${queuedVisit} and ${filters})
      )
    ) b
    cross join lateral (select street, unit, city, state, zip, area from properties where id = b.property_id offset 0) p
    cross join lateral (select name, email from customers where id = b.customer_id offset 0) c
    left join lateral (select (select u.name from users u where u.id = t.user_id) as name from technicians t where t.id = b.technician_id offset 0) tu on true
    order by b.part, b.window_start, b.id`);
  const now = deps.clock();
  const ctx = { timeZone: c.timeZone, cancelCutoffHours: c.cancelCutoffHours, phone: c.phone, now };
  const onBoard: VisitView[] = [];
  const queue: VisitView[] = [];
  let validUntil = Infinity;
  for (const r of rows) {
    const row = boardVisitRow(r);
    (r.part === 'queue' ? queue : onBoard).push(toView(row, ctx));
    validUntil = Math.min(validUntil, viewChangesAt(row, ctx));
  }
  const iso = (t: string) => new Date(t).toISOString();
  return {
    now,
    validUntil,
    board: {
      from: start.toISODate()!,
      days: q.days,
      timeZone: c.timeZone,
      technicians: (head?.technicians ?? []).map((t) => ({ ...t, timeOff: t.timeOff.map((o) => ({ ...o, startsAt: iso(o.startsAt), endsAt: iso(o.endsAt) })) })),
      unassigned: queue,
      unassignedTotal: head?.unassigned_total ?? queue.length,
      visits: onBoard,
      areas: head?.areas ?? [],
    },
  };
}

function boardVisitRow(r: BoardVisitRow): VisitRow {
  return {
    id: r.id,
    customerId: r.customer_id,
    customerName: r.customer_name,
    customerEmail: r.customer_email,
    propertyId: r.property_id,
    street: r.street,
    unit: r.unit,
    city: r.city,
    state: r.state,
    zip: r.zip,
    area: r.area,
    kind: r.kind,
    reason: r.reason,
    status: r.status,
    windowStart: new Date(r.window_start),
    windowEnd: new Date(r.window_end),
    startsAt: new Date(r.starts_at),
    endsAt: new Date(r.ends_at),
    technicianId: r.technician_id,
    technicianName: r.technician_name,
    planName: r.plan_name,
    priority: r.priority,
    symptoms: r.symptoms,
    notes: r.notes,
    sequence: r.sequence,
  };
}

function isOverlap(err: unknown): boolean {
  const e = err as { code?: string; cause?: { code?: string } };
  return e?.code === '23P01' || e?.cause?.code === '23P01';
}

/** Skills, time off and working hours: the reasons a technician cannot take this visit. */
async function checkTechnicianFits(
  deps: Pick<AppDeps, 'database'>,
  technicianId: string,
  visit: { propertyId: string; reason: Parameters<typeof requiredSkillFor>[1]; startsAt: Date; endsAt: Date },
  timeZone: string,
): Promise<string> {
  const { db } = deps.database;
  const [tech] = await db
    .select({ id: technicians.id, name: users.name, skills: technicians.skills, weeklyHours: technicians.weeklyHours, active: technicians.active })
    .from(technicians)
    .innerJoin(users, eq(users.id, technicians.userId))
    .where(eq(technicians.id, technicianId))
    .limit(1);
  if (!tech || !tech.active) throw new AppError(422, 'validation_failed', 'That technician was not found.', { technicianId: 'not an active technician' });
  const kinds = await db
    .select({ kind: equipment.kind })
    .from(equipment)
    .where(and(eq(equipment.propertyId, visit.propertyId), isNull(equipment.archivedAt)));
  const skill = requiredSkillFor(
    kinds.map((k) => k.kind),
    visit.reason,
  );
  if (skill && !tech.skills.includes(skill)) {
    const label = SKILL_LABELS[skill] ?? skill;
    throw new AppError(422, 'skill_missing', `${tech.name} is not set up for ${label} work, which this visit needs.`, { technicianId: `needs the ${label} skill` });
  }
  const [away] = await db
    .select({ id: technicianTimeOff.id, reason: technicianTimeOff.reason })
    .from(technicianTimeOff)
    .where(and(eq(technicianTimeOff.technicianId, technicianId), lt(technicianTimeOff.startsAt, visit.endsAt), gt(technicianTimeOff.endsAt, visit.startsAt)))
    .limit(1);
  if (away) {
    throw new AppError(422, 'time_off', `${tech.name} is off at that time${away.reason ? ` (${away.reason})` : ''}.`, { technicianId: 'is off at that time' });
  }
  const start = DateTime.fromJSDate(visit.startsAt, { zone: timeZone });
  const end = DateTime.fromJSDate(visit.endsAt, { zone: timeZone });
  const day = technicianHoursToWeekly(tech.weeklyHours)[(['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'] as const)[start.weekday - 1]!];
  const minutes = (d: DateTime) => d.hour * 60 + d.minute;
  const toMin = (t: string) => Number(t.slice(0, 2)) * 60 + Number(t.slice(3, 5));
  const inShift = day?.some((h) => start.hasSame(end, 'day') && toMin(h.open) <= minutes(start) && minutes(end) <= toMin(h.close));
  if (!inShift) {
    throw new AppError(422, 'outside_hours', `That visit falls outside ${tech.name}'s working hours.`, { technicianId: 'outside working hours' });
  }
  return tech.name;
}

export async function assignVisit(
  deps: Pick<AppDeps, 'config' | 'database' | 'clock' | 'logger' | 'mailer' | 'jobs'>,
  user: SessionUser,
  id: string,
  body: z.output<typeof assignSchema>,
): Promise<VisitView> {
  const { db } = deps.database;
  const c = await loadCompanySettings(db);
  const now = deps.clock();
  const before = await loadVisitRow(db, id);
  if (!['requested', 'scheduled', 'on_the_way', 'no_show'].includes(before.status)) {
    throw new AppError(409, 'not_changeable', `A visit that is ${VISIT_STATUS_LABELS[before.status].toLowerCase()} cannot be reassigned.`);
  }
  const length = before.endsAt.getTime() - before.startsAt.getTime();
  const startsAt = body.startsAt ? new Date(body.startsAt) : before.startsAt;
  const endsAt = new Date(startsAt.getTime() + length);
  const moved = startsAt.getTime() !== before.startsAt.getTime();
  // A start still inside the arrival window is an internal reshuffle: the homeowner's window stays.
  // A start outside it moves the window with the work, keeping the window's length.
  const insideWindow = startsAt.getTime() >= before.windowStart.getTime() && startsAt.getTime() < before.windowEnd.getTime();
  const windowMoved = moved && !insideWindow;
  const windowStart = windowMoved ? startsAt : before.windowStart;
  const windowEnd = windowMoved ? new Date(startsAt.getTime() + (before.windowEnd.getTime() - before.windowStart.getTime())) : before.windowEnd;
  let techName: string | null = null;
  if (body.technicianId) techName = await checkTechnicianFits(deps, body.technicianId, { propertyId: before.propertyId, reason: before.reason, startsAt, endsAt }, c.timeZone);
  const status: VisitStatus = body.technicianId ? (before.status === 'requested' || before.status === 'no_show' ? 'scheduled' : before.status) : 'requested';
  const changedForHomeowner = windowMoved || body.technicianId !== before.technicianId || status !== before.status;
  try {
    await db.transaction(async (tx) => {
      await changeVisitStatus(tx, {
        visitId: id,
        to: status,
        actor: user.id,
        action: moved ? 'rescheduled' : 'assigned',
        note: body.technicianId ? `Assigned to ${techName}` : 'Returned to the unassigned queue',
        changes: {
          technicianId: body.technicianId,
          startsAt,
          endsAt,
          windowStart,
          windowEnd,
          ...(changedForHomeowner ? { sequence: sql`${visits.sequence} + 1` } : {}),
          ...(windowMoved ? { reminderSentAt: null } : {}),
          updatedAt: now,
        },
      });
    });
  } catch (err) {
    if (isOverlap(err)) {
      throw new AppError(409, 'overlap', `${techName ?? 'That technician'} already has a visit at that time. Pick another technician or time.`, {
        technicianId: 'already booked at that time',
      });
    }
    throw err;
  }
  const row = await loadVisitRow(db, id);
  // Told once the assignment settles, and only about what the homeowner sees (assignment-notice.ts).
  if (body.technicianId && changedForHomeowner) await scheduleAssignmentNotice(deps, id);
  return toView(row, { timeZone: c.timeZone, cancelCutoffHours: c.cancelCutoffHours, phone: c.phone, now });
}

const TECHNICIAN_MAY_SET: readonly VisitStatus[] = ['on_the_way', 'on_site', 'done', 'no_show'];

export async function changeStatus(
  deps: Pick<AppDeps, 'config' | 'database' | 'clock' | 'logger' | 'mailer' | 'jobs'>,
  user: SessionUser,
  id: string,
  body: z.output<typeof statusChangeSchema>,
): Promise<VisitView> {
  const { db } = deps.database;
  const c = await loadCompanySettings(db);
  const now = deps.clock();
  const before = await loadVisitRow(db, id);
  if (user.role === 'technician') {
    const [mine] = await db.select({ id: technicians.id }).from(technicians).where(eq(technicians.userId, user.id)).limit(1);
    if (!mine || before.technicianId !== mine.id) throw notFound('That visit');
    if (!TECHNICIAN_MAY_SET.includes(body.status)) throw new AppError(403, 'forbidden', 'Only the office can make that change.');
  }
  if (before.status === body.status) return toView(before, { timeZone: c.timeZone, cancelCutoffHours: c.cancelCutoffHours, phone: c.phone, now });
  // The office's status form hears a refused choice as a form error; a change that loses a race
  // with another is refused again under the row lock, as a conflict.
  if (!canTransition(before.status, body.status)) {
    const refused = refusedTransition(before.status, body.status);
    throw new AppError(422, refused.code, refused.message, refused.fields);
  }
  if (body.status === 'scheduled' && !before.technicianId) {
    throw new AppError(422, 'validation_failed', 'Assign a technician before scheduling.', { status: 'needs a technician first' });
  }
  try {
    await db.transaction(async (tx) => {
      await changeVisitStatus(tx, {
        visitId: id,
        to: body.status,
        actor: user.id,
        note: body.note,
        changes: {
          ...(body.status === 'done' ? { completedAt: now } : {}),
          ...(body.status === 'canceled' ? { sequence: sql`${visits.sequence} + 1` } : {}),
          updatedAt: now,
        },
      });
    });
  } catch (err) {
    // A no-show brought back may now collide with a visit booked into the freed time.
    if (isOverlap(err)) throw new AppError(409, 'overlap', 'That time has since been given to another visit. Reassign it instead.');
    throw err;
  }
  const row = await loadVisitRow(db, id);
  if (body.status === 'on_the_way') await sendVisitMail(deps, 'on_the_way', row, c);
  if (body.status === 'canceled') await sendVisitMail(deps, 'cancellation', row, c);
  return toView(row, { timeZone: c.timeZone, cancelCutoffHours: c.cancelCutoffHours, phone: c.phone, now });
}

export async function visitHistory(deps: Pick<AppDeps, 'database'>, id: string): Promise<VisitEventView[]> {
  const { db } = deps.database;
  await loadVisitRow(db, id);
  const techUsers = db.$with('tech_users').as(
    db
      .select({ techId: technicians.id, techName: sql<string>`${users.name}`.as('tech_name') })
      .from(technicians)
      .innerJoin(users, eq(users.id, technicians.userId)),
  );
  const rows = await db
    .with(techUsers)
    .select({
      at: visitEvents.at,
      action: visitEvents.action,
      fromStatus: visitEvents.fromStatus,
      toStatus: visitEvents.toStatus,
      actorName: users.name,
      technicianName: techUsers.techName,
      note: visitEvents.note,
    })
    .from(visitEvents)
    .leftJoin(users, eq(users.id, visitEvents.actorUserId))
    .leftJoin(techUsers, eq(techUsers.techId, visitEvents.technicianId))
    .where(eq(visitEvents.visitId, id))
    .orderBy(asc(visitEvents.at));
  return rows.map((r) => ({ ...r, at: r.at.toISOString(), actorName: r.actorName ?? null, technicianName: r.technicianName ?? null }));
}

export async function addTimeOff(deps: Pick<AppDeps, 'database' | 'clock'>, body: z.output<typeof timeOffSchema>) {
  const { db } = deps.database;
  const [tech] = await db.select({ id: technicians.id }).from(technicians).where(eq(technicians.id, body.technicianId)).limit(1);
  if (!tech) throw new AppError(422, 'validation_failed', 'That technician was not found.', { technicianId: 'not a technician' });
  const startsAt = new Date(body.startsAt);
  const endsAt = new Date(body.endsAt);
  const row = await insertTimeOff(db, { technicianId: body.technicianId, startsAt, endsAt, reason: body.reason });
  // Visits already in that time stay put; the office sees them and moves them.
  const c = await loadCompanySettings(db);
  const clashes = await visitRows(
    db,
    and(eq(visits.technicianId, body.technicianId), inArray(visits.status, ['requested', 'scheduled']), lt(visits.startsAt, endsAt), gt(visits.endsAt, startsAt)),
  );
  return {
    timeOff: { id: row.id, startsAt: row.startsAt.toISOString(), endsAt: row.endsAt.toISOString(), reason: row.reason },
    conflicts: clashes.map((r) => toView(r, { timeZone: c.timeZone, cancelCutoffHours: c.cancelCutoffHours, phone: c.phone, now: deps.clock() })),
  };
}

export async function removeTimeOff(deps: Pick<AppDeps, 'database'>, id: string): Promise<void> {
  if (!(await deleteTimeOff(deps.database.db, id))) throw notFound('That time off');
}

/** Households for the office booking a caller: by name, e-mail, phone or street. */
export async function findHouseholds(deps: Pick<AppDeps, 'database'>, q: string) {
  const term = `%${q.replace(/[\\%_]/g, (m) => `\\${m}`)}%`;
  const digits = q.replace(/\D/g, '');
  return deps.database.db
    .selectDistinct({ id: customers.id, name: customers.name, email: customers.email, phone: customers.phone })
    .from(customers)
    .leftJoin(properties, eq(properties.customerId, customers.id))
    .where(
      and(
        isNull(customers.archivedAt),
        or(ilike(customers.name, term), ilike(customers.email, term), ilike(properties.street, term), digits.length >= 4 ? ilike(customers.phone, `%${digits}%`) : undefined),
      ),
    )
    .orderBy(asc(customers.name))
    .limit(20);
}
