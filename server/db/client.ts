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

// Statements with parameters go as named (prepared) statements: each connection parses and plans
// a statement's text once and then only binds and runs it. The app sends a fixed set of texts, so
// names are handed out per text up to a bound; texts past it (an unusual IN list, say) go unnamed,
// which keeps what each connection holds in the server bounded however long it lives.
const MAX_NAMED = 1_000;
const statementNames = new Map<string, string>();

export function statementName(text: string): string | undefined {
  let name = statementNames.get(text);
  if (!name && statementNames.size < MAX_NAMED) {
    name = `sw_${statementNames.size + 1}`;
    statementNames.set(text, name);
  }
  return name;
}

type QueryArgs = [config: unknown, values?: unknown, callback?: unknown];

/** Names a parameterised statement sent as `{ text }` or as text with values; anything else goes as it came. */
export function namedStatement(args: QueryArgs): QueryArgs {
  const [config, values, callback] = args;
  if (typeof config === 'string') {
    if (!Array.isArray(values) || !values.length) return args;
    const name = statementName(config);
    return name ? [{ name, text: config, values }, undefined, callback] : args;
  }
  if (!config || typeof config !== 'object') return args;
  const c = config as { name?: string; text?: unknown; values?: unknown[] };
  const params = Array.isArray(values) ? values : c.values;
  if (c.name || typeof c.text !== 'string' || !params?.length) return args;
  const name = statementName(c.text);
  return name ? [{ ...c, name }, values, callback] : args;
}

export function createDatabase(url: string, max = 10, log?: Pick<Logger, 'error'>): Database {
  const pool = new pg.Pool({ connectionString: url, max, idleTimeoutMillis: 30_000 });
  pool.on('connect', (client) => {
    const query = client.query.bind(client) as (...args: QueryArgs) => unknown;
    (client as unknown as { query: (...args: QueryArgs) => unknown }).query = (...args: QueryArgs) => query(...namedStatement(args));
  });
  // An idle client that loses its connection (a restarted server, a dropped network) must not crash
  // the process: queries on it fail and are answered; the pool itself is reported here.
  pool.on('error', (err) => log?.error({ err }, 'database pool error'));
  const db = drizzle(pool, { schema, casing: 'snake_case' });
  return { db, pool, close: () => pool.end() };
}
