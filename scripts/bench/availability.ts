// Availability for 20 technicians over 30 days with 2,000 booked visits: time per engine call beside
// the one SQL query that loads the same visits, as a ratio; then booking-route throughput at 50
// concurrent clients (autocannon). Run through `npm run bench` (a fresh migrated database).
import autocannon from 'autocannon';
import { hash } from '@node-rs/argon2';
import type { AddressInfo } from 'node:net';
import { performance } from 'node:perf_hooks';
import { pino } from 'pino';
import { createApp } from '../../server/app';
import { localFakes } from '../../test/support/fakes';
import { loadCompanySettings, loadSchedulingData } from '../../server/booking/scheduling-input';
import { loadConfig } from '../../server/config';
import { createDatabase } from '../../server/db/client';
import { seedDemo } from '../../server/db/seed/seed';
import { availableWindows, type AvailabilityInput } from '../../shared/scheduling';
import { DateTime } from 'luxon';

const URL_ = process.env.BENCH_DATABASE_URL;
if (!URL_) throw new Error('BENCH_DATABASE_URL is not set; run this through npm run bench');
const TECHS = 20;
const VISITS = 2000;
const DAYS = 30;
const RUNS = Number(process.env.BENCH_RUNS ?? 15);
const PASSWORD = 'bench-office-password-2026';
const TZ = 'America/Chicago';
// A fixed Monday well after the demo's own visits, so only generated visits fall in the range.
const NOW = DateTime.fromISO('2031-06-02T07:00', { zone: TZ });

const database = createDatabase(URL_, 12);
const { pool } = database;

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)]!;
}

async function generate(): Promise<void> {
  // The demo's own upcoming visits land two months before the measured range.
  await seedDemo(database.db, NOW.minus({ days: 60 }));
  await pool.query(`insert into users (email, name, role, password_hash) values ('bench.office@example.test', 'Bench Office', 'office', $1)`, [await hash(PASSWORD)]);
  const have = Number((await pool.query(`select count(*) from technicians where active`)).rows[0].count);
  const hours = JSON.stringify({ '1': { start: '08:00', end: '17:00' }, '2': { start: '08:00', end: '17:00' }, '3': { start: '08:00', end: '17:00' }, '4': { start: '08:00', end: '17:00' }, '5': { start: '08:00', end: '17:00' } });
  await pool.query(
    `with u as (insert into users (email, name, role) select 'bench.tech' || i || '@example.test', 'Bench Technician ' || i, 'technician' from generate_series(1, $1) i returning id)
     insert into technicians (user_id, skills, weekly_hours) select id, '{refrigerant,gas_furnace}', $2::jsonb from u`,
    [TECHS - have, hours],
  );
  const techs = (await pool.query(`select id from technicians where active order by id`)).rows.map((r) => r.id as string);
  const homes = (await pool.query(`select customer_id, id from properties order by id`)).rows as { customer_id: string; id: string }[];
  // Five 90-minute visits a weekday per technician, slot by slot until 2,000 are placed: none overlap.
  const slots = ['08:00', '09:45', '11:30', '13:15', '15:00'];
  const rows: string[] = [];
  const params: unknown[] = [];
  outer: for (let d = 0; d < DAYS; d++) {
    const day = NOW.startOf('day').plus({ days: d });
    if (day.weekday > 5) continue;
    for (const slot of slots) {
      for (const tech of techs) {
        if (rows.length === VISITS) break outer;
        const [h, m] = slot.split(':').map(Number);
        const start = day.set({ hour: h, minute: m });
        const home = homes[rows.length % homes.length]!;
        const n = params.length;
        rows.push(`($${n + 1}, $${n + 2}, $${n + 3}, 'tune_up', 'tune_up', 'scheduled', $${n + 4}, $${n + 5}, $${n + 4}, $${n + 6}, $${n + 7})`);
        params.push(home.customer_id, home.id, tech, start.toJSDate(), start.plus({ hours: 2 }).toJSDate(), start.plus({ minutes: 90 }).toJSDate(), rows.length % 4 === 0);
      }
    }
  }
  if (rows.length < VISITS) throw new Error(`only ${rows.length} slots in ${DAYS} days; widen the grid`);
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
  console.log(`generated ${techs.length} technicians and ${rows.length} booked visits over ${DAYS} days`);
}

