// Data generators shared by the benchmarks: households with a property each, and technicians with
// a calendar of booked visits. Plain SQL on the pool, so they follow the schema and not the services.
import { DateTime } from 'luxon';
import { performance } from 'node:perf_hooks';
import type pg from 'pg';

/**
 * `n` invented households with one property each, searchable (search text and trigram index
 * rebuilt once at the end). Needs the company row in place when the caller wants a working app.
 */
export async function generateHouseholds(pool: pg.Pool, n: number): Promise<{ loadSeconds: number; indexSeconds: number }> {
  const q = (text: string) => pool.query(text);
  const t0 = performance.now();
  // Bulk load without per-row triggers or index upkeep; both are rebuilt once afterwards.
  await q(`drop index if exists customers_search_trgm_idx`);
  await q(`alter table customers disable trigger user`);
  await q(`alter table properties disable trigger user`);
  // Invented names from syllables: 40 x 40 surnames, 30 given names, 60 street names.
  await q(`
    with s as (
      select array['ash','bram','cor','dun','el','fen','gal','har','ivy','jor','kel','lin','mor','nor','ol','pem','quin','ros','sel','tor',
                   'ul','van','wex','yar','zel','brin','cal','dor','ev','fal','gre','hol','isl','jes','kest','lor','mar','ned','orr','pry'] as a,
             array['wood','stead','croft','more','ley','ton','brook','field','well','ridge','hurst','by','wick','ford','gate','holm',
                   'dale','mere','thorne','worth','shaw','cote','den','fold','garth','haven','ing','lake','mont','port','rick','side',
                   'stone','vale','wyn','bury','combe','hill','land','mark'] as b,
             array['Avery','Blair','Corin','Delia','Emmett','Farrah','Gideon','Harlow','Ines','Jasper','Kenna','Lionel','Maren','Nico',
                   'Odette','Percy','Quilla','Rafe','Selma','Tobias','Ulla','Vaughn','Wren','Yusuf','Zora','Aldo','Bea','Cyrus','Dov','Esme'] as f
    ), g as (
      select i, s.*, initcap(a[1 + (i * 7) % 40] || b[1 + (i / 40) % 40]) as last, f[1 + (i / 1600) % 30] as first from s, generate_series(1, ${n}) as i
    )
    insert into customers (name, email, phone, created_at)
    select first || ' ' || last, lower(first || '.' || last || '.' || i || '@example.test'),
           '+1816' || lpad(((2000000 + i * 37) % 8000000 + 2000000)::text, 7, '0'),
           now() - (i || ' minutes')::interval
    from g`);
  await q(`
    with s as (select array['Sorghum','Meadowlark','Old Mill','Bluff View','Cottonwood','Prairie Smoke','Kestrel','Tallgrass','Hickory','Limestone',
                   'Switchgrass','Quarry Hill','Sumac','Bur Oak','Redbud','Sycamore','Pawpaw','Chinkapin','Ironweed','Coneflower',
                   'Foxtail','Bluestem','Sideoats','Indiangrass','Wild Plum','Chokecherry','Elderberry','Persimmon','Hackberry','Osage',
                   'Ridgeway','Hollow Creek','Stony Point','Millrace','Ferry','Granary','Depot','Orchard','Vineyard','Spring Branch',
                   'Heron','Plover','Bobwhite','Dickcissel','Bunting','Kingbird','Swallow','Nuthatch','Thrasher','Vireo',
                   'Basswood','Buckeye','Catalpa','Hawthorn','Linden','Locust','Mulberry','Tupelo','Willow','Yellowwood'] as st,
             array['Street','Avenue','Drive','Road','Lane','Court','Way','Circle','Terrace','Place'] as sfx)
    insert into properties (customer_id, street, city, state, zip)
    select c.id, (100 + (row_number() over (order by c.id)) % 9800) || ' ' || st[1 + (abs(hashtext(c.id::text)) % 60)] || ' ' || sfx[1 + (abs(hashtext(c.email)) % 10)],
           'Larkspur Bend', 'MO', case when abs(hashtext(c.name)) % 2 = 0 then '64790' else '64791' end
    from customers c, s
    where not exists (select 1 from properties p where p.customer_id = c.id)`);
  await q(`alter table customers enable trigger user`);
  await q(`alter table properties enable trigger user`);
  // The board's version is bumped by triggers the bulk load went without.
  await q(`update board_version set version = version + 1`);
  await q(`update customers c set search_text = customers_search_doc(c.id, c.name, c.email, c.phone)`);
  const t1 = performance.now();
  await q(`create index customers_search_trgm_idx on customers using gin (search_text gin_trgm_ops)`);
  await q(`vacuum analyze customers`);
  await q(`vacuum analyze properties`);
  const t2 = performance.now();
  return { loadSeconds: (t1 - t0) / 1000, indexSeconds: (t2 - t1) / 1000 };
}

