import { DateTime } from 'luxon';
import Papa from 'papaparse';
import { pino } from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../server/app';
import { hashPassword } from '../server/auth/passwords';
import { loadConfig } from '../server/config';
import { createDatabase, type Database } from '../server/db/client';
import { DEMO_STAFF_PASSWORD } from '../server/db/seed/scenario';
import type { AppDeps } from '../server/deps';
import { registerJobs } from '../server/jobs/register';
import { signInStaff, type Signed } from './support/auth';
import { localFakes } from './support/fakes';
import { scratchDatabase, type ScratchDatabase } from './support/scratch-db';

// Each report against numbers worked out by hand from a small data set written below, on this
// file's own database (reports read the whole company, so other tests' rows would leak in).
// Company time zone America/Chicago: in winter UTC−6 (CST), in June UTC−5 (CDT) (IANA tz database).
const TZ = 'America/Chicago';
const NOW = DateTime.fromISO('2031-06-10T12:00', { zone: TZ });
const at = (local: string) => DateTime.fromISO(local, { zone: TZ }).toUTC().toISO()!;

let scratch: ScratchDatabase | undefined;
let database: Database;
let office: Signed;
let ids: Record<string, string> = {};

async function q(text: string, values: unknown[] = []): Promise<string> {
  const { rows } = await database.pool.query(text, values);
  return (rows[0] as { id?: string } | undefined)?.id ?? '';
}