async function engineVersusSql(): Promise<void> {
  const from = NOW.toISODate()!;
  const to = NOW.plus({ days: DAYS - 1 }).toISODate()!;
  const range = { from: NOW.startOf('day').minus({ days: 1 }).toJSDate(), to: NOW.plus({ days: DAYS }).endOf('day').toJSDate() };
  const company = await loadCompanySettings(database.db);
  const data = await loadSchedulingData(database.db, range);
  const input: AvailabilityInput = {
    settings: company.settings,
    technicians: data.technicians,
    booked: data.booked,
    request: { visitKind: 'service_call', member: false, urgent: false, from, to, now: NOW.toUTC().toISO()! },
  };
  const sql = `select technician_id, starts_at, ends_at, priority from visits
               where technician_id is not null and status in ('requested','scheduled','on_the_way','on_site')
                 and starts_at < $2 and ends_at > $1`;
  const loaded = await pool.query(sql, [range.from, range.to]);
  for (let i = 0; i < 3; i++) {
    availableWindows(input);
    await pool.query(sql, [range.from, range.to]);
  }
  const engine: number[] = [];
  const query: number[] = [];
  let windows = 0;
  for (let i = 0; i < RUNS; i++) {
    let t = performance.now();
    windows = availableWindows(input).length;
    engine.push(performance.now() - t);
    t = performance.now();
    await pool.query(sql, [range.from, range.to]);
    query.push(performance.now() - t);
  }
  const e = median(engine);
  const q = median(query);
  console.log(`engine: ${data.technicians.length} technicians, ${data.booked.length} booked visits, ${DAYS} days -> ${windows} open windows`);
  console.log(`availability call  median ${e.toFixed(1)} ms (of ${RUNS})`);
  console.log(`SQL load (${loaded.rowCount} rows) median ${q.toFixed(2)} ms`);
  console.log(`ratio engine / SQL: ${(e / q).toFixed(1)}x`);
}

async function signIn(base: string): Promise<{ cookie: string; csrf: string }> {
  const jar = new Map<string, string>();
  const keep = (res: Response) => {
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(';');
      const eq = pair!.indexOf('=');
      jar.set(pair!.slice(0, eq), pair!.slice(eq + 1));
    }
  };
  const cookie = () => [...jar].map(([k, v]) => `${k}=${v}`).join('; ');
  keep(await fetch(`${base}/api/session`));
  const res = await fetch(`${base}/api/auth/staff/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', cookie: cookie(), 'x-xsrf-token': decodeURIComponent(jar.get('XSRF-TOKEN') ?? '') },
    body: JSON.stringify({ email: 'bench.office@example.test', password: PASSWORD }),
  });
  if (!res.ok) throw new Error(`bench sign-in answered ${res.status}`);
  keep(res);
  return { cookie: cookie(), csrf: decodeURIComponent(jar.get('XSRF-TOKEN') ?? '') };
}

async function throughput(): Promise<void> {
  const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: URL_!, LOG_LEVEL: 'silent' });
  const app = createApp({ config, database, clock: () => NOW.toJSDate(), logger: pino({ level: 'silent' }), ...localFakes() });
  const server = app.listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const { cookie, csrf } = await signIn(base);
  const property = (await pool.query(`select id from properties order by id limit 1`)).rows[0].id as string;
  // The generated calendar is nearly full; an urgent no-cooling call may use the held-back share.
  const offer = (await (await fetch(`${base}/api/booking/windows?propertyId=${property}&reason=no_cooling&days=31`, { headers: { cookie } })).json()) as { windows: { start: string }[] };
  if (!offer.windows.length) throw new Error('no free window left for the booking run');
  const windowStart = offer.windows[0]!.start;
  const headers = { cookie, 'x-xsrf-token': csrf, 'content-type': 'application/json' };

  const windows = await autocannon({ url: `${base}/api/booking/windows?propertyId=${property}&reason=no_cooling&days=7`, connections: 50, duration: 8, headers });
  console.log(`GET  /api/booking/windows  50 clients: ${windows.requests.average.toFixed(0)} req/s, p50 ${windows.latency.p50} ms, p99 ${windows.latency.p99} ms, non-2xx ${windows.non2xx}`);

  const codes = new Map<number, number>();
  const book = await autocannon({
    url: `${base}/api/booking/visits`,
    method: 'POST',
    connections: 50,
    duration: 8,
    headers,
    body: JSON.stringify({ propertyId: property, reason: 'no_cooling', windowStart, noEmergency: true }),
  });
  for (const [k, v] of Object.entries(book.statusCodeStats ?? {})) codes.set(Number(k), (v as { count: number }).count);
  console.log(
    `POST /api/booking/visits   50 clients, one window: ${book.requests.average.toFixed(0)} req/s, p50 ${book.latency.p50} ms, p99 ${book.latency.p99} ms; ` +
      `answers ${[...codes].map(([c, n]) => `${c}×${n}`).join(', ')} (201 booked, 409 "just filled")`,
  );
  const booked = Number((await pool.query(`select count(*) from visits where property_id = $1 and window_start = $2`, [property, new Date(windowStart)])).rows[0].count);
  console.log(`visits booked into that window: ${booked} (never more than its capacity)`);
  server.closeAllConnections();
  await new Promise((r) => server.close(r));
  // Requests cut off at the end of a run still finish on the server; let them drain before the pool closes.
  for (let quiet = 0, t = 0; quiet < 5 && t < 300; t++) {
    await new Promise((r) => setTimeout(r, 100));
    quiet = pool.waitingCount === 0 && pool.idleCount === pool.totalCount ? quiet + 1 : 0;
  }
}

try {
  await generate();
  await engineVersusSql();
  await throughput();
} finally {
  await database.close();
}
