// The key API routes at 50 concurrent clients, beside a bare Express route that runs `SELECT 1` on a
// pool of the same size, all in one run: requests a second, p50 and p99, the ratio to the bare
// route, and the SQL statements one request issues on its own. Writes bench/results/latest.json.
// Run through `npm run bench routes` (a fresh migrated database). Ratios are what we track;
// absolute figures on a shared machine are noise.
//
// Only createApp, the job registry, the config loader, the database factory, the demo seed and HTTP paths are used,
// so the bench keeps working while the server's insides move; the engine ratio (lib/engine.ts) is
// the one exception. Data beyond the demo is plain SQL.
import autocannon from 'autocannon';
import express from 'express';
import { DateTime } from 'luxon';
import { mkdirSync, rmSync, writeFileSync } from 'node:fs';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type pg from 'pg';
import { pino } from 'pino';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import { createDatabase, type Database } from '../../server/db/client';
import { seedDemo } from '../../server/db/seed/seed';
import type { AppDeps } from '../../server/deps';
import type { Mailer } from '../../server/integrations/mail';
import { registerJobs } from '../../server/jobs/register';
import { localFakes } from '../../test/support/fakes';
import { DEMO_HOMEOWNERS, DEMO_STAFF_PASSWORD, STAFF } from '../../server/db/seed/scenario';
import { furnishHouseholds, generateCalendar, generateHouseholds } from './lib/data';
import { engineVersusSql } from './lib/engine';

const URL_ = process.env.BENCH_DATABASE_URL;
if (!URL_) throw new Error('BENCH_DATABASE_URL is not set; run this through npm run bench');
const SECONDS = Number(process.env.BENCH_SECONDS ?? 5);
const WARMUP_SECONDS = Number(process.env.BENCH_WARMUP_SECONDS ?? 1);
const CONNECTIONS = 50;
const HOUSEHOLDS = Number(process.env.BENCH_HOUSEHOLDS ?? 2000);
const TECHS = 20;
const VISITS = 2000;
const DAYS = 30;
const ENGINE_RUNS = Number(process.env.BENCH_RUNS ?? 31);
// A comma-separated list of route names to run alone (while working on one); all by default.
const ONLY = process.env.BENCH_ROUTES?.split(',')
  .map((s) => s.trim())
  .filter(Boolean);
// The load generator runs in a worker thread so it does not share the server's event loop.
const IN_PROCESS = process.env.BENCH_IN_PROCESS === '1';
// Households that book in the booking run, each signed in through its own e-mailed link (the
// link route allows 30 requests an address per 15 minutes, so stay well below).
const BOOKERS = 20;
const TZ = 'America/Chicago';
// A fixed Monday: the generated calendar starts here, the demo's own visits two months before.
const NOW = DateTime.fromISO('2031-06-02T07:00', { zone: TZ });
const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const RESULTS = join(ROOT, 'bench', 'results', 'latest.json');
const NEXT_BOOKING = join(dirname(fileURLToPath(import.meta.url)), 'lib', 'next-booking.cjs');

interface Figures {
  rps: number;
  p50: number;
  p99: number;
}
interface RouteResult extends Figures {
  name: string;
  ratio: number;
  queries: number;
}

// ---- Counting statements ----

/** Counts every statement sent on the pool's connections (drizzle, the session store, transactions). */
function countQueries(pool: pg.Pool): { readonly count: number; reset(): void } {
  let count = 0;
  pool.on('connect', (client) => {
    const query = client.query.bind(client) as (...args: unknown[]) => unknown;
    (client as unknown as { query: (...args: unknown[]) => unknown }).query = (...args: unknown[]) => {
      count++;
      return query(...args);
    };
  });
  return {
    get count() {
      return count;
    },
    reset() {
      count = 0;
    },
  };
}

// ---- Data ----

