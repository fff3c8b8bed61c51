import { sql, type Placeholder, type SQL } from 'drizzle-orm';
import { PgDialect } from 'drizzle-orm/pg-core';
import type { Db } from './client';

// The same casing as the client (client.ts), so columns named in templates render alike.
const dialect = new PgDialect({ casing: 'snake_case' });

type Placeholders<K extends string> = { [P in K]: Placeholder<P> };
type Prepared = { execute(values: Record<string, unknown>): Promise<unknown> };

/** `make(db)` once per database (a prepared query, say), kept for as long as the database object lives. */
export function oncePerDatabase<T>(make: (db: Db) => T): (db: Db) => T {
  const kept = new WeakMap<Db, T>();
  return (db) => {
    let value = kept.get(db);
    if (value === undefined) kept.set(db, (value = make(db)));
    return value;
  };
}

/**
 * A raw statement for a hot route, built once per database with named placeholders and then only
 * run with values. Building a large `sql` template walks every column and subquery it names, and
 * for the statements a route runs on every request that cost more than PostgreSQL's own work. The
 * result is what `db.execute` answers (the driver's result, rows with the same type parsing).
 */
export function preparedSql<Row extends Record<string, unknown>, K extends string>(
  name: string,
  keys: readonly K[],
  build: (p: Placeholders<K>) => SQL,
): (db: Db, values: Record<K, unknown>) => Promise<{ rows: Row[] }> {
  const prepared = oncePerDatabase((db): Prepared => {
    const p = Object.fromEntries(keys.map((k) => [k, sql.placeholder(k)])) as Placeholders<K>;
    return db._.session.prepareQuery(dialect.sqlToQuery(build(p)), undefined, name, false) as Prepared;
  });
  return async (db, values) => (await prepared(db).execute(values)) as { rows: Row[] };
}
