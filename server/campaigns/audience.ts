import { sql, type SQL } from 'drizzle-orm';
import { DateTime } from 'luxon';
import {
  COOLING_KINDS,
  DRAIN_KINDS,
  DUE_SOON_DAYS,
  EARLY_BOOKING_DAYS,
  FILTER_FACTOR_SHARE,
  HEATING_KINDS,
  MIN_FILTER_DAYS,
  OUTDOOR_COIL_KINDS,
  RECOMMENDED_SERVICE_DAYS,
  YEARLY_SERVICE_DAYS,
  seasonWindow,
  type HouseholdFactor,
} from '../../shared/reminders';
import { RESEND_GUARD_DAYS, type ReminderKind } from '../../shared/seasonal-reminders';
import type { AudienceFilter } from '../../shared/schemas/campaigns';
import { seasonOfMonth, type SeasonSettings } from '../../shared/seasons';
import { FILTER_INTERVAL_DAYS } from '../../shared/service-life';
import type { Db, Tx } from '../db/client';

/**
 * Who is due for a reminder, as one set-based statement over the whole customer base. The numbers
 * come from shared/reminders.ts, so the SQL and the pure rules agree (test/campaign-audience.test.ts
 * compares them). Pages by customer id (keyset), so no caller ever holds every household.
 */
export interface AudienceContext {
  kind: ReminderKind;
  filter: AudienceFilter;
  /** Now, and the company's zone and season months. */
  now: Date;
  timeZone: string;
  seasons: Partial<SeasonSettings>;
}

export type AudienceRow = {
  customer_id: string;
  name: string;
  email: string;
  property_id: string | null;
  reason: string;
  due_on: string;
};

/** Our own numeric constants, written into the statement (never user input). */
const num = (x: number) => sql.raw(String(Number(x)));
const list = (values: Iterable<string>) =>
  sql.join(
    [...values].map((v) => sql`${v}`),
    sql`, `,
  );

/** The filter interval in days of equipment `e` for household factors `hh.factors`, in SQL. */
function filterDaysSql(): SQL {
  const depth = sql`((regexp_match(e.filter_size, '^\\s*\\d{1,2}(?:\\.\\d{1,3})?\\s*[x×]\\s*\\d{1,2}(?:\\.\\d{1,3})?\\s*[x×]\\s*(\\d{1,2}(?:\\.\\d{1,3})?)\\s*(?:"|in(?:ch(?:es)?)?\\.?)?\\s*$', 'i'))[1])::numeric`;
  const base = sql`(case when coalesce(${depth} >= 3, false) or lower(e.filter_type) ~ '\\mmedia\\M' then ${num(FILTER_INTERVAL_DAYS.media_4_5_inch)}
    when coalesce(${depth} >= 1.5, false) then ${num(FILTER_INTERVAL_DAYS.two_inch)}
    when lower(e.filter_type) ~ 'fib(er|re) ?glass|spun ?glass' then ${num(FILTER_INTERVAL_DAYS.one_inch_fiberglass)}
    else ${num(FILTER_INTERVAL_DAYS.one_inch_pleated)} end)`;
  const shares = (Object.entries(FILTER_FACTOR_SHARE) as [HouseholdFactor, { share: number }][]).map(
    ([f, { share }]) => sql`(case when ${f} = any(hh.factors) then ${num(share)}::float8 else 1 end)`,
  );
  return sql`greatest(${num(MIN_FILTER_DAYS)}, round(${base} * ${sql.join(shares, sql` * `)}))::int`;
}

function tuneUpWindow(season: 'cooling' | 'heating', ctx: AudienceContext): { from: Date; to: Date } {
  const today = DateTime.fromJSDate(ctx.now).setZone(ctx.timeZone);
  const w = seasonWindow(season, today, ctx.seasons);
  return { from: w.start.minus({ days: EARLY_BOOKING_DAYS }).toJSDate(), to: w.end.toJSDate() };
}

const noTuneUpBooked = (w: { from: Date; to: Date }) =>
  sql`not exists (select 1 from visits v where v.customer_id = hh.id and v.kind = 'tune_up' and v.status not in ('canceled', 'no_show') and v.starts_at >= ${w.from} and v.starts_at <= ${w.to})`;

