// Customer search over 100,000 generated households: median and p95 of GET /api/customers?q=…
// with the trigram index, then the same requests with the index dropped, and the ratio.
// Run through `npm run bench` (scripts/bench.mjs gives a fresh migrated database).
import { hash } from '@node-rs/argon2';
import { performance } from 'node:perf_hooks';
import { pino } from 'pino';
import { createApp } from '../../server/app';
import { localFakes } from '../../test/support/fakes';
import { loadConfig } from '../../server/config';
import { createDatabase } from '../../server/db/client';
import { listCustomers } from '../../server/customers/search';
import { customerListQuerySchema } from '../../shared/schemas/customers';
import { signInStaff } from '../../test/support/auth';
import { generateHouseholds } from './lib/data';

const URL_ = process.env.BENCH_DATABASE_URL;
if (!URL_) throw new Error('BENCH_DATABASE_URL is not set; run this through npm run bench');
const N = Number(process.env.BENCH_CUSTOMERS ?? 100_000);
const REQUESTS = Number(process.env.BENCH_REQUESTS ?? 300);
const PASSWORD = 'bench-office-password-2026';

const database = createDatabase(URL_, 4);
const { pool } = database;
const q = (text: string) => pool.query(text);

async function generate() {
  await q(`insert into company (name, phone, email, street, city, state, zip, business_hours)
           values ('Bench Heating', '+18165550100', 'bench@example.test', '1 Main St', 'Larkspur Bend', 'MO', '64790', '{}'::jsonb)
           on conflict do nothing`);
  await q(`insert into users (email, name, role, password_hash) values ('bench.office@example.test', 'Bench Office', 'office', '${await hash(PASSWORD)}')`);
  const t = await generateHouseholds(pool, N);
  console.log(`generated ${N} households with a property each in ${t.loadSeconds.toFixed(1)} s; trigram index built in ${t.indexSeconds.toFixed(1)} s`);
}

/** What people type: part of a surname, an e-mail, a phone number with punctuation, a street. */
async function searchTerms(): Promise<string[]> {
  const res = await pool.query<{ name: string; email: string; phone: string; street: string }>(
    `select c.name, c.email, c.phone, p.street from customers c join properties p on p.customer_id = c.id order by c.id limit 25 offset 1000`,
  );
  const terms: string[] = [];
  for (const r of res.rows) {
    const last = r.name.split(' ')[1]!;
    terms.push(last.slice(0, 6).toLowerCase());
    terms.push(r.email.split('@')[0]!);
    terms.push(`(${r.phone.slice(2, 5)}) ${r.phone.slice(5, 8)}-${r.phone.slice(8)}`);
    terms.push(r.street.split(' ').slice(0, 2).join(' '));
  }
  return terms;
}

function stats(ms: number[]) {
  const s = [...ms].sort((a, b) => a - b);
  const at = (p: number) => s[Math.min(s.length - 1, Math.ceil(p * s.length) - 1)]!;
  return { median: at(0.5), p95: at(0.95) };
}

async function measure(label: string, agent: Awaited<ReturnType<typeof signInStaff>>['agent'], terms: string[]) {
  for (const t of terms.slice(0, 10)) await agent.get('/api/customers').query({ q: t }).expect(200);
  const times: number[] = [];
  let hits = 0;
  for (let i = 0; i < REQUESTS; i++) {
    const t = terms[i % terms.length]!;
    const start = performance.now();
    const res = await agent.get('/api/customers').query({ q: t, pageSize: 25 });
    times.push(performance.now() - start);
    if (res.status !== 200) throw new Error(`search for ${t} answered ${res.status}`);
    if (res.body.total > 0) hits++;
  }
  const s = stats(times);
  console.log(`${label.padEnd(24)} median ${s.median.toFixed(1).padStart(7)} ms   p95 ${s.p95.toFixed(1).padStart(7)} ms   (${REQUESTS} requests, ${hits} with matches)`);
  return s;
}

try {
  await generate();
  const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: URL_, LOG_LEVEL: 'silent' });
  const app = createApp({ config, database, clock: () => new Date(), logger: pino({ level: 'silent' }), ...localFakes() });
  const { agent } = await signInStaff(app, 'bench.office@example.test', PASSWORD);
  const terms = await searchTerms();
  const withIndex = await measure('with trigram index', agent, terms);
  // The same searches without HTTP, session and JSON: how much of the route time is the database.
  const sqlTimes: number[] = [];
  for (let i = 0; i < REQUESTS; i++) {
    const start = performance.now();
    await listCustomers({ database }, customerListQuerySchema.parse({ q: terms[i % terms.length], pageSize: 25 }));
    sqlTimes.push(performance.now() - start);
  }
  const sqlOnly = stats(sqlTimes);
  console.log(`${'  of which the queries'.padEnd(24)} median ${sqlOnly.median.toFixed(1).padStart(7)} ms   p95 ${sqlOnly.p95.toFixed(1).padStart(7)} ms`);
  if (process.env.BENCH_EXPLAIN) {
    // Plans of the route's own statements, through auto_explain on a one-connection pool.
    const one = createDatabase(URL_, 1);
    const client = await one.pool.connect();
    client.on('notice', (n) => console.log(String(n.message).split('\n').slice(0, 40).join('\n')));
    await client.query(`load 'auto_explain'; set auto_explain.log_min_duration = 0; set auto_explain.log_analyze = on; set client_min_messages = log`);
    client.release();
    for (const t of [terms[0]!, terms[2]!, terms[3]!]) {
      console.log(`--- ${t}`);
      await listCustomers({ database: one }, customerListQuerySchema.parse({ q: t, pageSize: 25 }));
    }
    await one.close();
  }
  await q(`drop index customers_search_trgm_idx`);
  await q(`analyze customers`);
  const without = await measure('without the index', agent, terms);
  await q(`create index customers_search_trgm_idx on customers using gin (search_text gin_trgm_ops)`);
  console.log(`without / with: median ${(without.median / withIndex.median).toFixed(1)}x, p95 ${(without.p95 / withIndex.p95).toFixed(1)}x`);
} finally {
  await database.close();
}
