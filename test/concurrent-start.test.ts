/**
 * Two compiled API processes started at the same moment against a database that does not exist
 * yet: both create it, migrate it, install the job queue's schema and its queues, and serve. Without
 * a lock around the job queue's start, the two `create_queue` calls deadlock (SQLSTATE 40P01) and
 * one process exits. Also checks, on a real process, that a request Node's parser refuses is
 * answered in the one error shape.
 */
import type { ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { buildServer } from '../scripts/lib/proc.mjs';
import { startCompiledApi, type CompiledApi } from './support/compiled-api';
import { rawRequest } from './support/raw-http';

const ROUNDS = 3;
const storage = mkdtempSync(join(tmpdir(), 'sw-start-'));
const started: ChildProcess[] = [];
const databases: string[] = [];

function urlFor(name: string): string {
  const u = new URL(inject('databaseUrl'));
  u.pathname = `/${name}`;
  return u.toString();
}

async function admin(sql: string): Promise<void> {
  const c = new pg.Client({ connectionString: urlFor('postgres') });
  await c.connect();
  await c.query(sql).finally(() => c.end());
}

/** The compiled API with its workers, on a database of its own. */
async function startApi(databaseUrl: string): Promise<CompiledApi> {
  const api = await startCompiledApi({ DATABASE_URL: databaseUrl, STORAGE_DIR: storage });
  started.push(api.child);
  return api;
}

beforeAll(() => buildServer(), 240_000);
afterAll(async () => {
  await Promise.all(started.map((c) => new Promise((r) => (c.exitCode !== null || c.signalCode !== null ? r(null) : (c.once('exit', r), c.kill('SIGTERM'))))));
  for (const name of databases) await admin(`drop database if exists "${name}" with (force)`);
  rmSync(storage, { recursive: true, force: true });
});

describe('two processes starting at once on an empty database', () => {
  it(`both serve, ${ROUNDS} rounds, with one set of queues`, async () => {
    for (let round = 0; round < ROUNDS; round++) {
      const name = `${new URL(inject('databaseUrl')).pathname.slice(1)}_start${round}`;
      databases.push(name);
      const url = urlFor(name);
      const t0 = Date.now();
      const [a, b] = await Promise.all([startApi(url), startApi(url)]);
      console.log(`round ${round + 1}: both serving after ${Date.now() - t0} ms`);
      for (const api of [a, b]) expect(api.output(), 'no error logged').not.toMatch(/deadlock|"level":(50|60)/);
      const c = new pg.Client({ connectionString: url });
      await c.connect();
      const queues = await c.query<{ n: number; distinct: number }>('select count(*)::int as n, count(distinct name)::int as distinct from pgboss.queue').finally(() => c.end());
      expect(queues.rows[0]!.n).toBeGreaterThan(0);
      expect(queues.rows[0]!.n).toBe(queues.rows[0]!.distinct);
      // The compiled process answers a request its parser refuses in the one error shape.
      const big = await rawRequest(a.port, `GET /api/health HTTP/1.1\r\nHost: localhost\r\nCookie: a=${'x'.repeat(20_000)}\r\n\r\n`);
      expect(big.status).toBe(431);
      expect(big.body).toEqual({ error: { code: 'headers_too_large', message: expect.any(String) } });
    }
  }, 240_000);
});
