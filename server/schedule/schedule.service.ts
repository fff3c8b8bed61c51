import { createHash, randomBytes } from 'node:crypto';
import { and, eq, gt, isNull, lt } from 'drizzle-orm';
import { DateTime } from 'luxon';
import type { WeekResponse } from '../../shared/schemas/booking';
import type { SessionUser } from '../../shared/schemas/session';
import { VISIT_REASON_LABELS } from '../../shared/visits';
import type { AppDeps } from '../deps';
import { loadCompanySettings } from '../booking/scheduling-input';
import { addressOf, toView, visitRows } from '../booking/visit-views';
import { technicianFeed } from '../integrations/calendar';
import { calendarFeedTokens, technicians, users, visits } from '../db/schema';
import { AppError, notFound } from '../http/errors';

const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

async function technicianOf(deps: Pick<AppDeps, 'database'>, user: SessionUser, technicianId?: string) {
  const { db } = deps.database;
  const where = user.role === 'technician' ? eq(technicians.userId, user.id) : technicianId ? eq(technicians.id, technicianId) : undefined;
  if (!where) throw new AppError(422, 'validation_failed', 'Please choose the technician.', { technicianId: 'is required' });
  const [tech] = await db.select({ id: technicians.id, name: users.name }).from(technicians).innerJoin(users, eq(users.id, technicians.userId)).where(where).limit(1);
  if (!tech) throw notFound('That technician');
  return tech;
}

/** The technician's visits from Monday of the given week (company time zone), seven days. */
export async function weekSchedule(deps: Pick<AppDeps, 'database' | 'clock'>, user: SessionUser, start: string | undefined, technicianId?: string): Promise<WeekResponse> {
  const { db } = deps.database;
  const c = await loadCompanySettings(db);
  const tech = await technicianOf(deps, user, technicianId);
  const base = start ? DateTime.fromISO(start, { zone: c.timeZone }) : DateTime.fromJSDate(deps.clock(), { zone: c.timeZone });
  const monday = base.startOf('week');
  const sunday = monday.plus({ days: 7 });
  const rows = await visitRows(db, and(eq(visits.technicianId, tech.id), lt(visits.startsAt, sunday.toJSDate()), gt(visits.endsAt, monday.toJSDate())));
  const [feed] = await db
    .select({ createdAt: calendarFeedTokens.createdAt })
    .from(calendarFeedTokens)
    .where(and(eq(calendarFeedTokens.technicianId, tech.id), isNull(calendarFeedTokens.revokedAt)))
    .limit(1);
  const now = deps.clock();
  return {
    start: monday.toISODate()!,
    end: sunday.minus({ days: 1 }).toISODate()!,
    timeZone: c.timeZone,
    technician: tech,
    visits: rows.filter((r) => r.status !== 'canceled').map((r) => toView(r, { timeZone: c.timeZone, cancelCutoffHours: c.cancelCutoffHours, phone: c.phone, now })),
    feed: { active: !!feed, createdAt: feed ? feed.createdAt.toISOString() : null },
  };
}

/** A new private feed link; the old one stops working. The token is shown once and only its hash is kept. */
export async function issueFeedToken(deps: Pick<AppDeps, 'config' | 'database' | 'clock'>, user: SessionUser): Promise<{ url: string }> {
  const tech = await technicianOf(deps, user);
  const token = randomBytes(24).toString('base64url');
  const now = deps.clock();
  await deps.database.db.transaction(async (tx) => {
    await tx
      .update(calendarFeedTokens)
      .set({ revokedAt: now })
      .where(and(eq(calendarFeedTokens.technicianId, tech.id), isNull(calendarFeedTokens.revokedAt)));
    await tx.insert(calendarFeedTokens).values({ technicianId: tech.id, tokenHash: hashToken(token) });
  });
  return { url: `${deps.config.publicUrl.replace(/\/$/, '')}/api/schedule/feed/${token}.ics` };
}

export async function revokeFeedToken(deps: Pick<AppDeps, 'database' | 'clock'>, user: SessionUser): Promise<void> {
  const tech = await technicianOf(deps, user);
  await deps.database.db
    .update(calendarFeedTokens)
    .set({ revokedAt: deps.clock() })
    .where(and(eq(calendarFeedTokens.technicianId, tech.id), isNull(calendarFeedTokens.revokedAt)));
}

/** The .ics feed for a live token: two weeks back, eight weeks ahead. Unknown or revoked tokens are 404. */
export async function feedFor(deps: Pick<AppDeps, 'database' | 'clock'>, token: string): Promise<string> {
  const { db } = deps.database;
  const [row] = await db
    .select({ technicianId: calendarFeedTokens.technicianId, name: users.name })
    .from(calendarFeedTokens)
    .innerJoin(technicians, eq(technicians.id, calendarFeedTokens.technicianId))
    .innerJoin(users, eq(users.id, technicians.userId))
    .where(and(eq(calendarFeedTokens.tokenHash, hashToken(token)), isNull(calendarFeedTokens.revokedAt)))
    .limit(1);
  if (!row) throw notFound('That calendar link');
  const c = await loadCompanySettings(db);
  const now = DateTime.fromJSDate(deps.clock(), { zone: c.timeZone });
  const rows = await visitRows(
    db,
    and(eq(visits.technicianId, row.technicianId), gt(visits.endsAt, now.minus({ weeks: 2 }).toJSDate()), lt(visits.startsAt, now.plus({ weeks: 8 }).toJSDate())),
  );
  return technicianFeed({
    technician: { id: row.technicianId, name: row.name },
    timeZone: c.timeZone,
    stamp: now.toUTC(),
    visits: rows
      .filter((r) => r.status !== 'no_show')
      .map((r) => ({
        id: r.id,
        sequence: r.sequence,
        start: r.startsAt.toISOString(),
        end: r.endsAt.toISOString(),
        summary: `${VISIT_REASON_LABELS[r.reason]}: ${r.customerName}`,
        description: [r.planName ? `Plan member (${r.planName})` : 'Not on a plan', r.notes].filter(Boolean).join('\n'),
        location: addressOf(r),
        status: r.status === 'canceled' ? ('canceled' as const) : ('scheduled' as const),
      })),
  });
}