async function fixture(): Promise<void> {
  await q(
    `insert into company (id, name, phone, email, street, city, state, zip, time_zone, business_hours)
           values (1, 'Test Heating', '+15555550100', 'office@test.test', '1 Main St', 'Town', 'KS', '66000', $1, '{}')`,
    [TZ],
  );
  await q(`insert into users (email, name, role, password_hash) values ('office@reports.test', 'Office Person', 'office', $1)`, [await hashPassword(DEMO_STAFF_PASSWORD)]);
  const customer = await q(`insert into customers (name) values ('Fixture household') returning id`);
  const property = await q(`insert into properties (customer_id, street, city, state, zip) values ($1, '2 Elm St', 'Town', 'KS', '66000') returning id`, [customer]);
  const plan = await q(`insert into plans (code, name) values ('care', 'Care') returning id`);
  const version = await q(
    `insert into plan_versions (plan_id, version, yearly_price_cents, additional_system_cents, cooling_visits, heating_visits, repair_discount_bps, diagnostic_fee_waived, priority_window_hours)
                           values ($1, 1, 19900, 5000, 1, 1, 1000, true, 24) returning id`,
    [plan],
  );
  ids = { customer, property, version };

  // Agreements: [name, status, canceled at, terms (start, exclusive end)].
  const agreements: [string, string, string | null, [string, string][]][] = [
    [
      'A1',
      'active',
      null,
      [
        ['2030-01-10', '2031-01-10'],
        ['2031-01-10', '2032-01-10'],
      ],
    ],
    ['A2', 'lapsed', null, [['2030-01-20', '2031-01-20']]],
    [
      'A3',
      'active',
      null,
      [
        ['2030-02-05', '2031-02-05'],
        ['2031-02-05', '2032-02-05'],
      ],
    ],
    ['A4', 'past_due', null, [['2030-02-15', '2031-02-15']]],
    ['A5', 'active', null, [['2031-03-01', '2032-03-01']]],
    // Known only from the agreement row (no term rows): still a term, as termsOf reads it.
    ['A6', 'active', null, []],
    [
      'A7',
      'active',
      null,
      [
        ['2030-02-20', '2031-02-20'],
        ['2031-02-20', '2032-02-20'],
      ],
    ],
    ['A8', 'canceled', at('2031-03-15T10:00'), [['2031-01-01', '2032-01-01']]],
  ];
  for (const [name, status, canceledAt, terms] of agreements) {
    const [first, last] = terms.length
      ? [terms[0]!, terms[terms.length - 1]!]
      : [
          ['2030-06-01', '2031-06-01'],
          ['2030-06-01', '2031-06-01'],
        ];
    const id = await q(
      `insert into agreements (customer_id, property_id, plan_version_id, status, starts_on, ends_on, price_cents, canceled_at)
       values ($1, $2, $3, $4, $5, $6, 19900, $7) returning id`,
      [customer, property, version, status, last[0], last[1], canceledAt],
    );
    void first;
    ids[name] = id;
    for (const [s, e] of terms) {
      await q(`insert into agreement_terms (agreement_id, starts_on, ends_on, plan_version_id, price_cents, source) values ($1, $2, $3, $4, 19900, 'test')`, [id, s, e, version]);
    }
  }

  // Visits the service invoices were for, unassigned and done (so in no utilisation or queue count).
  const visit = async (kind: string, status: string, local: string, hours: number, technician: string | null = null) => {
    const s = DateTime.fromISO(local, { zone: TZ });
    return q(
      `insert into visits (customer_id, property_id, technician_id, kind, reason, status, window_start, window_end, starts_at, ends_at)
       values ($1, $2, $3, $4, $5, $6, $7, $8, $7, $9) returning id`,
      [
        customer,
        property,
        technician,
        kind,
        kind === 'tune_up' ? 'tune_up' : 'no_cooling',
        status,
        s.toUTC().toISO(),
        s.plus({ hours: 2 }).toUTC().toISO(),
        s.plus({ hours }).toUTC().toISO(),
      ],
    );
  };
  const tuneUpJan = await visit('tune_up', 'done', '2031-01-31T09:00', 2);
  const callFeb = await visit('service_call', 'done', '2031-02-11T08:00', 2);
  const tuneUpFeb = await visit('tune_up', 'done', '2031-02-27T08:00', 2);

  // Invoices: [name, purpose, status, subtotal, discount, total, paid, refunded, issued at (local), visit].
  const invoices: [string, string, string, number, number, number, number, number, string | null, string | null][] = [
    ['I1', 'renewal', 'paid', 19900, 0, 19900, 19900, 0, '2031-01-15T09:00', null],
    // A blower motor replaced at January's heating tune-up: tune-up money.
    ['I2', 'service', 'paid', 38917, 3892, 35025, 35025, 0, '2031-01-31T23:00', tuneUpJan],
    ['I3', 'enrollment', 'paid', 24900, 0, 24900, 24900, 0, '2031-02-10T10:00', null],
    ['I4', 'service', 'partially_refunded', 13334, 1334, 12000, 12000, 2000, '2031-02-11T10:00', callFeb],
    // Typed by the office with no visit: a repair.
    ['I5', 'service', 'open', 5000, 0, 5000, 0, 0, '2031-02-15T10:00', null],
    ['I6', 'service', 'void', 99999, 0, 99999, 0, 0, '2031-02-16T10:00', null],
    ['I7', 'service', 'draft', 7777, 0, 7777, 0, 0, null, null],
    ['I8', 'service', 'paid', 8900, 0, 8900, 8900, 0, '2031-02-27T10:00', tuneUpFeb],
  ];
  let number = 1000;
  for (const [name, purpose, status, sub, disc, total, paid, refunded, issued, visitId] of invoices) {
    ids[name] = await q(
      `insert into invoices (number, customer_id, purpose, status, subtotal_cents, discount_cents, tax_cents, total_cents, paid_cents, refunded_cents, issued_at, visit_id)
       values ($1, $2, $3, $4, $5, $6, 0, $7, $8, $9, $10, $11) returning id`,
      [status === 'draft' ? null : ++number, customer, purpose, status, sub, disc, total, paid, refunded, issued ? at(issued) : null, visitId],
    );
  }
  // Payments: [invoice, status, amount, refunded, succeeded at (local)].
  const payments: [string, string, number, number, string | null][] = [
    // 11:30 p.m. on 31 January in Larkspur Bend is already 1 February in UTC: it is January's money.
    ['I1', 'succeeded', 19900, 0, '2031-01-31T23:30'],
    ['I2', 'succeeded', 35025, 0, '2031-02-01T00:15'],
    ['I3', 'succeeded', 24900, 0, '2031-02-10T11:00'],
    ['I4', 'succeeded', 12000, 2000, '2031-02-12T11:00'],
    ['I5', 'failed', 5000, 0, null],
    // 11:30 p.m. on 28 February is 1 March in UTC: February's tune-up money.
    ['I8', 'succeeded', 8900, 0, '2031-02-28T23:30'],
  ];
  for (const [inv, status, amount, refunded, when] of payments) {
    const id = await q(`insert into payments (invoice_id, method, status, amount_cents, refunded_cents, succeeded_at) values ($1, 'card', $2, $3, $4, $5) returning id`, [
      ids[inv],
      status,
      amount,
      refunded,
      when ? at(when) : null,
    ]);
    if (refunded) await q(`insert into refunds (payment_id, amount_cents, created_at) values ($1, $2, $3)`, [id, refunded, at('2031-02-20T15:00')]);
  }

  // Technicians: Ada Mon–Fri 8:00–16:00 (8 h a day), Bo Mon–Thu 7:00–17:00 (10 h a day).
  const tech = async (name: string, hours: Record<string, { start: string; end: string }>) => {
    const user = await q(`insert into users (email, name, role) values ($1, $2, 'technician') returning id`, [`${name.toLowerCase()}@reports.test`, name]);
    return q(`insert into technicians (user_id, weekly_hours) values ($1, $2) returning id`, [user, JSON.stringify(hours)]);
  };
  const ada = await tech('Ada', Object.fromEntries(['1', '2', '3', '4', '5'].map((d) => [d, { start: '08:00', end: '16:00' }])));
  const bo = await tech('Bo', Object.fromEntries(['1', '2', '3', '4'].map((d) => [d, { start: '07:00', end: '17:00' }])));
  ids.ada = ada;
  ids.bo = bo;
  // Ada is off Wednesday from noon: 4 of her 8 hours that day.
  await q(`insert into technician_time_off (technician_id, starts_at, ends_at) values ($1, $2, $3)`, [ada, at('2031-06-04T12:00'), at('2031-06-04T18:00')]);

  // Visits in the week of Monday 2 June 2031: [name, technician, kind, status, start (local), hours].
  const visits: [string, string, string, string, string, number][] = [
    ['adaTuneUp', ada, 'tune_up', 'done', '2031-06-02T08:00', 2],
    ['adaTuneUp2', ada, 'tune_up', 'done', '2031-06-03T09:00', 1.5],
    ['adaNoShow', ada, 'service_call', 'no_show', '2031-06-05T10:00', 1],
    ['adaCanceled', ada, 'service_call', 'canceled', '2031-06-06T10:00', 2],
    ['boCall', bo, 'service_call', 'done', '2031-06-02T07:00', 3],
    // The follow-up that fitted the part ordered at Ada's Monday tune-up.
    ['boFollowUp', bo, 'service_call', 'done', '2031-06-04T08:00', 1],
    ['boTuneUp', bo, 'tune_up', 'scheduled', '2031-06-05T13:00', 3],
    // The Sunday before the week: in no bucket of the range.
    ['boSunday', bo, 'tune_up', 'done', '2031-06-01T10:00', 3],
  ];
  for (const [name, techId, kind, status, start, h] of visits) ids[name] = await visit(kind, status, start, h, techId);

  // Quotes on those visits: [visit, status, follow-up visit].
  const quotes: [string, string, string | null][] = [
    // Fixed on the first visit, with two approved quotes: one repair.
    ['boCall', 'approved', null],
    ['boCall', 'approved', null],
    // A part had to be ordered: a repair, not fixed on the first visit (its other quote does not change that).
    ['adaTuneUp', 'approved', 'boFollowUp'],
    ['adaTuneUp', 'approved', null],
    // The follow-up's own quote: counted with the first visit's repair, not again.
    ['boFollowUp', 'approved', null],
    // Declined, canceled visit, outside the range: no repair.
    ['adaTuneUp2', 'declined', null],
    ['adaCanceled', 'approved', null],
    ['boSunday', 'approved', null],
  ];
  for (const [v, status, followUp] of quotes) {
    await q(`insert into quotes (visit_id, customer_id, property_id, status, follow_up_visit_id) values ($1, $2, $3, $4, $5)`, [
      ids[v],
      customer,
      property,
      status,
      followUp ? ids[followUp] : null,
    ]);
  }
}

