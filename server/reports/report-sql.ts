import { sql, type SQL } from 'drizzle-orm';
import type { ReportName, ReportQuery } from '../../shared/schemas/reports';

// One statement per chart. Every number is computed here; Node only renames the columns. Days
// and months are the company's: instants are read "at time zone" the company row's zone, which
// the statement reads itself so a report costs exactly one round trip. A bucket (month or week)
// at either end of the range counts only its days inside the range.

/** The range as local days, the zone, and its first and last instants (end exclusive). */
function range(q: ReportQuery, now: Date): SQL {
  return sql`tz as (select time_zone as z from company where id = 1),
    rng as (
      select ${q.from}::date as d0, ${q.to}::date as d1,
        (${q.from}::date)::timestamp at time zone tz.z as t0,
        ((${q.to}::date) + 1)::timestamp at time zone tz.z as t1,
        (${now.toISOString()}::timestamptz at time zone tz.z)::date as today
      from tz
    )`;
}

function agreementsSql(q: ReportQuery, now: Date): SQL {
  return sql`with ${range(q, now)},
    months as (
      select m::date as month,
        greatest(m::date, rng.d0) as first_day,
        least((m + interval '1 month')::date - 1, rng.d1) as last_day
      from rng, generate_series(date_trunc('month', rng.d0), date_trunc('month', rng.d1), interval '1 month') m
    ),
    -- Every paid term, as termsOf (server/agreements/term-in-force.ts) reads them: the term rows,
    -- plus the agreement row's own range where no term row records it.
    terms as (
      select agreement_id, starts_on, ends_on from agreement_terms
      union all
      select a.id, a.starts_on, a.ends_on from agreements a
      where a.status <> 'pending' and not exists (select 1 from agreement_terms x where x.agreement_id = a.id and x.starts_on = a.starts_on)
    ),
    firsts as (
      select agreement_id, min(starts_on) as first_start from terms group by agreement_id
    ),
    due as (
      -- Renewed: a next term starts on the day this one ends (a hash join, not a search per term).
      select t.ends_on - 1 as last_day, (n.agreement_id is not null) as renewed, a.status
      from terms t join agreements a on a.id = t.agreement_id
        left join (select distinct agreement_id, starts_on from terms) n on n.agreement_id = t.agreement_id and n.starts_on = t.ends_on,
        rng
      where t.ends_on - 1 between rng.d0 and rng.d1
    )
    -- One agreement's terms never overlap (termOn in shared/agreement-terms.ts), so a plain count
    -- is a count of agreements, with no sort for distinct.
    , active as (
      select m.month, count(*)::int as n
      from months m cross join rng cross join tz
        join terms t on t.starts_on <= least(m.last_day, rng.today) and t.ends_on > least(m.last_day, rng.today)
        join agreements a on a.id = t.agreement_id
      where a.canceled_at is null or (a.canceled_at at time zone tz.z)::date > least(m.last_day, rng.today)
      group by m.month
    ),
    due_by_month as (
      select m.month, count(*)::int as due, (count(*) filter (where due.renewed))::int as renewed,
        (count(*) filter (where not due.renewed and due.status in ('lapsed', 'canceled')))::int as lapsed
      from months m join due on due.last_day between m.first_day and m.last_day
      group by m.month
    ),
    new_by_month as (
      select m.month, count(*)::int as n from months m join firsts f on f.first_start between m.first_day and m.last_day group by m.month
    ),
    counted as (
      select to_char(m.month, 'YYYY-MM-DD') as month, coalesce(ac.n, 0) as active, coalesce(nb.n, 0) as new,
        coalesce(d.due, 0) as due, coalesce(d.renewed, 0) as renewed, coalesce(d.lapsed, 0) as lapsed
      from months m left join active ac using (month) left join new_by_month nb using (month) left join due_by_month d using (month)
    )
    select c.*, case when c.due = 0 then null else c.renewed::float8 / c.due end as renewal_rate
    from counted c order by c.month`;
}

function revenueSql(q: ReportQuery, now: Date): SQL {
  return sql`with ${range(q, now)},
    months as (select m::date as month from rng, generate_series(date_trunc('month', rng.d0), date_trunc('month', rng.d1), interval '1 month') m),
    -- What each payment paid for: plans (agreement invoices), tune-ups (service invoices for work
    -- on a tune-up visit), repairs (every other service invoice). A refund counts against the same.
    received as (
      select date_trunc('month', p.succeeded_at at time zone tz.z)::date as month, i.purpose, v.kind, p.amount_cents::bigint as cents
      from payments p join invoices i on i.id = p.invoice_id left join visits v on v.id = i.visit_id, tz, rng
      where p.status = 'succeeded' and p.succeeded_at >= rng.t0 and p.succeeded_at < rng.t1
      union all
      select date_trunc('month', r.created_at at time zone tz.z)::date, i.purpose, v.kind, -r.amount_cents::bigint
      from refunds r join payments p on p.id = r.payment_id join invoices i on i.id = p.invoice_id left join visits v on v.id = i.visit_id, tz, rng
      where r.created_at >= rng.t0 and r.created_at < rng.t1
    ),
    money as (
      select month,
        coalesce(sum(cents) filter (where purpose <> 'service'), 0) as plans,
        coalesce(sum(cents) filter (where purpose = 'service' and kind is not distinct from 'tune_up'), 0) as tune_ups,
        coalesce(sum(cents) filter (where purpose = 'service' and kind is distinct from 'tune_up'), 0) as repairs
      from received group by month
    ),
    issued as (
      select date_trunc('month', i.issued_at at time zone tz.z)::date as month, count(*)::int as n,
        round(avg(i.total_cents))::bigint as average, sum(i.discount_cents)::bigint as savings
      from invoices i, tz, rng
      where i.status not in ('draft', 'void') and i.issued_at >= rng.t0 and i.issued_at < rng.t1
      group by 1
    )
    select to_char(m.month, 'YYYY-MM-DD') as month,
      coalesce(money.plans, 0)::bigint as plans_cents,
      coalesce(money.tune_ups, 0)::bigint as tune_ups_cents,
      coalesce(money.repairs, 0)::bigint as repairs_cents,
      (coalesce(money.plans, 0) + coalesce(money.tune_ups, 0) + coalesce(money.repairs, 0))::bigint as total_cents,
      coalesce(issued.n, 0) as invoices,
      issued.average as average_invoice_cents,
      coalesce(issued.savings, 0)::bigint as savings_cents
    from months m left join money using (month) left join issued using (month)
    order by m.month`;
}

