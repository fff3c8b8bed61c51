import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import Papa from 'papaparse';
import { addDays } from '../shared/renewals';
import { customers } from '../server/db/schema';
import { localDate } from '../server/company/company';
import { newHousehold, seedAgreement, staff, startHarness, type Harness } from './billing-harness';
import { CSRF_HEADER_NAME } from './support/auth';

let h: Harness;
let today: string;
beforeAll(async () => {
  h = await startHarness({ webhooks: false });
  today = localDate(new Date(), 'America/Chicago');
});
afterAll(() => h.close());

type Board = {
  counts: Record<string, { count: number; totalCents: number }>;
  rows: { agreementId: string; priceCents: number; lastNoticeAt: string | null; customerName: string }[];
};

describe('office renewals board', () => {
  it('places agreements in the 30/60/90-day, past-due, lapsed and renewed views with counts and money totals', async () => {
    const office = await staff(h);
    const soon = await newHousehold(h, 'board-soon');
    const later = await newHousehold(h, 'board-later');
    const late = await newHousehold(h, 'board-late');
    const gone = await newHousehold(h, 'board-gone');
    const { agreement: a10 } = await seedAgreement(h, soon, { endsOn: addDays(today, 10), status: 'renewal_due' });
    const { agreement: a75 } = await seedAgreement(h, later, { endsOn: addDays(today, 75), status: 'active', systems: 2 });
    const { agreement: aLate } = await seedAgreement(h, late, { endsOn: addDays(today, -4), status: 'past_due' });
    const { agreement: aGone } = await seedAgreement(h, gone, { endsOn: addDays(today, -40), status: 'lapsed' });

    const view = async (v: string) => (await office.agent.get(`/api/renewals?view=${v}`).expect(200)).body as Board;
    const ids = (b: Board) => b.rows.map((r) => r.agreementId);
    const due30 = await view('due30');
    expect(ids(due30)).toContain(a10.id);
    expect(ids(due30)).not.toContain(a75.id);
    expect(ids(await view('due60'))).toContain(a10.id);
    const due90 = await view('due90');
    expect(ids(due90)).toEqual(expect.arrayContaining([a10.id, a75.id]));
    // Two systems: yearly price plus one additional system
    expect(due90.rows.find((r) => r.agreementId === a75.id)!.priceCents).toBe(17900 + 8900);
    expect(ids(await view('past_due'))).toContain(aLate.id);
    expect(ids(await view('lapsed'))).toContain(aGone.id);
    // Counts and totals agree with the rows of each view.
    for (const v of ['due30', 'due60', 'due90', 'past_due', 'lapsed'] as const) {
      const b = await view(v);
      expect(b.counts[v]!.count).toBe(b.rows.length);
      expect(b.counts[v]!.totalCents).toBe(b.rows.reduce((s, r) => s + r.priceCents, 0));
    }

    // A check renewal moves the past-due one to "recently renewed".
    await office.agent.post(`/api/agreements/${aLate.id}/manual-renewal`).set(CSRF_HEADER_NAME, office.csrf).send({ method: 'cash', reference: 'Paid at the counter' }).expect(200);
    expect(ids(await view('renewed'))).toContain(aLate.id);
    expect(ids(await view('past_due'))).not.toContain(aLate.id);
  });

  it('exports the view as CSV, with cells that would run as a spreadsheet formula defused', async () => {
    const office = await staff(h);
    const hh = await newHousehold(h, 'csv');
    await h.ctx.database.db.update(customers).set({ name: '=HYPERLINK("http://example.test","x")' }).where(eq(customers.id, hh.customerId));
    const { agreement } = await seedAgreement(h, hh, { endsOn: addDays(today, 12), status: 'renewal_due' });
    const res = await office.agent.get('/api/renewals/export.csv?view=due30').expect(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    expect(res.headers['content-disposition']).toContain('renewals-due30.csv');
    const parsed = Papa.parse<string[]>(res.text.trim());
    expect(parsed.data[0]).toEqual(['Household', 'E-mail', 'Plan', 'Status', 'Ends on', 'Days left', 'Price (USD)', 'Automatic renewal', 'Last notice']);
    const row = parsed.data.find((r) => r[1] === hh.email)!;
    // OWASP CSV injection guidance: prefix cells starting with = + - @
    expect(row[0]).toBe(`'=HYPERLINK("http://example.test","x")`);
    expect(row.slice(2, 8)).toEqual(['Two-Season Care', 'Renewal due', agreement.endsOn, '12', '179.00', 'no']);
    await office.agent.get('/api/renewals/export.csv?view=soon').expect(422);
  });

  it('sends a renewal notice per agreement or in bulk, and shows when it went', async () => {
    const office = await staff(h);
    const a = await newHousehold(h, 'notice-a');
    const b = await newHousehold(h, 'notice-b');
    const { agreement: ra } = await seedAgreement(h, a, { endsOn: addDays(today, 25), status: 'renewal_due' });
    const { agreement: rb } = await seedAgreement(h, b, { endsOn: addDays(today, 26), status: 'renewal_due', card: 'pm_card_visa' });
    const sent = await office.agent
      .post('/api/renewals/notices')
      .set(CSRF_HEADER_NAME, office.csrf)
      .send({ agreementIds: [ra.id, rb.id] })
      .expect(202);
    expect(sent.body.queued).toBe(2);
    const ma = await h.smtp.store.waitForLatest({ to: a.email }, 5000);
    const mb = await h.smtp.store.waitForLatest({ to: b.email }, 5000);
    expect(ma?.subject).toMatch(/Time to renew/);
    // With a saved card on automatic renewal, the notice says the card will be charged.
    expect(mb?.subject).toMatch(/renews automatically/);
    expect(mb?.text).toContain('ending 4242');
    const board = (await office.agent.get('/api/renewals?view=due30').expect(200)).body as Board;
    expect(board.rows.find((r) => r.agreementId === ra.id)!.lastNoticeAt).not.toBeNull();

    const bad = await office.agent
      .post('/api/renewals/notices')
      .set(CSRF_HEADER_NAME, office.csrf)
      .send({ agreementIds: ['x'] });
    expect(bad.status).toBe(422);
    expect(bad.body.error.fields).toHaveProperty(['agreementIds.0']);
    await a.homeowner.agent
      .post('/api/renewals/notices')
      .set(CSRF_HEADER_NAME, a.homeowner.csrf)
      .send({ agreementIds: [ra.id] })
      .expect(403);
  });
});