beforeAll(async () => {
  scratch = await scratchDatabase('reports');
  const url = new URL(scratch.url);
  database = createDatabase(url.toString(), 3);
  await fixture();
  const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: url.toString(), LOG_LEVEL: 'silent' });
  const deps: AppDeps = { config, database, clock: () => NOW.toJSDate(), logger: pino({ level: 'silent' }), ...localFakes() };
  registerJobs(deps);
  office = await signInStaff({ app: createApp(deps) }, 'office@reports.test');
}, 120_000);

afterAll(async () => {
  await database?.close();
  await scratch?.drop();
});

const get = (path: string) => office.agent.get(path);

describe('agreements report', () => {
  it('counts active, new, due, renewed and lapsed per month, and the renewal rate', async () => {
    const res = await get('/api/reports/agreements?from=2031-01-01&to=2031-03-31').expect(200);
    // Worked by hand from the terms above:
    // Jan: due A1 (renewed) and A2 (lapsed) → 1 ÷ 2; new A8; active on the 31st A1 A3 A4 A6 A7 A8.
    // Feb: due A3 and A7 (renewed) and A4 (past due, not yet lapsed) → 2 ÷ 3; active on the 28th A1 A3 A6 A7 A8.
    // Mar: nothing due; new A5; active on the 31st A1 A3 A5 A6 A7 (A8 canceled on the 15th).
    expect(res.body.rows).toEqual([
      { month: '2031-01-01', active: 6, new: 1, due: 2, renewed: 1, lapsed: 1, renewalRate: 0.5 },
      { month: '2031-02-01', active: 5, new: 0, due: 3, renewed: 2, lapsed: 0, renewalRate: 2 / 3 },
      { month: '2031-03-01', active: 5, new: 1, due: 0, renewed: 0, lapsed: 0, renewalRate: null },
    ]);
  });
});