async function generate(database: Database): Promise<void> {
  const { pool } = database;
  await seedDemo(database.db, NOW.minus({ days: 60 }));
  const demo = Number((await pool.query(`select count(*) from customers`)).rows[0].count);
  const t = await generateHouseholds(pool, Math.max(0, HOUSEHOLDS - demo));
  // Equipment and agreements for the generated households: the customer page and the renewal
  // board then have rows to show, spread over a year of end dates.
  await furnishHouseholds(pool, NOW.toISODate()!);
  const cal = await generateCalendar(pool, { technicians: TECHS, visits: VISITS, days: DAYS, from: NOW });
  const households = Number((await pool.query(`select count(*) from customers`)).rows[0].count);
  console.log(
    `data: ${households} households (${t.loadSeconds.toFixed(1)} s), ${cal.technicianIds.length} technicians, ${cal.visits} visits over ${DAYS} days from ${NOW.toISODate()}`,
  );
}

// ---- HTTP with a cookie jar ----

class Browser {
  private readonly jar = new Map<string, string>();
  constructor(private readonly base: string) {}

  get cookie(): string {
    return [...this.jar].map(([k, v]) => `${k}=${v}`).join('; ');
  }
  get csrf(): string {
    return decodeURIComponent(this.jar.get('XSRF-TOKEN') ?? '');
  }

  async request(method: string, path: string, body?: unknown): Promise<Response> {
    const headers: Record<string, string> = { cookie: this.cookie };
    if (method !== 'GET') headers['x-xsrf-token'] = this.csrf;
    if (body !== undefined) headers['content-type'] = 'application/json';
    const res = await fetch(`${this.base}${path}`, { method, headers, body: body === undefined ? undefined : JSON.stringify(body) });
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(';');
      const eq = pair!.indexOf('=');
      this.jar.set(pair!.slice(0, eq), pair!.slice(eq + 1));
    }
    return res;
  }

  async json<T>(method: string, path: string, body?: unknown): Promise<T> {
    const res = await this.request(method, path, body);
    if (!res.ok) throw new Error(`${method} ${path} answered ${res.status}: ${await res.text()}`);
    return (await res.json()) as T;
  }
}

/** A mailer that keeps the last sign-in token sent to each address and sends nothing. */
function inboxMailer(): { mailer: Mailer; tokenFor(email: string): Promise<string> } {
  const tokens = new Map<string, string>();
  let n = 0;
  const mailer: Mailer = {
    async send(message) {
      const to = Array.isArray(message.to) ? message.to[0]! : message.to;
      const token = /[?&]token=([^\s&]+)/.exec(message.text)?.[1];
      if (token) tokens.set(to.toLowerCase(), decodeURIComponent(token));
      return { messageId: `<bench-${++n}@seasonwell.test>` };
    },
    async verify() {},
    close() {},
  };
  return {
    mailer,
    async tokenFor(email) {
      for (let i = 0; i < 100; i++) {
        const t = tokens.get(email);
        if (t) return t;
        await new Promise((r) => setTimeout(r, 20));
      }
      throw new Error(`no sign-in link was mailed to ${email}`);
    },
  };
}

/** The homeowner's way in: ask for a link, open it. */
async function signInHomeowner(base: string, email: string, inbox: ReturnType<typeof inboxMailer>): Promise<Browser> {
  const b = new Browser(base);
  await b.json('GET', '/api/session');
  const asked = await b.request('POST', '/api/auth/link', { email });
  if (asked.status !== 202) throw new Error(`link request for ${email} answered ${asked.status}: ${await asked.text()}`);
  await b.json('POST', '/api/auth/link/confirm', { token: await inbox.tokenFor(email) });
  return b;
}

async function signInStaff(base: string, email: string, password: string): Promise<Browser> {
  const b = new Browser(base);
  await b.json('GET', '/api/session');
  await b.json('POST', '/api/auth/staff/sign-in', { email, password });
  return b;
}

// ---- Load ----

interface Load {
  path?: string;
  /** Paths taken in turn by each connection (read-only routes with varying parameters). */
  paths?: string[];
  method?: 'GET' | 'POST';
  headers?: Record<string, string>;
  /** A CommonJS setupRequest module, for runs where every request must differ. */
  setupRequest?: string;
  /** Its inputs (BENCH_BOOKING_TARGETS): for the timed run, and fresh ones for a fixed-count rerun. */
  targets?: { run: string; spare: string };
}

