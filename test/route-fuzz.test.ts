/**
 * Every routed "METHOD /path" gets invalid inputs made from its schemas in server/route-inputs.ts,
 * sent as a role that may call it. Each answer must be a 4xx in the one error shape (never a
 * 500), and no table's row count may change. The test fails for a route missing from the registry.
 *
 * Runs on a database of its own (other test files write to the shared one meanwhile).
 * FUZZ_RUNS sets the cases per route (default 20); FUZZ_SEED replays a run.
 */
import fc from 'fast-check';
import { eq, sql } from 'drizzle-orm';
import type { Router } from 'express';
import { Client } from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { inject } from 'vitest';
import type { z } from 'zod';
import { createDatabase, type Database } from '../server/db/client';
import { runMigrations } from '../server/db/migrate';
import { seedDemo } from '../server/db/seed/seed';
import { users } from '../server/db/schema';
import { ROUTE_INPUTS, type RouteInputs } from '../server/route-inputs';
import { apiRouters } from '../server/routes';
import { testApp, type TestContext } from './support/app';
import { anonymous, signInHomeowner, signInStaff, type Signed } from './support/auth';
import { badSegment, fieldsOf, invalidObject, OTHER_HOUSEHOLD } from './support/fuzz-inputs';

const RUNS = Number(process.env.FUZZ_RUNS ?? 20);
const SEED = process.env.FUZZ_SEED ? Number(process.env.FUZZ_SEED) : undefined;
const NO_SUCH_ID = '00000000-0000-4000-8000-000000000000';
// Counting attempts is the limiter's job, bad ones included; sessions are sign-in state, not records.
const NOT_RECORDS = new Set(['rate_limit_hits', 'sessions']);
// Pages for people (a mail program's opt-out link) answer HTML, not JSON.
const HTML_ROUTES = new Set(['GET /api/unsubscribe', 'POST /api/unsubscribe']);

let url = '';
let ctx: TestContext;
let database: Database;
const as = {} as Record<RouteInputs['as'], Signed>;

interface Layer {
  route?: { path: string; methods: Record<string, boolean> };
  handle: { stack?: Layer[] };
  rawPath?: string | string[];
}

/** Every METHOD + full path the built app's routers declare. */
function routedPaths(): string[] {
  const out = new Set<string>();
  const join = (a: string, b: string) => `${a}/${b}`.replace(/\/+/g, '/').replace(/(.)\/$/, '$1');
  const walk = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route) {
        for (const [m, on] of Object.entries(layer.route.methods)) if (on && m !== '_all') out.add(`${m.toUpperCase()} ${join(prefix, layer.route.path)}`);
      } else if (layer.handle?.stack) {
        const raw = Array.isArray(layer.rawPath) ? layer.rawPath[0] : layer.rawPath;
        walk(layer.handle.stack, join(prefix, typeof raw === 'string' ? raw : '/'));
      }
    }
  };
  for (const r of apiRouters) walk((r.build(ctx.deps) as unknown as Router & { stack: Layer[] }).stack, r.path);
  return [...out].sort();
}

/** Row count of every table in the public schema, in one statement. */
async function rowCounts(): Promise<Record<string, number>> {
  const db = database.db;
  const tables = await db.execute<{ t: string }>(sql`select table_name as t from information_schema.tables where table_schema = 'public' and table_type = 'BASE TABLE' order by 1`);
  const parts = tables.rows.filter((r) => !NOT_RECORDS.has(r.t)).map((r) => sql`select ${r.t}::text as t, count(*)::int as n from ${sql.identifier(r.t)}`);
  const rows = await db.execute<{ t: string; n: number }>(sql.join(parts, sql` union all `));
  return Object.fromEntries(rows.rows.map((r) => [r.t, r.n]));
}

interface Case {
  params: Record<string, string>;
  query?: Record<string, unknown>;
  body?: unknown;
  /** A request the edge refuses before any handler runs. */
  raw?: { contentType: string; payload: string };
}

const validParam = (name: string, schema?: z.ZodType) => (name === 'file' ? `${'a'.repeat(32)}.ics` : schema && fieldsOf(schema)[name]?.format !== 'uuid' ? 'x' : NO_SUCH_ID);

/** Requests no route may act on: refused at the edge (bad text, bad JSON, wrong type, too deep). */
const edgeCase = fc.constantFrom<{ contentType: string; payload: string; query?: Record<string, string> }>(
  { contentType: 'application/json', payload: '{"a":' },
  { contentType: 'application/json', payload: '{"note":"\\ud800"}' },
  { contentType: 'application/json', payload: '{"note":"a\\u0000b"}' },
  { contentType: 'application/json', payload: `${'['.repeat(40)}${']'.repeat(40)}` },
  { contentType: 'text/plain', payload: 'role=owner' },
  { contentType: 'application/x-www-form-urlencoded', payload: 'role=owner&customerId=1' },
  { contentType: 'application/json', payload: '{}', query: { q: 'a\u0000b' } },
);

