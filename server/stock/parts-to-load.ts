import { sql } from 'drizzle-orm';
import type { PartsToLoad, PartToLoad } from '../../shared/schemas/quotes';
import type { SessionUser } from '../../shared/schemas/session';
import type { AppDeps } from '../deps';

// "Parts to load" on the technician's home page: the parts that the approved quotes of today's
// booked visits (the visit quoted, or the follow-up visit booked to fit an ordered part) still
// need, that this technician's truck does not hold enough of, and where the rest is. One
// statement: the company's day, the technician, the quotes, the truck and the other locations.

/** Visits still to be worked today. */
const BOOKED = sql.raw(`('scheduled', 'on_the_way', 'on_site')`);

/** Refrigerant and shop supplies are carried in bulk, not counted per job (as at approval). */
const BULK = sql.raw(`('refrigerant', 'consumable')`);

type Row = Omit<PartToLoad, 'short'>;

export async function partsToLoad(deps: Pick<AppDeps, 'database' | 'clock'>, user: SessionUser): Promise<PartsToLoad> {
  const { db } = deps.database;
  const now = deps.clock();
  const { rows } = await db.execute<Row & Record<string, unknown>>(sql`
    with day as (
      select (${now.toISOString()}::timestamptz at time zone c.time_zone)::date as d, c.time_zone as tz from company c limit 1
    ),
    tech as (
      select t.id from technicians t where t.user_id = ${user.id}
    ),
    truck as (
      select l.id from stock_locations l where l.technician_id = (select id from tech)
    ),
    today as (
      select v.id, cu.name as customer_name, v.starts_at
      from visits v join customers cu on cu.id = v.customer_id, day
      where v.technician_id = (select id from tech) and v.status in ${BOOKED} and (v.starts_at at time zone day.tz)::date = day.d
    ),
    needs as (
      select l.item_id, q.id as quote_id, t.id as visit_id, sum(l.quantity) as qty
      from today t
      join quotes q on (q.visit_id = t.id or q.follow_up_visit_id = t.id) and q.status = 'approved'
      join quote_approvals a on a.quote_id = q.id and a.revision = q.revision and a.outcome = 'approved'
      join quote_lines l on l.option_id = a.option_id and l.kind = 'part' and l.item_id is not null and l.category not in ${BULK}
      group by l.item_id, q.id, t.id
    ),
    -- Parts already taken off this truck for the quote at approval are on board for it.
    taken as (
      select m.quote_id, m.item_id, -sum(m.quantity) as qty
      from stock_movements m
      where m.kind = 'use' and m.location_id in (select id from truck) and m.quote_id in (select quote_id from needs)
      group by m.quote_id, m.item_id
    ),
    per_item as (
      select n.item_id, ceil(sum(greatest(n.qty - coalesce(tk.qty, 0), 0)))::int as needed, array_agg(distinct n.visit_id) as visit_ids
      from needs n left join taken tk on tk.quote_id = n.quote_id and tk.item_id = n.item_id
      group by n.item_id
    )
    select
      p.item_id as "itemId", i.sku, i.name, p.needed, coalesce(s.quantity, 0)::int as "onTruck",
      (select coalesce(json_agg(json_build_object('visitId', t.id, 'customerName', t.customer_name) order by t.starts_at), '[]'::json)
         from today t where t.id = any(p.visit_ids)) as visits,
      (select coalesce(json_agg(json_build_object('locationId', o.id, 'name', o.name, 'kind', o.kind, 'quantity', x.quantity) order by o.kind desc, o.name), '[]'::json)
         from stock_levels x join stock_locations o on o.id = x.location_id
         where x.item_id = p.item_id and x.quantity > 0 and o.id not in (select id from truck)) as elsewhere
    from per_item p
    join price_book_items i on i.id = p.item_id
    left join stock_levels s on s.item_id = p.item_id and s.location_id = (select id from truck)
    where p.needed > coalesce(s.quantity, 0)
    order by i.sku
  `);
  return { parts: rows.map((r) => ({ ...r, short: r.needed - r.onTruck })) };
}
