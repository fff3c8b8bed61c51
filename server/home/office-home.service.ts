import { sql } from 'drizzle-orm';
import type { CountAndTotal, OfficeHome } from '../../shared/schemas/home';
import type { AppDeps } from '../deps';
import { inList } from '../db/schema/columns';

export const RECENT_PAYMENT_DAYS = 7;
const RENEWAL_DAYS = 30;
/** Campaigns that are still going out or will: the reminders page lists them with their progress. */
export const RUNNING_CAMPAIGNS = ['sending', 'scheduled', 'paused'] as const;

const pair = (count: unknown, total: unknown): CountAndTotal => ({ count: Number(count ?? 0), totalCents: Number(total ?? 0) });

/**
 * The office's first screen in one statement: today's and tomorrow's visits by status, the
 * unassigned queue, renewals due in 30 days, past-due agreements, the week's payments, open quotes
 * and running reminder campaigns. Each count uses the same rule as the page it links to (dispatch
 * board queue, renewals views, the quotes page's "Open" view with each quote at its dearest option).
 */
export async function officeHome(deps: Pick<AppDeps, 'database' | 'clock'>): Promise<OfficeHome> {
  const { db } = deps.database;
  const result = await db.execute<Record<string, unknown>>(sql`
    with tz as (select time_zone as z from company where id = 1),
    d as (select (${deps.clock().toISOString()}::timestamptz at time zone tz.z)::date as today, tz.z from tz),
    span as (
      select d.today, d.z,
        d.today::timestamp at time zone d.z as t0,
        (d.today + 1)::timestamp at time zone d.z as t1,
        (d.today + 2)::timestamp at time zone d.z as t2,
        (d.today - ${RECENT_PAYMENT_DAYS - 1}::int)::timestamp at time zone d.z as paid_from
      from d
    ),
    day_visits as (
      select case when v.window_start < span.t1 then 'today' else 'tomorrow' end as day, v.status, count(*)::int as n
      from visits v, span
      where v.status <> 'canceled' and v.window_start >= span.t0 and v.window_start < span.t2
      group by 1, 2
    )
    select to_char(span.today, 'YYYY-MM-DD') as today, to_char(span.today + 1, 'YYYY-MM-DD') as tomorrow,
      (select coalesce(json_object_agg(status, n), '{}'::json) from day_visits where day = 'today') as visits_today,
      (select coalesce(json_object_agg(status, n), '{}'::json) from day_visits where day = 'tomorrow') as visits_tomorrow,
      (select count(*)::int from visits v
        where v.status = 'requested' or (v.technician_id is null and v.status in ('scheduled', 'on_the_way', 'on_site', 'no_show'))) as unassigned,
      a.due_count, a.due_total, a.past_count, a.past_total, p.paid_count, p.paid_total, q.quote_count, q.quote_total,
      (select count(*)::int from reminder_campaigns where status in (${sql.raw(inList(RUNNING_CAMPAIGNS))})) as campaigns_running
    from span,
      lateral (
        select count(*) filter (where status in ('active', 'renewal_due') and ends_on between span.today and span.today + ${RENEWAL_DAYS}::int)::int as due_count,
          coalesce(sum(price_cents) filter (where status in ('active', 'renewal_due') and ends_on between span.today and span.today + ${RENEWAL_DAYS}::int), 0)::bigint as due_total,
          count(*) filter (where status = 'past_due')::int as past_count,
          coalesce(sum(price_cents) filter (where status = 'past_due'), 0)::bigint as past_total
        from agreements
      ) a,
      lateral (
        select count(*)::int as paid_count, coalesce(sum(amount_cents - refunded_cents), 0)::bigint as paid_total
        from payments where status = 'succeeded' and succeeded_at >= span.paid_from
      ) p,
      lateral (
        select count(*)::int as quote_count, coalesce(sum(best.total), 0)::bigint as quote_total
        from quotes qu,
          lateral (
            select coalesce(max(o.total_cents), 0) as total from quote_options o
            join quote_revisions r on r.id = o.revision_id where r.quote_id = qu.id and r.revision = qu.revision
          ) best
        where qu.status in ('draft', 'sent')
      ) q`);
  const r = result.rows[0];
  if (!r)
    return {
      today: '',
      tomorrow: '',
      visitsToday: {},
      visitsTomorrow: {},
      unassigned: 0,
      renewalsDue30: pair(0, 0),
      pastDue: pair(0, 0),
      recentPayments: pair(0, 0),
      recentPaymentDays: RECENT_PAYMENT_DAYS,
      openQuotes: pair(0, 0),
      runningCampaigns: 0,
    };
  return {
    today: String(r.today),
    tomorrow: String(r.tomorrow),
    visitsToday: r.visits_today as OfficeHome['visitsToday'],
    visitsTomorrow: r.visits_tomorrow as OfficeHome['visitsTomorrow'],
    unassigned: Number(r.unassigned),
    renewalsDue30: pair(r.due_count, r.due_total),
    pastDue: pair(r.past_count, r.past_total),
    recentPayments: pair(r.paid_count, r.paid_total),
    recentPaymentDays: RECENT_PAYMENT_DAYS,
    openQuotes: pair(r.quote_count, r.quote_total),
    runningCampaigns: Number(r.campaigns_running),
  };
}