/** The lateral subquery that says why this household is due, for which home and from which day. */
function dueSql(ctx: AudienceContext, today: string): SQL {
  const tz = ctx.timeZone;
  const soon = sql`(${today}::date + ${num(DUE_SOON_DAYS)})`;
  const localDay = (col: SQL) => sql`((${col}) at time zone ${tz})::date`;
  if (ctx.kind === 'cooling_tune_up' || ctx.kind === 'heating_tune_up') {
    const season = ctx.kind === 'cooling_tune_up' ? 'cooling' : 'heating';
    const kinds = season === 'cooling' ? COOLING_KINDS : HEATING_KINDS;
    const visits = season === 'cooling' ? sql`pa.cooling_visits` : sql`pa.heating_visits`;
    const w = tuneUpWindow(season, ctx);
    return sql`select pa.property_id, ${`Plan includes a ${season} tune-up; none booked this season`}::text as reason, greatest(${today}::date, ${localDay(sql`${w.from}::timestamptz`)} + ${num(EARLY_BOOKING_DAYS)}) as due_on
      from (select 1) one where pa.customer_id is not null and ${visits} >= 1
        and (not exists (select 1 from properties p join equipment e on e.property_id = p.id where p.customer_id = hh.id and p.archived_at is null and e.archived_at is null)
          or exists (select 1 from properties p join equipment e on e.property_id = p.id where p.customer_id = hh.id and p.archived_at is null and e.archived_at is null and e.kind in (${list(kinds)})))
        and ${noTuneUpBooked(w)}`;
  }
  if (ctx.kind === 'filter') {
    return sql`select f.property_id, f.reason, f.due_on from (
        select p.id as property_id, e.filter_size, d.days,
          coalesce(greatest(fc.changed_on, (select max(${localDay(sql`v.starts_at`)}) from visits v where v.property_id = p.id and v.status = 'done')) + d.days, ${today}::date) as due_on,
          ('Filter ' || e.filter_size || ': every ' || d.days || ' days') as reason
        from properties p join equipment e on e.property_id = p.id
          cross join lateral (select ${filterDaysSql()} as days) d
          left join filter_changes fc on fc.equipment_id = e.id
        where p.customer_id = hh.id and p.archived_at is null and e.archived_at is null and btrim(e.filter_size) <> '') f
      where f.due_on <= ${soon} order by f.due_on limit 1`;
  }
  const kinds = ctx.kind === 'coil_cleaning' ? OUTDOOR_COIL_KINDS : DRAIN_KINDS;
  const pattern = ctx.kind === 'coil_cleaning' ? 'coil clean' : 'condensate|drain';
  return sql`select s.property_id, s.reason, s.due_on from (
      select (select p.id from properties p join equipment e on e.property_id = p.id where p.customer_id = hh.id and p.archived_at is null and e.archived_at is null and e.kind in (${list(kinds)}) limit 1) as property_id,
        case when lv.recommendations ~* ${pattern} then 'Recommended at the last visit'
             when lt.at is null then 'Once a year; none on record' else 'Once a year since the last tune-up' end as reason,
        case when lv.recommendations ~* ${pattern} then ${localDay(sql`lv.starts_at`)} + ${num(RECOMMENDED_SERVICE_DAYS)}
             when lt.at is null then ${today}::date else ${localDay(sql`lt.at`)} + ${num(YEARLY_SERVICE_DAYS)} end as due_on
      from (select 1) one
      left join lateral (select v.starts_at, v.recommendations from visits v where v.customer_id = hh.id and v.status = 'done' order by v.starts_at desc limit 1) lv on true
      left join lateral (select max(v.starts_at) as at from visits v where v.customer_id = hh.id and v.status = 'done' and v.kind = 'tune_up') lt on true) s
    where s.property_id is not null and s.due_on <= ${soon}`;
}