describe('revenue report', () => {
  it('splits money received by month in the company time zone into plans, tune-ups and repairs', async () => {
    const res = await get('/api/reports/revenue?from=2031-01-01&to=2031-02-28').expect(200);
    // Jan: I1's 199.00 paid 11:30 p.m. on the 31st (1 Feb in UTC) is January's; I2 issued 11 p.m. on the 31st too.
    //   Average of I1 and I2: (19900 + 35025) ÷ 2 = 27462.5 → 27463 (half away from zero, PostgreSQL round).
    // Feb: plans I3 24900; tune-ups I2 35025 (paid 12:15 a.m. on the 1st) + I8 8900 (paid 11:30 p.m. on the 28th,
    //   1 March in UTC) = 43925; repairs I4 12000 − refund 2000 = 10000; the failed payment on I5 counts nothing.
    //   Total 24900 + 43925 + 10000 = 78825.
    //   Issued I3, I4, I5, I8 (void I6 and draft I7 left out): (24900 + 12000 + 5000 + 8900) ÷ 4 = 12700.
    expect(res.body.rows).toEqual([
      { month: '2031-01-01', plansCents: 19900, tuneUpsCents: 0, repairsCents: 0, totalCents: 19900, invoices: 2, averageInvoiceCents: 27463, savingsCents: 3892 },
      { month: '2031-02-01', plansCents: 24900, tuneUpsCents: 43925, repairsCents: 10000, totalCents: 78825, invoices: 4, averageInvoiceCents: 12700, savingsCents: 1334 },
    ]);
  });

  it('exports the same numbers as CSV, in dollars', async () => {
    const res = await get('/api/reports/revenue/export.csv?from=2031-01-01&to=2031-02-28').expect(200);
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    const parsed = Papa.parse<string[]>(res.text.trim());
    expect(parsed.data[0]).toEqual(['month', 'plans_usd', 'tune_ups_usd', 'repairs_usd', 'total_usd', 'invoices_issued', 'average_invoice_usd', 'coverage_savings_usd']);
    expect(parsed.data[2]).toEqual(['2031-02-01', '249.00', '439.25', '100.00', '788.25', '4', '127.00', '13.34']);
  });
});