async function load(base: string, l: Load, seconds: number, warmUp = false): Promise<Figures & { codes: string[]; errors: number; total: number }> {
  // In a worker autocannon require()s the file; in process it wants the function itself.
  const setupRequest = l.setupRequest && (IN_PROCESS ? ((await import(l.setupRequest)) as { default: never }).default : l.setupRequest);
  const run = (limit: { duration: number } | { amount: number }) =>
    autocannon({
      url: `${base}${l.path ?? l.paths?.[0] ?? '/'}`,
      method: l.method ?? 'GET',
      connections: CONNECTIONS,
      ...limit,
      // A slow route under 50 clients answers late, but it answers: count it, do not time it out.
      timeout: 120,
      headers: l.headers,
      ...(IN_PROCESS ? {} : { workers: 1 }),
      ...(l.paths ? { requests: l.paths.map((path) => ({ path, method: l.method ?? 'GET' })) } : {}),
      ...(setupRequest ? { requests: [{ method: l.method ?? 'GET', setupRequest: setupRequest as never }] } : {}),
    });
  if (l.targets) process.env.BENCH_BOOKING_TARGETS = l.targets.run;
  let r = await run({ duration: seconds });
  // Slower than the run is long, few requests finish in time: send a fixed number instead and
  // wait for all of them, so the figures still rest on two rounds of every connection.
  if (!warmUp && r.requests.total < 2 * CONNECTIONS) {
    if (l.targets) process.env.BENCH_BOOKING_TARGETS = l.targets.spare;
    r = await run({ amount: 2 * CONNECTIONS });
  }
  const codes = Object.entries((r.statusCodeStats ?? {}) as Record<string, { count: number }>)
    .filter(([code]) => Number(code) >= 300)
    .map(([code, { count }]) => `${count} × ${code}`);
  return { rps: r.requests.total / r.duration, p50: r.latency.p50, p99: r.latency.p99, codes, errors: r.errors + r.timeouts, total: r.requests.total };
}

function listen(app: express.Express): Promise<{ server: Server; base: string }> {
  return new Promise((resolve) => {
    const server = app.listen(0, '127.0.0.1', () => resolve({ server, base: `http://127.0.0.1:${(server.address() as AddressInfo).port}` }));
  });
}

async function closeServer(server: Server): Promise<void> {
  server.closeAllConnections();
  await new Promise((r) => server.close(r));
}

/** Requests cut off at the end of a run still finish on the server; let them drain. */
async function drain(pool: pg.Pool): Promise<void> {
  for (let quiet = 0, t = 0; quiet < 5 && t < 300; t++) {
    await new Promise((r) => setTimeout(r, 100));
    quiet = pool.waitingCount === 0 && pool.idleCount === pool.totalCount ? quiet + 1 : 0;
  }
}

// ---- The run ----

interface RouteSpec {
  name: string;
  /** Tried in order; the first that answers other than 404 is the route. None: not built yet. */
  candidates?: string[];
  load?: Load;
  /** The request counted on its own (defaults to the load's first path with its headers). */
  once?: () => Promise<Response>;
}