export interface CalendarShape {
  /** Active technicians wanted in all (existing ones count). */
  technicians: number;
  visits: number;
  days: number;
  /** First local day of the calendar (its start of day is used). */
  from: DateTime;
  /** Local start times of the 90-minute visits on a weekday, filled slot by slot. */
  slots?: string[];
}

/**
 * Tops the active technicians up to `technicians` (Monday to Friday, 8 to 5), then books
 * `visits` scheduled visits over the weekdays of `days` days from `from`, one technician slot at a
 * time so none overlap, spread over every property. Returns the technician ids.
 */
export async function generateCalendar(pool: pg.Pool, shape: CalendarShape): Promise<{ technicianIds: string[]; visits: number }> {
  const slots = shape.slots ?? ['08:00', '09:45', '11:30', '13:15', '15:00'];
  const have = Number((await pool.query(`select count(*) from technicians where active`)).rows[0].count);
  const hours = JSON.stringify({
    '1': { start: '08:00', end: '17:00' },
    '2': { start: '08:00', end: '17:00' },
    '3': { start: '08:00', end: '17:00' },
    '4': { start: '08:00', end: '17:00' },
    '5': { start: '08:00', end: '17:00' },
  });
  if (shape.technicians > have) {
    await pool.query(
      `with u as (insert into users (email, name, role) select 'bench.tech' || i || '@example.test', 'Bench Technician ' || i, 'technician' from generate_series(1, $1) i returning id)
       insert into technicians (user_id, skills, weekly_hours) select id, '{refrigerant,gas_furnace}', $2::jsonb from u`,
      [shape.technicians - have, hours],
    );
  }
  const techs = (await pool.query(`select id from technicians where active order by id`)).rows.map((r) => r.id as string);
  const homes = (await pool.query(`select customer_id, id from properties order by id`)).rows as { customer_id: string; id: string }[];
  const rows: string[] = [];
  const params: unknown[] = [];
  outer: for (let d = 0; d < shape.days; d++) {
    const day = shape.from.startOf('day').plus({ days: d });
    if (day.weekday > 5) continue;
    for (const slot of slots) {
      for (const tech of techs) {
        if (rows.length === shape.visits) break outer;
        const [h, m] = slot.split(':').map(Number);
        const start = day.set({ hour: h, minute: m });
        const home = homes[rows.length % homes.length]!;
        const n = params.length;
        rows.push(`($${n + 1}, $${n + 2}, $${n + 3}, 'tune_up', 'tune_up', 'scheduled', $${n + 4}, $${n + 5}, $${n + 4}, $${n + 6}, $${n + 7})`);
        params.push(home.customer_id, home.id, tech, start.toJSDate(), start.plus({ hours: 2 }).toJSDate(), start.plus({ minutes: 90 }).toJSDate(), rows.length % 4 === 0);
      }
    }
  }
  if (rows.length < shape.visits) throw new Error(`only ${rows.length} slots in ${shape.days} days; widen the grid`);
  for (let i = 0; i < rows.length; i += 500) {
    const chunk = rows.slice(i, i + 500);
    const first = i * 7;
    const p = params.slice(first, first + chunk.length * 7);
    const renumbered = chunk.map((r) => r.replace(/\$(\d+)/g, (_m, k: string) => `$${Number(k) - first}`));
    await pool.query(
      `insert into visits (customer_id, property_id, technician_id, kind, reason, status, window_start, window_end, starts_at, ends_at, priority) values ${renumbered.join(',')}`,
      p,
    );
  }
  await pool.query('vacuum analyze visits');
  return { technicianIds: techs, visits: rows.length };
}