describe('visits report', () => {
  it('counts visits per kind per week, the no-show rate and the share of repairs fixed on the first visit', async () => {
    const res = await get('/api/reports/visits?from=2031-06-02&to=2031-06-08').expect(200);
    // Canceled left out: tune-ups 2 done + 1 scheduled; service calls 1 no-show + 2 done. No-shows 1 ÷ (4 done + 1) = 0.2.
    // Repairs: Bo's call (two approved quotes, one repair, fixed) and Ada's Monday tune-up (a part ordered: not fixed
    // on the first visit); the follow-up, the declined quote, the canceled visit and the Sunday before are not counted.
    // First-visit fix 1 ÷ 2 = 0.5.
    expect(res.body.rows).toEqual([
      { week: '2031-06-02', tuneUps: 3, serviceCalls: 3, done: 4, noShows: 1, noShowRate: 0.2, repairs: 2, firstVisitFixes: 1, firstVisitFixRate: 0.5 },
    ]);
  });

  it('exports the first-visit fix columns as CSV', async () => {
    const res = await get('/api/reports/visits/export.csv?from=2031-06-02&to=2031-06-08').expect(200);
    const parsed = Papa.parse<string[]>(res.text.trim());
    expect(parsed.data[0]!.slice(-3)).toEqual(['repairs', 'first_visit_fixes', 'first_visit_fix_rate']);
    expect(parsed.data[1]!.slice(-3)).toEqual(['2', '1', '0.5000']);
  });
});

describe('utilisation report', () => {
  it('divides booked by available hours per technician per week, less time off', async () => {
    const res = await get('/api/reports/utilisation?from=2031-06-02&to=2031-06-08').expect(200);
    // Ada: 5 × 8 h − 4 h off = 36 h = 2160 min; booked 2 + 1.5 + 1 h (no-show still booked, canceled not) = 270 min → 0.125.
    // Bo: 4 × 10 h = 2400 min; booked 3 + 1 + 3 h = 420 min → 0.175 (the Sunday before is outside the range).
    expect(res.body.rows).toEqual([
      { week: '2031-06-02', technicianId: ids.ada, technicianName: 'Ada', bookedMinutes: 270, availableMinutes: 2160, utilisation: 0.125 },
      { week: '2031-06-02', technicianId: ids.bo, technicianName: 'Bo', bookedMinutes: 420, availableMinutes: 2400, utilisation: 0.175 },
    ]);
  });
});

describe('report requests', () => {
  it('name the field that is wrong', async () => {
    const bad = await get('/api/reports/visits?from=2031-06-09&to=2031-06-02').expect(422);
    expect(bad.body.error.fields).toHaveProperty('to');
    const missing = await get('/api/reports/visits?to=2031-06-02').expect(422);
    expect(missing.body.error.fields).toHaveProperty('from');
    const unknown = await get('/api/reports/quotes?from=2031-06-01&to=2031-06-02').expect(422);
    expect(unknown.body.error.fields).toHaveProperty('report');
  });
});