async function main(): Promise<void> {
  const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: URL_!, LOG_LEVEL: 'silent' });
  const database = createDatabase(URL_!, config.DATABASE_POOL_MAX);
  const bareDatabase = createDatabase(URL_!, config.DATABASE_POOL_MAX);
  const counter = countQueries(database.pool);
  const servers: Server[] = [];
  const targetFiles: string[] = [];
  try {
    await generate(database);

    const engine = await engineVersusSql(database, NOW, DAYS, ENGINE_RUNS);
    console.log(
      `engine: ${engine.technicians} technicians, ${engine.booked} booked visits, ${DAYS} days: ${engine.engineMs.toFixed(1)} ms beside ${engine.sqlMs.toFixed(2)} ms of SQL (${engine.ratio.toFixed(1)}x)`,
    );

    const bare = express();
    bare.get('/bare', async (_req, res) => {
      await bareDatabase.pool.query('select 1');
      res.json({ ok: true });
    });
    const bareServer = await listen(bare);
    servers.push(bareServer.server);

    const inbox = inboxMailer();
    // Jobs run at once in the request (as in the API tests), so the sign-in link reaches the inbox mailer through the mail queue.
    const deps: AppDeps = { config, database, clock: () => NOW.toJSDate(), logger: pino({ level: 'silent' }), ...localFakes(), mailer: inbox.mailer };
    registerJobs(deps);
    const app = createApp(deps);
    const { server, base } = await listen(app);
    servers.push(server);

    // Who signs in: the demo homeowner, the demo office clerk, and households that book.
    const office = STAFF.find((s) => s.role === 'office')!;
    const home = await signInHomeowner(base, DEMO_HOMEOWNERS[0].email, inbox);
    const clerk = await signInStaff(base, office.email, DEMO_STAFF_PASSWORD);
    const { rows: bookerRows } = await database.pool.query<{ email: string; property_id: string }>(
      `with c as (select c.id, c.email, c.name from customers c where c.email is not null
                    and not exists (select 1 from users u where u.customer_id = c.id) order by c.email limit $1),
            u as (insert into users (email, name, role, customer_id) select lower(email), name, 'homeowner', id from c returning email, customer_id)
       select u.email, (select p.id from properties p where p.customer_id = u.customer_id order by p.id limit 1) as property_id from u`,
      [BOOKERS],
    );
    const bookers = [];
    for (const r of bookerRows) bookers.push({ browser: await signInHomeowner(base, r.email, inbox), propertyId: r.property_id });

    const myHome = await home.json<{ properties?: { id: string }[] }>('GET', '/api/my-home');
    const homePropertyId =
      myHome.properties?.[0]?.id ??
      (
        await database.pool.query<{ id: string }>(`select p.id from properties p join users u on u.customer_id = p.customer_id where u.email = $1 limit 1`, [
          DEMO_HOMEOWNERS[0].email,
        ])
      ).rows[0]!.id;

    // Booking targets: windows on days past the generated calendar, so capacity is known to be
    // free. Each window is booked by several households (well under the technicians free in it),
    // in an order that moves from day to day: bookings on one day queue on that day's lock, and
    // the run measures the write path rather than one lock.
    const PER_WINDOW = 8;
    const windowsByDay = new Map<string, string[]>();
    for (let offset = DAYS + 14; offset < DAYS + 14 + 31 * 4; offset += 31) {
      const from = NOW.plus({ days: offset }).toISODate()!;
      const offer = await bookers[0]!.browser.json<{ windows: { start: string }[] }>(
        'GET',
        `/api/booking/windows?propertyId=${bookers[0]!.propertyId}&reason=no_cooling&from=${from}&days=31`,
      );
      for (const w of offer.windows) {
        const local = DateTime.fromISO(w.start, { zone: TZ });
        // Weekdays only: every technician works them; Saturday has one, too few for the copies.
        if (local.weekday > 5) continue;
        const day = local.toISODate()!;
        windowsByDay.set(day, [...(windowsByDay.get(day) ?? []), w.start]);
      }
    }
    const slots: string[] = [];
    const days = [...windowsByDay.values()];
    for (let round = 0; days.some((d) => d.length); round++) {
      for (const d of days) if (d.length) slots.push(d.shift()!);
    }
    const targets: { cookie: string; csrf: string; body: unknown }[] = [];
    for (let copy = 0; copy < PER_WINDOW; copy++) {
      for (const [i, start] of slots.entries()) {
        const who = bookers[(i + copy * 7) % bookers.length]!;
        targets.push({ cookie: who.browser.cookie, csrf: who.browser.csrf, body: { propertyId: who.propertyId, reason: 'no_cooling', windowStart: start, noEmergency: true } });
      }
    }
    // Separate lists for the counted request, the warm-up and the run, so none books twice.
    const bookingFile = (part: unknown[]) => {
      const f = join(tmpdir(), `seasonwell-bench-bookings-${process.pid}-${targetFiles.length}.json`);
      writeFileSync(f, JSON.stringify(part));
      targetFiles.push(f);
      return f;
    };
    const onceTarget = targets.shift()!;
    const spareFile = bookingFile(targets.splice(0, 2 * CONNECTIONS));
    const warmShare = Math.floor(targets.length * (WARMUP_SECONDS / (WARMUP_SECONDS + SECONDS)));
    const warmFile = bookingFile(targets.slice(0, warmShare));
    const runFile = bookingFile(targets.slice(warmShare));
    const runTargets = targets.length - warmShare;
    console.log(`booking: ${bookers.length} households signed in, ${targets.length} distinct bookings prepared over ${windowsByDay.size} days`);

    const customerIds = (await database.pool.query<{ id: string }>(`select id from customers order by md5(id::text) limit 50`)).rows.map((r) => r.id);
    const terms = (
      await database.pool.query<{ name: string; email: string; phone: string; street: string }>(
        `select c.name, c.email, c.phone, p.street from customers c join properties p on p.customer_id = c.id order by md5(c.id::text) limit 10`,
      )
    ).rows.flatMap((r) => [
      r.name.split(' ').at(-1)!.slice(0, 5).toLowerCase(),
      r.email.split('@')[0]!,
      `(${r.phone.slice(2, 5)}) ${r.phone.slice(5, 8)}-${r.phone.slice(8)}`,
      r.street.split(' ').slice(0, 2).join(' '),
    ]);
    const monday = NOW.startOf('week').toISODate()!;
    const homeHeaders = () => ({ cookie: home.cookie });
    const officeHeaders = () => ({ cookie: clerk.cookie });

    const routes: RouteSpec[] = [
      { name: 'session', load: { path: '/api/session', headers: homeHeaders() } },
      // The portal's first screen reads /api/my-home/summary (beside /api/my-home for the systems).
      { name: 'homeowner-home', candidates: ['/api/portal/home', '/api/my-home/summary', '/api/my-home'], load: { headers: homeHeaders() } },
      { name: 'booking-windows', load: { path: `/api/booking/windows?propertyId=${homePropertyId}&reason=no_cooling&days=14`, headers: homeHeaders() } },
      {
        name: 'booking-visit',
        load: { path: '/api/booking/visits', method: 'POST', setupRequest: NEXT_BOOKING, targets: { run: runFile, spare: spareFile } },
        once: () =>
          fetch(`${base}/api/booking/visits`, {
            method: 'POST',
            headers: { cookie: onceTarget.cookie, 'x-xsrf-token': onceTarget.csrf, 'content-type': 'application/json' },
            body: JSON.stringify(onceTarget.body),
          }),
      },
      { name: 'customer-search', load: { paths: terms.map((t) => `/api/customers?q=${encodeURIComponent(t)}&pageSize=25`), headers: officeHeaders() } },
      { name: 'customer-page', load: { paths: customerIds.map((id) => `/api/customers/${id}`), headers: officeHeaders() } },
      { name: 'dispatch-day', load: { path: `/api/dispatch/board?from=${NOW.toISODate()}&days=1`, headers: officeHeaders() } },
      { name: 'dispatch-week', load: { path: `/api/dispatch/board?from=${monday}&days=7`, headers: officeHeaders() } },
      { name: 'renewals', load: { path: '/api/renewals?view=due30', headers: officeHeaders() } },
      // The office's first screen: every count in one statement.
      { name: 'office-home', candidates: ['/api/office-home'], load: { headers: officeHeaders() } },
    ];

    console.log(`\n${CONNECTIONS} connections, ${SECONDS} s a route after ${WARMUP_SECONDS} s of warm-up${IN_PROCESS ? ', load generated in process' : ''}\n`);
    const header = `${'route'.padEnd(16)} ${'req/s'.padStart(8)} ${'p50 ms'.padStart(7)} ${'p99 ms'.padStart(7)} ${'ratio'.padStart(6)} ${'queries'.padStart(7)} ${'bare req/s'.padStart(10)}`;
    console.log(header);
    console.log('-'.repeat(header.length));
    const line = (name: string, f: Figures, ratio: string, queries: string, bareNow: string, note = '') =>
      console.log(
        `${name.padEnd(16)} ${f.rps.toFixed(0).padStart(8)} ${String(f.p50).padStart(7)} ${String(f.p99).padStart(7)} ${ratio.padStart(6)} ${queries.padStart(7)} ${bareNow.padStart(10)}${note}`,
      );

    const bareLoad = { path: '/bare' };
    await load(bareServer.base, bareLoad, WARMUP_SECONDS, true);
    const bareFigures = await load(bareServer.base, bareLoad, SECONDS);
    line('bare SELECT 1', bareFigures, '1.000', '1', '');
    // The machine is shared, and what else runs on it changes over the minutes of a run. So each
    // route's ratio is taken against the bare route measured just before and just after it (a
    // shorter run each time), not only against the figure at the start.
    const BARE_CHECK_SECONDS = Math.min(SECONDS, 2);
    let bareBefore = bareFigures.rps;

    const results: RouteResult[] = [];
    for (const spec of ONLY?.length ? routes.filter((r) => ONLY.includes(r.name)) : routes) {
      const l: Load = { ...spec.load };
      if (spec.candidates) {
        for (const path of spec.candidates) {
          const res = await fetch(`${base}${path}`, { headers: l.headers });
          await res.arrayBuffer();
          if (res.status !== 404) {
            l.path = path;
            break;
          }
        }
        if (!l.path) {
          console.log(`${spec.name.padEnd(16)} not built yet (no answer at ${spec.candidates.join(', ')})`);
          continue;
        }
      }
      // One request alone, after one to warm any cache, counted to the last statement it causes
      // (BEGIN, COMMIT and lock statements included: each is a round trip).
      const one = spec.once ?? (() => fetch(`${base}${l.path ?? l.paths![0]}`, { method: l.method ?? 'GET', headers: l.headers }));
      if (!spec.once) await (await one()).arrayBuffer();
      await drain(database.pool);
      counter.reset();
      const res = await one();
      await res.arrayBuffer();
      if (!res.ok) throw new Error(`${spec.name}: the counted request answered ${res.status}`);
      await drain(database.pool);
      const queries = counter.count;

      await load(base, { ...l, ...(l.targets ? { targets: { run: warmFile, spare: warmFile } } : {}) }, WARMUP_SECONDS, true);
      await drain(database.pool);
      const f = await load(base, l, SECONDS);
      await drain(database.pool);
      const bareAfter = (await load(bareServer.base, bareLoad, BARE_CHECK_SECONDS, true)).rps;
      const bareNow = (bareBefore + bareAfter) / 2;
      bareBefore = bareAfter;
      const ratio = f.rps / bareNow;
      const problems = [...f.codes, f.errors ? `${f.errors} errors` : ''].filter(Boolean).join(', ');
      line(spec.name, f, ratio.toFixed(3), String(queries), bareNow.toFixed(0), problems ? `   (${problems})` : '');
      if (l.setupRequest) {
        if (f.total > runTargets) console.log(`${''.padEnd(16)} more bookings than prepared targets (${runTargets}); some were repeats`);
        const { rows } = await database.pool.query<{ booked: number; twice: number }>(
          `select count(*)::int as booked, (count(*) - count(distinct (property_id, window_start)))::int as twice
           from visits where status = 'requested' and window_start >= $1`,
          [
            NOW.plus({ days: DAYS + 14 })
              .startOf('day')
              .toJSDate(),
          ],
        );
        console.log(`${''.padEnd(16)} ${rows[0]!.booked} visits booked in all, ${rows[0]!.twice} of them twice`);
      }
      results.push({ name: spec.name, rps: round(f.rps, 0), p50: f.p50, p99: f.p99, ratio: round(ratio, 3), queries });
    }

    mkdirSync(dirname(RESULTS), { recursive: true });
    const out = { bare: { rps: round(bareFigures.rps, 0), p50: bareFigures.p50, p99: bareFigures.p99 }, routes: results, engine: { ratio: round(engine.ratio, 2) } };
    writeFileSync(RESULTS, `${JSON.stringify(out, null, 2)}\n`);
    console.log(`\nengine ÷ SQL ${engine.ratio.toFixed(2)}x   written to ${RESULTS.slice(ROOT.length + 1)}`);
  } finally {
    for (const s of servers) await closeServer(s);
    await drain(database.pool);
    for (const f of targetFiles) rmSync(f, { force: true });
    await database.close();
    await bareDatabase.close();
  }
}

const round = (x: number, digits: number) => Math.round(x * 10 ** digits) / 10 ** digits;

await main();
