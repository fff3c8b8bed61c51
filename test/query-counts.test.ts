import { DateTime } from 'luxon';
import type pg from 'pg';
import { pino } from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../server/app';
import { loadConfig } from '../server/config';
import { createDatabase, type Database } from '../server/db/client';
import { seedDemo } from '../server/db/seed/seed';
import { DEMO_HOMEOWNERS, STAFF } from '../server/db/seed/scenario';
import { REPORTS } from '../shared/schemas/reports';
import type { AppDeps } from '../server/deps';
import { registerJobs } from '../server/jobs/register';
import { furnishHouseholds, generateCalendar, generateHouseholds } from '../scripts/bench/lib/data';
import { CSRF_HEADER_NAME, signInHomeowner, signInStaff, type Signed } from './support/auth';
import { localFakes } from './support/fakes';
import { scratchDatabase, type ScratchDatabase } from './support/scratch-db';

// Each key route issues a fixed number of SQL statements, whatever the data size: measured at the
// demo's households, then again after growing the same database to 10,000 households with a
// calendar of visits, agreements and equipment. The database is this file's own.
const TZ = 'America/Chicago';
const NOW = DateTime.fromISO('2031-06-02T07:00', { zone: TZ });
const LARGE = 10_000;

// Statements per request (BEGIN, COMMIT and locks count: each is a round trip).
const EXPECTED: Record<string, number> = {
  session: 1,
  'homeowner-home': 8,
  // The session, then the property with its plan, its equipment and the schedule's version (the
  // company's settings and the schedule come from the snapshot while that version holds).
  'booking-windows': 2,
  'booking-visit': 16,
  // The session, then the page with its total in one statement.
  'customer-search': 2,
  // The session, then the household with everything it holds and the company's zone in one statement.
  'customer-page': 2,
  // The session and the board's version, while the board this process keeps is current.
  'dispatch-day': 2,
  'dispatch-week': 2,
  // After a write the board shows: the session, the board's version, the company with its booking
  // settings, the technicians with time off beside the areas and the queue's size, then the visits
  // on screen with the soonest of the queue.
  'dispatch-day-changed': 5,
  renewals: 4,
  // The homeowner's first screen beside "My home": the session, then the company, agreements with
  // their terms, visits, what is owed and the quotes waiting in one statement.
  'home-summary': 2,
  // The session, then one statement each.
  'office-home': 2,
  'report-agreements': 2,
  'report-revenue': 2,
  'report-visits': 2,
  'report-utilisation': 2,
  // The technician's "parts to load": the session, then one statement.
  'parts-to-load': 2,
};

let scratch: ScratchDatabase | undefined;
let database: Database;
let deps: AppDeps;
let ctx: { app: ReturnType<typeof createApp>; deps: AppDeps };
let count = 0;
let home: Signed;
let office: Signed;
let tech: Signed;
let propertyId: string;
let customerId: string;
const bookFrom = [NOW.plus({ days: 45 }), NOW.plus({ days: 80 })];

async function drain(): Promise<void> {
  for (let quiet = 0, t = 0; quiet < 3 && t < 200; t++) {
    await new Promise((r) => setTimeout(r, 20));
    quiet = database.pool.waitingCount === 0 && database.pool.idleCount === database.pool.totalCount ? quiet + 1 : 0;
  }
}

async function counted(name: string, run: () => Promise<{ status: number }>): Promise<number> {
  await drain();
  count = 0;
  const res = await run();
  expect(res.status, `${name}: ${JSON.stringify((res as { body?: unknown }).body)}`).toBeLessThan(300);
  await drain();
  return count;
}

