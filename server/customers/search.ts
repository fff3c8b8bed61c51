import { and, asc, desc, isNotNull, isNull, sql, type SQL } from 'drizzle-orm';
import type { CustomerListQuery, CustomerPage } from '../../shared/schemas/customers';
import { customers } from '../db/schema';
import type { AppDeps } from '../deps';

// ---- Search and list ----

const escapeLike = (s: string) => s.replace(/[\\%_]/g, (c) => `\\${c}`);

/**
 * Search terms against the one indexed search column. A phone number typed with dashes or
 * brackets matches by its digits; several words must all match (name plus street, say).
 */
export function searchTerms(q: string): string[] {
  const trimmed = q.trim().toLowerCase();
  if (/^[\d\s().+-]+$/.test(trimmed) && trimmed.replace(/\D/g, '').length >= 3) return [trimmed.replace(/\D/g, '')];
  return trimmed.split(/\s+/).filter(Boolean).slice(0, 6);
}

export function searchWhere(q: string | undefined): SQL | undefined {
  if (!q) return undefined;
  const terms = searchTerms(q);
  if (!terms.length) return undefined;
  return and(...terms.map((t) => sql`${customers.searchText} ilike ${`%${escapeLike(t)}%`}`));
}

// Written out in full: drizzle renders ${'$'}{customers.id} unqualified in a select list, where "id" would mean p.id.
const firstProperty = (col: 'street' | 'city') =>
  sql<string | null>`(select p.${sql.raw(col)} from properties p where p.customer_id = "customers"."id" and p.archived_at is null order by p.created_at, p.id limit 1)`;

export async function listCustomers(deps: Pick<AppDeps, 'database'>, q: CustomerListQuery): Promise<CustomerPage> {
  const { db } = deps.database;
  const where = and(q.status === 'active' ? isNull(customers.archivedAt) : q.status === 'archived' ? isNotNull(customers.archivedAt) : undefined, searchWhere(q.q));
  const street = firstProperty('street');
  const city = firstProperty('city');
  const sortCol = { name: sql`lower(${customers.name})`, email: sql`lower(${customers.email})`, createdAt: sql`${customers.createdAt}`, city }[q.sort];
  const dir = q.dir === 'desc' ? desc : asc;
  // The page and the total in one statement: the window count is taken before the limit.
  const rows = await db
    .select({
      id: customers.id,
      name: customers.name,
      email: customers.email,
      phone: customers.phone,
      street,
      city,
      propertyCount: sql<number>`(select count(*)::int from properties p where p.customer_id = "customers"."id" and p.archived_at is null)`,
      archivedAt: customers.archivedAt,
      createdAt: customers.createdAt,
      total: sql<number>`count(*) over ()`.mapWith(Number),
    })
    .from(customers)
    .where(where)
    .orderBy(q.dir === 'desc' ? sql`${sortCol} desc nulls last` : sql`${sortCol} asc nulls last`, dir(customers.id))
    .limit(q.pageSize)
    .offset(q.page * q.pageSize);
  // A page past the end has no row to carry the total: count on its own then.
  const total =
    rows[0]?.total ??
    (q.page > 0
      ? ((
          await db
            .select({ n: sql<number>`count(*)::int` })
            .from(customers)
            .where(where)
        )[0]?.n ?? 0)
      : 0);
  return {
    items: rows.map(({ archivedAt, createdAt, total: _total, ...r }) => ({ ...r, archived: archivedAt !== null, createdAt: createdAt.toISOString() })),
    total,
    page: q.page,
    pageSize: q.pageSize,
  };
}