function visitsSql(q: ReportQuery, now: Date): SQL {
  return sql`with ${range(q, now)},
    weeks as (select w::date as week from rng, generate_series(date_trunc('week', rng.d0), date_trunc('week', rng.d1), interval '1 week') w),
    counted as (
      select date_trunc('week', v.starts_at at time zone tz.z)::date as week,
        count(*) filter (where v.kind = 'tune_up')::int as tune_ups,
        count(*) filter (where v.kind = 'service_call')::int as service_calls,
        count(*) filter (where v.status = 'done')::int as done,
        count(*) filter (where v.status = 'no_show')::int as no_shows
      from visits v, tz, rng
      where v.status <> 'canceled' and v.starts_at >= rng.t0 and v.starts_at < rng.t1
      group by 1
    ),
    -- A repair: a visit on which the homeowner approved a quote, unless the visit is itself the
    -- follow-up of an earlier quote (that repair is counted on its first visit). Fixed on the
    -- first visit: no approved quote on it had to open a follow-up visit for an ordered part.
    repairs as (
      select date_trunc('week', v.starts_at at time zone tz.z)::date as week, count(*)::int as repairs,
        count(*) filter (where not exists (select 1 from quotes o where o.visit_id = v.id and o.status = 'approved' and o.follow_up_visit_id is not null))::int as first_visit
      from visits v, tz, rng
      where v.status <> 'canceled' and v.starts_at >= rng.t0 and v.starts_at < rng.t1
        and exists (select 1 from quotes a where a.visit_id = v.id and a.status = 'approved')
        and not exists (select 1 from quotes f where f.follow_up_visit_id = v.id)
      group by 1
    )
    select to_char(w.week, 'YYYY-MM-DD') as week,
      coalesce(c.tune_ups, 0) as tune_ups, coalesce(c.service_calls, 0) as service_calls,
      coalesce(c.done, 0) as done, coalesce(c.no_shows, 0) as no_shows,
      case when coalesce(c.done, 0) + coalesce(c.no_shows, 0) = 0 then null
        else c.no_shows::float8 / (c.done + c.no_shows) end as no_show_rate,
      coalesce(r.repairs, 0) as repairs, coalesce(r.first_visit, 0) as first_visit_fixes,
      case when coalesce(r.repairs, 0) = 0 then null else r.first_visit::float8 / r.repairs end as first_visit_fix_rate
    from weeks w left join counted c using (week) left join repairs r using (week)
    order by w.week`;
}

function utilisationSql(q: ReportQuery, now: Date): SQL {
  return sql`with ${range(q, now)},
    days as (select d::date as day, extract(isodow from d)::int::text as dow from rng, generate_series(rng.d0, rng.d1, interval '1 day') d),
    shifts as (
      select t.id as tech, date_trunc('week', d.day)::date as week,
        (d.day + (t.weekly_hours -> d.dow ->> 'start')::time) at time zone tz.z as s,
        (d.day + (t.weekly_hours -> d.dow ->> 'end')::time) at time zone tz.z as e
      from technicians t cross join days d, tz
      where t.active and t.weekly_hours ? d.dow
    ),
    available as (
      select sh.tech, sh.week,
        sum(extract(epoch from sh.e - sh.s) - coalesce((
          select sum(extract(epoch from least(sh.e, o.ends_at) - greatest(sh.s, o.starts_at)))
          from technician_time_off o where o.technician_id = sh.tech and o.starts_at < sh.e and o.ends_at > sh.s), 0)) / 60 as minutes
      from shifts sh where sh.e > sh.s group by sh.tech, sh.week
    ),
    booked as (
      select v.technician_id as tech, date_trunc('week', v.starts_at at time zone tz.z)::date as week,
        sum(extract(epoch from v.ends_at - v.starts_at)) / 60 as minutes
      from visits v, tz, rng
      where v.technician_id is not null and v.status <> 'canceled' and v.starts_at >= rng.t0 and v.starts_at < rng.t1
      group by 1, 2
    ),
    joined as (
      select coalesce(a.tech, b.tech) as tech, coalesce(a.week, b.week) as week,
        round(coalesce(b.minutes, 0))::int as booked, round(coalesce(a.minutes, 0))::int as available
      from available a full join booked b on a.tech = b.tech and a.week = b.week
    )
    select to_char(j.week, 'YYYY-MM-DD') as week, j.tech as technician_id, u.name as technician_name,
      j.booked as booked_minutes, j.available as available_minutes,
      case when j.available > 0 then j.booked::float8 / j.available else null end as utilisation
    from joined j join technicians t on t.id = j.tech join users u on u.id = t.user_id
    order by j.week, u.name`;
}

export const REPORT_SQL: Record<ReportName, (q: ReportQuery, now: Date) => SQL> = {
  agreements: agreementsSql,
  revenue: revenueSql,
  visits: visitsSql,
  utilisation: utilisationSql,
};