/** Equipment and agreements for every household without them, agreement ends spread over a year around `today`. */
export async function furnishHouseholds(pool: pg.Pool, today: string): Promise<void> {
  await pool.query(
    `insert into equipment (property_id, kind, make, model, installed_on)
     select p.id, k.kind, 'Bench', k.model, ($1::date - ((abs(hashtext(p.id::text)) % 5000) || ' days')::interval)::date
     from properties p cross join (values ('condensing_unit', 'AC36'), ('gas_furnace', 'GF80'), ('thermostat', 'T-7')) as k(kind, model)
     where not exists (select 1 from equipment e where e.property_id = p.id)`,
    [today],
  );
  await pool.query(
    `with v as (select id, yearly_price_cents, row_number() over (order by id) as n from plan_versions),
          p as (select p.id, p.customer_id, abs(hashtext(p.id::text)) as h from properties p
                where not exists (select 1 from agreements a where a.property_id = p.id))
     insert into agreements (customer_id, property_id, plan_version_id, status, starts_on, ends_on, price_cents, auto_renew)
     select p.customer_id, p.id, v.id,
            case when p.h % 380 - 20 < 0 then 'past_due' when p.h % 380 - 20 <= 60 then 'renewal_due' else 'active' end,
            $1::date + (p.h % 380 - 20) - 365, $1::date + (p.h % 380 - 20), v.yearly_price_cents, p.h % 5 < 2
     from p join v on v.n = 1 + p.h % (select count(*) from v)
     where p.h % 10 < 6`,
    [today],
  );
  await pool.query(`analyze equipment`);
  await pool.query(`analyze agreements`);
}

/**
 * A year of reminder history on top of furnishHouseholds: a done tune-up per agreement some 30 to
 * 330 days ago, a service call at two homes in five (some advising a coil cleaning), and earlier
 * campaigns' sent rows (filters to half the base, heating tune-ups to a fifth), so the audience
 * statement's visit lookups and its resend guard read tables of a real size.
 */
export async function reminderHistory(pool: pg.Pool, today: string): Promise<{ visits: number; sends: number }> {
  const visits = await pool.query(
    `with h as (select a.customer_id, a.property_id, abs(hashtext(a.id::text)) as h, false as call from agreements a
                union all
                select p.customer_id, p.id, abs(hashtext(p.id::text || 'call')), true from properties p where abs(hashtext(p.id::text)) % 5 < 2),
          t as (select *, ($1::date - (30 + h % 300) * interval '1 day' + interval '14 hours') at time zone 'America/Chicago' as at from h)
     insert into visits (customer_id, property_id, kind, reason, status, window_start, window_end, starts_at, ends_at, completed_at, findings, recommendations)
     select customer_id, property_id, case when call then 'service_call' else 'tune_up' end, case when call then 'noise' else 'tune_up' end, 'done',
            at, at + interval '2 hours', at, at + interval '90 minutes', at + interval '90 minutes', 'Bench visit.',
            case when call and h % 4 = 0 then 'Coil cleaning recommended.' else '' end
     from t`,
    [today],
  );
  const office = (await pool.query(`select id from users where role = 'office' limit 1`)).rows[0].id as string;
  let sends = 0;
  for (const [kind, share] of [
    ['filter', 2],
    ['heating_tune_up', 5],
  ] as const) {
    const camp = (
      await pool.query(
        `insert into reminder_campaigns (kind, created_by_id, audience_count, status, started_at, finished_at) values ($1, $2, 0, 'done', now(), now()) returning id`,
        [kind, office],
      )
    ).rows[0].id as string;
    const r = await pool.query(
      `insert into reminder_sends (campaign_id, customer_id, kind, email, reason, status, attempts, sent_at)
       select $1, c.id, $2, c.email, 'due', 'sent', 1, $3::date - (abs(hashtext(c.id::text)) % 60) * interval '1 day'
       from customers c where c.email is not null and abs(hashtext(c.id::text || $2)) % $4 = 0`,
      [camp, kind, today, share],
    );
    sends += r.rowCount ?? 0;
  }
  await pool.query('vacuum analyze visits');
  await pool.query('vacuum analyze reminder_sends');
  return { visits: visits.rowCount ?? 0, sends };
}