/** The whole statement: households due, after the keyset `after`, at most `limit` (all when null). */
export function audienceSql(ctx: AudienceContext, opts: { after?: string | null; limit?: number | null } = {}): SQL {
  const today = DateTime.fromJSDate(ctx.now).setZone(ctx.timeZone).toISODate()!;
  const f = ctx.filter;
  const where: SQL[] = [
    sql`c.archived_at is null`,
    sql`c.merged_into_id is null`,
    sql`coalesce(c.email, '') <> ''`,
    sql`not (${ctx.kind} = any(coalesce(s.email_off, '{}')))`,
    // The same reminder is not sent twice within the guard (a retried campaign, two offices).
    sql`not exists (select 1 from reminder_sends rs where rs.customer_id = c.id and rs.kind = ${ctx.kind} and rs.status = 'sent' and rs.sent_at > ${new Date(ctx.now.getTime() - RESEND_GUARD_DAYS * 86_400_000)})`,
  ];
  if (opts.after) where.push(sql`c.id > ${opts.after}::uuid`);
  if (f.area) where.push(sql`exists (select 1 from properties p where p.customer_id = c.id and p.archived_at is null and (p.zip = ${f.area} or lower(p.city) = lower(${f.area})))`);
  if (f.equipmentKind)
    where.push(
      sql`exists (select 1 from properties p join equipment e on e.property_id = p.id where p.customer_id = c.id and p.archived_at is null and e.archived_at is null and e.kind = ${f.equipmentKind})`,
    );
  const planWhere: SQL[] = [];
  if (f.plan === 'none') planWhere.push(sql`pa.customer_id is null`);
  else if (f.plan === 'any') planWhere.push(sql`pa.customer_id is not null`);
  else if (f.plan) planWhere.push(sql`pa.code = ${f.plan}`);
  if (f.noTuneUpThisSeason) {
    const month = DateTime.fromJSDate(ctx.now).setZone(ctx.timeZone).month;
    planWhere.push(noTuneUpBooked(tuneUpWindow(seasonOfMonth(month, ctx.seasons), ctx)));
  }
  return sql`with hh as (
      select c.id, c.name, c.email, coalesce(s.factors, '{}') as factors
      from customers c left join household_reminder_settings s on s.customer_id = c.id
      where ${sql.join(where, sql` and `)}
    )
    select hh.id as customer_id, hh.name, hh.email, coalesce(due.property_id, pa.property_id) as property_id, due.reason, due.due_on::text as due_on
    from hh
    left join lateral (
      select a.customer_id, a.property_id, pv.cooling_visits, pv.heating_visits, pl.code
      from agreements a join plan_versions pv on pv.id = a.plan_version_id join plans pl on pl.id = pv.plan_id
      where a.customer_id = hh.id and a.status in ('active', 'renewal_due') order by a.ends_on desc limit 1
    ) pa on true
    join lateral (${dueSql(ctx, today)}) due on true
    ${planWhere.length ? sql`where ${sql.join(planWhere, sql` and `)}` : sql``}
    order by hh.id
    ${opts.limit ? sql`limit ${opts.limit}` : sql``}`;
}

/**
 * Runs the audience statement without PostgreSQL's JIT: the statement is many small index lookups
 * per household, and compiling it cost about as much as running it (1.0–1.4 s of 1.9–3.0 s over
 * 100,000 households, measured with npm run bench campaigns). `set local` ends with the transaction.
 */
async function withoutJit<T>(db: Db | Tx, run: (tx: Db | Tx) => Promise<T>): Promise<T> {
  const go = async (tx: Db | Tx) => (await tx.execute(sql`set local jit = off`), run(tx));
  return 'rollback' in db ? go(db) : db.transaction(go);
}

export async function audiencePage(db: Db | Tx, ctx: AudienceContext, after: string | null, limit: number): Promise<{ rows: AudienceRow[]; next: string | null }> {
  const res = await withoutJit(db, (tx) => tx.execute<AudienceRow>(audienceSql(ctx, { after, limit })));
  return { rows: res.rows, next: res.rows.length === limit ? res.rows.at(-1)!.customer_id : null };
}

export async function audienceCount(db: Db | Tx, ctx: AudienceContext): Promise<number> {
  const res = await withoutJit(db, (tx) => tx.execute<{ n: number }>(sql`select count(*)::int as n from (${audienceSql(ctx)}) a`));
  return res.rows[0]!.n;
}

/** Writes the campaign's outbox straight from the audience statement: nothing passes through Node. */
export async function fillOutbox(tx: Tx, campaignId: string, ctx: AudienceContext): Promise<number> {
  const res = await withoutJit(tx, (t) =>
    t.execute(sql`insert into reminder_sends (campaign_id, customer_id, property_id, kind, email, reason)
    select ${campaignId}::uuid, a.customer_id, a.property_id, ${ctx.kind}, a.email, a.reason from (${audienceSql(ctx)}) a
    on conflict (campaign_id, customer_id, kind) do nothing`),
  );
  return res.rowCount ?? 0;
}