function cases(key: string, inputs: RouteInputs): fc.Arbitrary<Case> {
  const names = [...key.matchAll(/:(\w+)/g)].map((m) => m[1]!);
  const validParams = Object.fromEntries(names.map((n) => [n, validParam(n, inputs.params)]));
  const parts: fc.Arbitrary<Case>[] = [];
  if (names.length) parts.push(fc.record(Object.fromEntries(names.map((n) => [n, badSegment]))).map((params) => ({ params, body: {} })));
  if (inputs.query) parts.push(invalidObject(inputs.query, true).map((query) => ({ params: validParams, query })));
  if (inputs.body) parts.push(invalidObject(inputs.body, false).map((body) => ({ params: validParams, body })));
  parts.push(edgeCase.map(({ query, ...raw }) => ({ params: validParams, query, raw })));
  return fc.oneof(...parts);
}

/** Does the case break a schema for sure? Ones that happen to be valid are not sent. */
function isInvalid(inputs: RouteInputs, c: Case): boolean {
  if (c.raw) return true;
  if (Object.values(c.params).some((v) => v !== NO_SUCH_ID && !v.endsWith('.ics') && v !== 'x')) return true;
  if (c.query && inputs.query && !inputs.query.safeParse(c.query).success) return true;
  if (c.body !== undefined && inputs.body && !inputs.body.safeParse(c.body).success) return true;
  return false;
}

let ip = 0;
async function send(key: string, who: Signed, c: Case) {
  const [method, path] = key.split(' ');
  const url = path.replace(/:(\w+)/g, (_m, n: string) => c.params[n]!);
  const m = method.toLowerCase() as 'get' | 'post' | 'put' | 'patch' | 'delete';
  const req = who.agent[m](url)
    .set('X-XSRF-TOKEN', who.csrf)
    .set('X-Forwarded-For', `198.51.100.${(ip++ % 200) + 20}`);
  if (c.query) req.query(c.query as Record<string, string>);
  if (c.raw) return req.set('Content-Type', c.raw.contentType).send(c.raw.payload);
  return c.body === undefined ? req : req.send(c.body as object);
}

beforeAll(async () => {
  const shared = inject('databaseUrl');
  const name = `sw_fuzz_${process.pid}_${Date.now().toString(36)}`;
  const admin = new Client({ connectionString: shared });
  await admin.connect();
  await admin.query(`create database "${name}"`);
  await admin.end();
  url = shared.replace(/\/[^/]+$/, `/${name}`);
  await runMigrations(url);
  database = createDatabase(url, 5);
  await seedDemo(database.db);
  ctx = testApp({ database, env: { DATABASE_URL: url } });
  const [b] = await database.db.select({ customerId: users.customerId }).from(users).where(eq(users.email, 'sam.oduya@example.test'));
  OTHER_HOUSEHOLD.id = b!.customerId!;
  as.anonymous = await anonymous(ctx);
  as.homeowner = await signInHomeowner(ctx, 'dana.whitfield@example.test');
  as.technician = await signInStaff(ctx, 'marcus.bellweather@bluestem-comfort.test');
  as.office = await signInStaff(ctx, 'teo.marchetti@bluestem-comfort.test');
  as.owner = await signInStaff(ctx, 'rosalind.okafor@bluestem-comfort.test');
}, 180_000);

afterAll(async () => {
  await database?.close();
  const admin = new Client({ connectionString: inject('databaseUrl') });
  await admin.connect();
  await admin.query(`drop database if exists "${url.split('/').pop()}" with (force)`);
  await admin.end();
});

describe('route fuzz', () => {
  it('has inputs registered for every routed path, and none for a path that is gone', () => {
    const routed = routedPaths();
    expect(
      routed.filter((k) => !(k in ROUTE_INPUTS)),
      'add each to ROUTE_INPUTS in server/route-inputs.ts',
    ).toEqual([]);
    expect(
      Object.keys(ROUTE_INPUTS).filter((k) => !routed.includes(k)),
      'these are registered but not routed',
    ).toEqual([]);
  });

  it.each(Object.entries(ROUTE_INPUTS))(
    '%s answers invalid input with a 4xx and writes nothing',
    async (key, inputs) => {
      const before = await rowCounts();
      let sent = 0;
      await fc.assert(
        fc.asyncProperty(cases(key, inputs), async (c) => {
          fc.pre(isInvalid(inputs, c));
          sent++;
          const res = await send(key, as[inputs.as], c);
          const label = `${key} answered ${res.status} ${res.text.slice(0, 300)}`;
          expect(res.status, label).toBeGreaterThanOrEqual(400);
          expect(res.status, label).toBeLessThan(500);
          if (HTML_ROUTES.has(key) && res.type === 'text/html') return;
          expect(res.body, label).toEqual({ error: expect.objectContaining({ code: expect.any(String), message: expect.any(String) }) });
          expect(
            Object.keys(res.body.error).every((k) => ['code', 'message', 'fields'].includes(k)),
            label,
          ).toBe(true);
        }),
        { numRuns: RUNS, seed: SEED, endOnFailure: true },
      );
      expect(sent, 'cases sent').toBeGreaterThan(0);
      expect(await rowCounts(), 'no table changed').toEqual(before);
    },
    60_000 + RUNS * 3_000,
  );
});
