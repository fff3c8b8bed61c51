// The reports over three years of history for 10,000 households: each report route's median and
// p95 beside the bare SQL of the same statement run straight on the pool, as a ratio. Requests
// run one at a time (a report is an owner's weekly read, not a crowd's). Run through
// `npm run bench reports`; BENCH_RUNS sets the requests per route (default 15).
import { DateTime } from 'luxon';
import { performance } from 'node:perf_hooks';
import { pino } from 'pino';
import supertest from 'supertest';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import { createDatabase } from '../../server/db/client';
import { seedDemo } from '../../server/db/seed/seed';
import { DEMO_STAFF_PASSWORD, STAFF } from '../../server/db/seed/scenario';
import type { AppDeps } from '../../server/deps';
import { registerJobs } from '../../server/jobs/register';
import { REPORT_SQL } from '../../server/reports/report-sql';
import { REPORTS } from '../../shared/schemas/reports';
import { localFakes } from '../../test/support/fakes';
import { furnishHouseholds, generateHouseholds } from './lib/data';
import { generateHistory } from './lib/history';

const URL_ = process.env.BENCH_DATABASE_URL;
if (!URL_) throw new Error('BENCH_DATABASE_URL is not set; run this through npm run bench');
const RUNS = Number(process.env.BENCH_RUNS ?? 15);
const HOUSEHOLDS = Number(process.env.BENCH_HOUSEHOLDS ?? 10_000);
const YEARS = 3;
const TZ = 'America/Chicago';
const NOW = DateTime.fromISO('2031-06-02T07:00', { zone: TZ });

function stats(ms: number[]): { median: number; p95: number } {
  const s = [...ms].sort((a, b) => a - b);
  const at = (q: number) => s[Math.min(s.length - 1, Math.ceil(q * s.length) - 1)]!;
  return { median: at(0.5), p95: at(0.95) };
}

async function timed(run: () => Promise<unknown>): Promise<number[]> {
  await run(); // warm
  const out: number[] = [];
  for (let i = 0; i < RUNS; i++) {
    const t = performance.now();
    await run();
    out.push(performance.now() - t);
  }
  return out;
}

const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: URL_, LOG_LEVEL: 'silent' });
const database = createDatabase(URL_, 5);
try {
  const { pool } = database;
  await seedDemo(database.db, NOW.minus({ days: 60 }));
  const demo = Number((await pool.query(`select count(*) from customers`)).rows[0].count);
  await generateHouseholds(pool, Math.max(0, HOUSEHOLDS - demo));
  await furnishHouseholds(pool, NOW.toISODate()!);
  const h = await generateHistory(pool, NOW.toISODate()!, YEARS);
  console.log(`data: ${HOUSEHOLDS} households, ${YEARS} years: ${h.terms} agreement terms, ${h.invoices} invoices, ${h.visits} visits`);

  const deps: AppDeps = { config, database, clock: () => NOW.toJSDate(), logger: pino({ level: 'silent' }), ...localFakes() };
  registerJobs(deps);
  const agent = supertest.agent(createApp(deps));
  const first = await agent.get('/api/session');
  const csrf = decodeURIComponent(/XSRF-TOKEN=([^;]+)/.exec(String(first.headers['set-cookie'] ?? ''))?.[1] ?? '');
  const office = STAFF.find((s) => s.role === 'office')!;
  await agent.post('/api/auth/staff/sign-in').set('X-XSRF-TOKEN', csrf).send({ email: office.email, password: DEMO_STAFF_PASSWORD }).expect(200);

  const q = { from: NOW.minus({ years: YEARS }).plus({ days: 1 }).toISODate()!, to: NOW.toISODate()! };
  console.log(`\n${RUNS} requests a route, one at a time, ${q.from} to ${q.to}\n`);
  const header = `${'report'.padEnd(13)} ${'route p50'.padStart(9)} ${'route p95'.padStart(9)} ${'SQL p50'.padStart(8)} ${'SQL p95'.padStart(8)} ${'ratio p50'.padStart(9)} ${'rows'.padStart(5)}`;
  console.log(header);
  console.log('-'.repeat(header.length));
  for (const name of REPORTS) {
    let rows = 0;
    const route = stats(
      await timed(async () => {
        const res = await agent.get(`/api/reports/${name}`).query(q);
        if (res.status !== 200) throw new Error(`${name}: ${res.status} ${res.text}`);
        rows = (res.body as { rows: unknown[] }).rows.length;
      }),
    );
    const bare = stats(await timed(() => database.db.execute(REPORT_SQL[name](q, NOW.toJSDate()))));
    const f = (x: number) => x.toFixed(1).padStart(8);
    console.log(
      `${name.padEnd(13)} ${f(route.median)} ${' ' + f(route.p95)} ${f(bare.median)} ${f(bare.p95)} ${(route.median / bare.median).toFixed(2).padStart(9)} ${String(rows).padStart(5)}`,
    );
  }
} finally {
  await database.close();
}
