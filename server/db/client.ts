import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import pg from 'pg';
import type { Logger } from 'pino';
import * as schema from './schema';

export type Schema = typeof schema;
export type Db = NodePgDatabase<Schema>;
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

export interface Database {
  db: Db;
  pool: pg.Pool;
  close(): Promise<void>;
}

// timestamptz and date come back as strings we parse ourselves where needed; bigint counts as numbers.
pg.types.setTypeParser(20, (v) => Number(v));

export function createDatabase(url: string, max = 10, log?: Pick<Logger, 'error'>): Database {
  const pool = new pg.Pool({ connectionString: url, max, idleTimeoutMillis: 30_000 });
  // An idle client that loses its connection (a restarted server, a dropped network) must not crash
  // the process: queries on it fail and are answered; the pool itself is reported here.
  pool.on('error', (err) => log?.error({ err }, 'database pool error'));
  const db = drizzle(pool, { schema, casing: 'snake_case' });
  return { db, pool, close: () => pool.end() };
}