describe('office home', () => {
  it('counts today and tomorrow by status, the queue, renewals at risk, the week’s payments, open quotes and running campaigns in one read', async () => {
    // Today is Tue 10 June 2031 in the company's zone: one visit booked for Bo today, one request for tomorrow.
    const visit = (tech: string | null, status: string, local: string) => {
      const s = DateTime.fromISO(local, { zone: TZ });
      return q(
        `insert into visits (customer_id, property_id, technician_id, kind, reason, status, window_start, window_end, starts_at, ends_at)
         values ($1, $2, $3, 'service_call', 'no_cooling', $4, $5, $6, $5, $6)`,
        [ids.customer, ids.property, tech, status, s.toUTC().toISO(), s.plus({ hours: 2 }).toUTC().toISO()],
      );
    };
    await visit(ids.bo!, 'scheduled', '2031-06-10T14:00');
    await visit(null, 'requested', '2031-06-11T09:00');
    // Paid 11:30 p.m. on Monday 9 June local time: inside the last seven days.
    await q(`insert into payments (invoice_id, method, status, amount_cents, succeeded_at) values ($1, 'check', 'succeeded', 5000, $2)`, [ids.I5, at('2031-06-09T23:30')]);
    // Quotes on Bo's visit: a draft and a sent one are open, each at its current revision's dearest
    // option (the quotes page's rule); the approved one and the superseded revision are not counted.
    const quoteVisit = await q(`select id from visits where technician_id = $1 order by window_start limit 1`, [ids.bo]);
    const quote = async (status: string, revision: number, totals: Record<number, number[]>) => {
      const id = await q(`insert into quotes (visit_id, customer_id, property_id, status, revision) values ($1, $2, $3, $4, $5) returning id`, [
        quoteVisit,
        ids.customer,
        ids.property,
        status,
        revision,
      ]);
      for (const [rev, options] of Object.entries(totals)) {
        const r = await q(`insert into quote_revisions (quote_id, revision, status, tax_rate_bps) values ($1, $2, $3, 0) returning id`, [id, Number(rev), status]);
        for (const [i, total] of options.entries()) {
          await q(
            `insert into quote_options (revision_id, position, title, subtotal_cents, savings_cents, taxable_cents, tax_cents, total_cents) values ($1, $2, 'Option', $3, 0, $3, 0, $3)`,
            [r, i + 1, total],
          );
        }
      }
    };
    await quote('draft', 1, { 1: [12000, 45000] });
    await quote('sent', 2, { 1: [99900], 2: [30000] });
    await quote('approved', 1, { 1: [70000] });
    // Campaigns still going out: sending, scheduled and paused; a draft, a finished and a cancelled one are not.
    const staff = await q(`select id from users where email = 'office@reports.test'`);
    for (const status of ['sending', 'scheduled', 'paused', 'draft', 'done', 'cancelled']) {
      await q(`insert into reminder_campaigns (kind, created_by_id, audience_count, status) values ('filter', $1, 3, $2)`, [staff, status]);
    }
    const res = await get('/api/office-home').expect(200);
    expect(res.body).toEqual({
      today: '2031-06-10',
      tomorrow: '2031-06-11',
      visitsToday: { scheduled: 1 },
      visitsTomorrow: { requested: 1 },
      unassigned: 1,
      // A6 ended on 1 June; nothing else ends by 10 July. A4 is the one past due.
      renewalsDue30: { count: 0, totalCents: 0 },
      pastDue: { count: 1, totalCents: 19900 },
      recentPayments: { count: 1, totalCents: 5000 },
      recentPaymentDays: 7,
      // 45000 (the draft's dearer option) + 30000 (the sent quote's revision 2).
      openQuotes: { count: 2, totalCents: 75000 },
      runningCampaigns: 3,
    });
  });
});