async function measure(phase: number): Promise<Record<string, number>> {
  const get = (s: Signed, path: string) => () => s.agent.get(path);
  const routes: [string, () => Promise<{ status: number }>][] = [
    ['session', get(home, '/api/session')],
    ['homeowner-home', get(home, '/api/my-home')],
    ['booking-windows', get(home, `/api/booking/windows?propertyId=${propertyId}&reason=no_cooling&days=14`)],
    [
      'booking-visit',
      async () => {
        const from = bookFrom[phase]!.toISODate();
        const offer = await home.agent.get(`/api/booking/windows?propertyId=${propertyId}&reason=no_cooling&from=${from}&days=14`).expect(200);
        const windowStart = (offer.body as { windows: { start: string }[] }).windows[0]!.start;
        count = 0;
        return home.agent.post('/api/booking/visits').set(CSRF_HEADER_NAME, home.csrf).send({ propertyId, reason: 'no_cooling', windowStart, noEmergency: true });
      },
    ],
    ['customer-search', get(office, '/api/customers?q=wood&pageSize=25')],
    ['customer-page', get(office, `/api/customers/${customerId}`)],
    ['dispatch-day', get(office, `/api/dispatch/board?from=${NOW.toISODate()}&days=1`)],
    ['dispatch-week', get(office, `/api/dispatch/board?from=${NOW.startOf('week').toISODate()}&days=7`)],
    [
      'dispatch-day-changed',
      async () => {
        await database.pool.query(`update visits set notes = 'Counted again' where id = (select id from visits order by id limit 1)`);
        count = 0;
        return office.agent.get(`/api/dispatch/board?from=${NOW.toISODate()}&days=1`);
      },
    ],
    ['renewals', get(office, '/api/renewals?view=due30')],
    ['home-summary', get(home, '/api/my-home/summary')],
    ['office-home', get(office, '/api/office-home')],
    ['parts-to-load', get(tech, '/api/stock/parts-to-load')],
    ...REPORTS.map((r): [string, () => Promise<{ status: number }>] => [
      `report-${r}`,
      get(office, `/api/reports/${r}?from=${NOW.minus({ years: 3 }).toISODate()}&to=${NOW.toISODate()}`),
    ]),
  ];
  const out: Record<string, number> = {};
  for (const [name, run] of routes) {
    if (name !== 'booking-visit') await run(); // warm: the first request may fill a cache
    if (process.env.SHOW_QUERIES) console.log(`== ${name}`);
    out[name] = await counted(name, run);
  }
  return out;
}

async function furnish(pool: pg.Pool): Promise<void> {
  await furnishHouseholds(pool, NOW.toISODate()!);
  await pool.query('analyze');
}

beforeAll(async () => {
  scratch = await scratchDatabase('counts');
  const url = new URL(scratch.url);
  database = createDatabase(url.toString(), 5);
  database.pool.on('connect', (client) => {
    const query = client.query.bind(client) as (...args: unknown[]) => unknown;
    (client as unknown as { query: (...args: unknown[]) => unknown }).query = (...args: unknown[]) => {
      count++;
      if (process.env.SHOW_QUERIES) console.log(typeof args[0] === 'string' ? args[0] : (args[0] as { text?: string }).text);
      return query(...args);
    };
  });
  await seedDemo(database.db, NOW.minus({ days: 60 }));
  await furnish(database.pool);
  await generateCalendar(database.pool, { technicians: 20, visits: 100, days: 14, from: NOW, slots: ['08:00'] });
  const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: url.toString(), LOG_LEVEL: 'silent' });
  deps = { config, database, clock: () => NOW.toJSDate(), logger: pino({ level: 'silent' }), ...localFakes() };
  registerJobs(deps);
  ctx = { app: createApp(deps), deps };
  home = await signInHomeowner(ctx, DEMO_HOMEOWNERS[0].email);
  office = await signInStaff(ctx, STAFF.find((s) => s.role === 'office')!.email);
  tech = await signInStaff(ctx, STAFF.find((s) => s.role === 'technician')!.email);
  const { rows } = await database.pool.query<{ id: string; customer_id: string }>(
    `select p.id, p.customer_id from properties p join users u on u.customer_id = p.customer_id where u.email = $1 order by p.id limit 1`,
    [DEMO_HOMEOWNERS[0].email],
  );
  propertyId = rows[0]!.id;
  customerId = rows[0]!.customer_id;
}, 300_000);

afterAll(async () => {
  await database?.close();
  await scratch?.drop();
});

describe('statements per request', () => {
  it('are fixed for every key route, at the demo size and at 10,000 households', async () => {
    const small = await measure(0);
    const households = Number((await database.pool.query('select count(*) from customers')).rows[0].count);
    await generateHouseholds(database.pool, LARGE - households);
    await furnish(database.pool);
    await generateCalendar(database.pool, { technicians: 20, visits: 1600, days: 30, from: NOW, slots: ['09:45', '11:30', '13:15', '15:00'] });
    const large = await measure(1);
    console.log(JSON.stringify({ small, large }));
    expect(large).toEqual(small);
    expect(small).toEqual(EXPECTED);
  }, 600_000);
});
