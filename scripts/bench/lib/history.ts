// Years of history for the reports bench: past terms of every agreement with their paid renewal
// invoices, a service invoice a household a year, and a technician calendar of finished visits.
// Plain SQL on the pool; times are the company's local clock read "at time zone".
import type pg from 'pg';

export async function generateHistory(pool: pg.Pool, today: string, years: number, technicians = 20): Promise<{ terms: number; invoices: number; visits: number }> {
  const tz = `(select time_zone from company where id = 1)`;
  // Earlier yearly terms behind each agreement's current one; about one in six began later.
  await pool.query(
    `insert into agreement_terms (agreement_id, starts_on, ends_on, plan_version_id, price_cents, source)
     select a.id, (a.starts_on - make_interval(years => k))::date, (a.starts_on - make_interval(years => k - 1))::date, a.plan_version_id, a.price_cents, 'bench'
     from agreements a cross join generate_series(0, $1::int - 1) k
     where a.status <> 'pending' and (k = 0 or abs(hashtext(a.id::text || k)) % 6 <> 0)
     on conflict do nothing`,
    [years],
  );
  const base = Number((await pool.query(`select coalesce(max(number), 1000) as n from invoices`)).rows[0].n);
  await pool.query(
    `with t as (
       select t.id as term_id, t.agreement_id, a.customer_id, t.plan_version_id, t.starts_on, t.price_cents,
              row_number() over (order by t.id) as n
       from agreement_terms t join agreements a on a.id = t.agreement_id where t.source = 'bench' and t.invoice_id is null and t.starts_on <= $2::date
     ), i as (
       insert into invoices (number, customer_id, agreement_id, purpose, status, plan_version_id, term_starts_on, subtotal_cents, discount_cents, tax_cents, total_cents, paid_cents, issued_at, paid_at)
       select $1::int + n, customer_id, agreement_id, 'renewal', 'paid', plan_version_id, starts_on, price_cents, 0, 0, price_cents, price_cents,
              (starts_on - 10)::timestamp at time zone ${tz}, (starts_on - 3 + interval '10 hours')::timestamp at time zone ${tz}
       from t returning id, total_cents, paid_at
     )
     insert into payments (invoice_id, method, status, amount_cents, succeeded_at)
     select id, 'card', 'succeeded', total_cents, paid_at from i`,
    [base, today],
  );
  const base2 = Number((await pool.query(`select coalesce(max(number), 1000) as n from invoices`)).rows[0].n);
  // A service invoice a household a year, on a day of its own, a tenth of them with the plan discount.
  await pool.query(
    `with s as (
       select c.id as customer_id, d::date as day, row_number() over (order by c.id, d) as n, abs(hashtext(c.id::text || d::text)) as h
       from customers c cross join generate_series(1, $2::int) y
         cross join lateral (select (($3::date - make_interval(years => y))::date + (abs(hashtext(c.id::text)) % 360)) as d) x
     ), i as (
       insert into invoices (number, customer_id, purpose, status, subtotal_cents, discount_cents, tax_cents, total_cents, paid_cents, issued_at, paid_at)
       select $1::int + n, customer_id, 'service', 'paid', 15000 + h % 60000, case when h % 10 = 0 then (15000 + h % 60000) / 10 else 0 end, 0,
              15000 + h % 60000 - case when h % 10 = 0 then (15000 + h % 60000) / 10 else 0 end,
              15000 + h % 60000 - case when h % 10 = 0 then (15000 + h % 60000) / 10 else 0 end,
              (day + interval '15 hours')::timestamp at time zone ${tz}, (day + interval '18 hours')::timestamp at time zone ${tz}
       from s returning id, total_cents, paid_at
     )
     insert into payments (invoice_id, method, status, amount_cents, succeeded_at)
     select id, 'card', 'succeeded', total_cents, paid_at from i`,
    [base2, years, today],
  );
  // Technicians of their own, so their calendar overlaps no one else's.
  const hours = JSON.stringify(Object.fromEntries(['1', '2', '3', '4', '5'].map((d) => [d, { start: '08:00', end: '17:00' }])));
  await pool.query(
    `with u as (insert into users (email, name, role) select 'history.tech' || i || '@example.test', 'History Technician ' || i, 'technician' from generate_series(1, $1::int) i returning id)
     insert into technicians (user_id, skills, weekly_hours, active) select id, '{refrigerant,gas_furnace}', $2::jsonb, true from u`,
    [technicians, hours],
  );
  // Four 90-minute visits a technician a weekday, from `years` ago up to three months before today.
  await pool.query(
    `with techs as (select t.id, row_number() over (order by t.id) as k from technicians t join users u on u.id = t.user_id where u.email like 'history.tech%'),
          homes as (select id, customer_id, row_number() over (order by id) - 1 as n from properties),
          slots as (
            select d::date as day, s.slot, techs.id as tech, row_number() over (order by d, s.slot, techs.k) as n,
              row_number() over (order by d, s.slot, techs.k) % (select count(*) from properties) as home_n
            from generate_series($1::date - make_interval(years => $2::int), $1::date - 90, interval '1 day') d
              cross join (values (time '08:00'), (time '09:45'), (time '11:30'), (time '13:15')) s(slot) cross join techs
            where extract(isodow from d) < 6
          )
     insert into visits (customer_id, property_id, technician_id, kind, reason, status, window_start, window_end, starts_at, ends_at, completed_at)
     select h.customer_id, h.id, sl.tech,
            case when sl.n % 3 = 0 then 'service_call' else 'tune_up' end,
            case when sl.n % 3 = 0 then 'no_cooling' else 'tune_up' end,
            case when sl.n % 29 = 0 then 'no_show' when sl.n % 17 = 0 then 'canceled' else 'done' end,
            (sl.day + sl.slot)::timestamp at time zone ${tz}, (sl.day + sl.slot + interval '2 hours')::timestamp at time zone ${tz},
            (sl.day + sl.slot)::timestamp at time zone ${tz}, (sl.day + sl.slot + interval '90 minutes')::timestamp at time zone ${tz},
            case when sl.n % 29 <> 0 and sl.n % 17 <> 0 then (sl.day + sl.slot + interval '90 minutes')::timestamp at time zone ${tz} end
     from slots sl join homes h on h.n = sl.home_n`,
    [today, years],
  );
  await pool.query('vacuum analyze');
  const count = async (t: string) => Number((await pool.query(`select count(*) from ${t}`)).rows[0].count);
  return { terms: await count('agreement_terms'), invoices: await count('invoices'), visits: await count('visits') };
}
