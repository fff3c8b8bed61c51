import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DateTime } from 'luxon';
import { coveredThroughLabel, formatTermDay, lastPaidTerm, termLastDay, termOn, termRangeLabel } from '../shared/agreement-terms';
import { addDays, termEnd } from '../shared/renewals';
import { visits } from '../server/db/schema';
import { localDate } from '../server/company/company';
import { newHousehold, OWNER, payOnHostedPage, seedAgreement, startHarness, staff, type Harness } from './billing-harness';
import { CSRF_HEADER_NAME } from './support/auth';

const ZONE = 'America/Chicago';
let h: Harness;
let today: string;
beforeAll(async () => {
  h = await startHarness();
  today = localDate(new Date(), ZONE);
});
afterAll(() => h.close());

describe('the term in force', () => {
  const terms = [
    { startsOn: '2026-03-15', endsOn: '2027-03-15' },
    { startsOn: '2027-03-15', endsOn: '2028-03-15' },
  ];
  it('is the one whose range holds the date, end exclusive', () => {
    expect(termOn(terms, '2027-03-14')).toBe(terms[0]);
    expect(termOn(terms, '2027-03-15')).toBe(terms[1]);
    expect(termOn(terms, '2026-03-14')).toBeNull();
    expect(termOn(terms, '2028-03-15')).toBeNull();
  });
  it('is covered through the last day of the latest paid term, whichever term is in force', () => {
    expect(lastPaidTerm(terms)).toBe(terms[1]);
    expect(lastPaidTerm([terms[1]!, terms[0]!])).toBe(terms[1]);
    expect(lastPaidTerm([])).toBeNull();
    expect(coveredThroughLabel(lastPaidTerm(terms)!)).toBe('Covered through March 14, 2028');
  });
  it('has one last day and one way of writing it', () => {
    expect(termLastDay(terms[0]!)).toBe('2027-03-14');
    expect(termLastDay({ startsOn: '2028-02-29', endsOn: termEnd('2028-02-29') })).toBe('2029-02-28');
    expect(formatTermDay('2027-03-14')).toBe('March 14, 2027');
    expect(coveredThroughLabel(terms[0]!)).toBe('Covered through March 14, 2027');
    expect(termRangeLabel(terms[0]!)).toBe('March 15, 2026 to March 14, 2027');
  });
});

describe('renewing 20 days early', () => {
  it('keeps the current term and its benefits until its last day, then the new term applies; the office sees both terms', async () => {
    const hh = await newHousehold(h, 'early');
    const endsOn = addDays(today, 20);
    const { agreement } = await seedAgreement(h, hh, { endsOn, status: 'renewal_due', planCode: 'priority-comfort' });
    const { db } = h.ctx.database;
    const at = (day: string, hour: number) => DateTime.fromISO(`${day}T${String(hour).padStart(2, '0')}:00`, { zone: ZONE }).toJSDate();
    const visit = async (day: string, kind: 'tune_up' | 'service_call') => {
      const [v] = await db
        .insert(visits)
        .values({
          customerId: hh.customerId,
          propertyId: hh.propertyId,
          agreementId: agreement.id,
          technicianId: null,
          kind,
          reason: kind === 'tune_up' ? 'tune_up' : 'no_heat',
          status: 'requested',
          windowStart: at(day, 9),
          windowEnd: at(day, 11),
          startsAt: at(day, 9),
          endsAt: at(day, 10),
        })
        .returning({ id: visits.id });
      return v!.id;
    };
    const tuneUpToday = await visit(today, 'tune_up');
    const callTomorrow = await visit(addDays(today, 1), 'service_call');
    const callAfterEnd = await visit(endsOn, 'service_call');

    const { agent, csrf } = hh.homeowner;
    const start = await agent.post(`/api/agreements/${agreement.id}/renew`).set(CSRF_HEADER_NAME, csrf).send({}).expect(200);
    const paid = await payOnHostedPage(start.body.checkoutUrl, '4242 4242 4242 4242');
    const sessionId = new URL(paid.headers.get('location')!).searchParams.get('checkout')!;
    await agent.post('/api/invoices/checkout-return').set(CSRF_HEADER_NAME, csrf).send({ sessionId }).expect(200);
    await h.fake.fake.webhooksIdle();

    const owner = await staff(h, OWNER);
    const coverage = async (id: string) => (await owner.agent.get(`/api/field/visits/${id}`).expect(200)).body.coverage;
    const current = { startsOn: agreement.startsOn, endsOn };
    const next = { startsOn: endsOn, endsOn: termEnd(endsOn) };

    // Today's tune-up is still under the current term, and the banner names the last paid day.
    const t = await coverage(tuneUpToday);
    expect(t).toMatchObject({
      covered: true,
      term: { startsOn: current.startsOn, endsOn, label: termRangeLabel(current) },
      coveredThrough: { lastDay: termLastDay(next), label: coveredThroughLabel(next) },
    });
    // Tomorrow's service call still waives the diagnostic fee and takes the repair discount.
    const c = await coverage(callTomorrow);
    expect(c).toMatchObject({ covered: true, diagnosticFee: { waived: true, chargeCents: 0 }, term: { startsOn: current.startsOn } });
    expect(c.repairDiscountBps).toBeGreaterThan(0);
    // The day after the old term's last day the new term applies.
    const n = await coverage(callAfterEnd);
    expect(n).toMatchObject({
      covered: true,
      term: { startsOn: next.startsOn, endsOn: next.endsOn, label: termRangeLabel(next) },
      coveredThrough: { label: coveredThroughLabel(next) },
    });

    // The technician's today list reads covered too.
    const list = (await owner.agent.get('/api/field/visits/today').expect(200)).body;
    const row = (Array.isArray(list) ? list : list.visits).find((v: { id: string }) => v.id === tuneUpToday);
    if (row) expect(row.planStatus.covered).toBe(true);

    // The portal: covered through the new last day, with this term still shown.
    const mine = (await agent.get('/api/agreements/mine').expect(200)).body.agreements.find((a: { id: string }) => a.id === agreement.id);
    expect(mine).toMatchObject({ lastDayLabel: coveredThroughLabel(next), currentTerm: { startsOn: current.startsOn, lastDayLabel: coveredThroughLabel(current) } });
    expect(mine.terms).toHaveLength(2);
    expect(mine.lastCoveredDay).toBe(termLastDay(next));
    // The portal's home says the same last paid day.
    const home = (await agent.get('/api/my-home/summary').expect(200)).body.agreements.find((a: { id: string }) => a.id === agreement.id);
    expect(home.lastDayLabel).toBe(coveredThroughLabel(next));

    // The office sees both terms, with dates, price and payment.
    const office = await staff(h);
    const page = (await office.agent.get(`/api/customers/${hh.customerId}`).expect(200)).body;
    const a = page.agreements.find((x: { id: string }) => x.id === agreement.id);
    expect(a.terms).toHaveLength(2);
    expect(a.terms[0]).toMatchObject({ startsOn: current.startsOn, endsOn, label: termRangeLabel(current), lastDayLabel: coveredThroughLabel(current), inForce: true });
    expect(a.terms[1]).toMatchObject({ startsOn: next.startsOn, label: termRangeLabel(next), lastDayLabel: coveredThroughLabel(next), upcoming: true });
    expect(a.terms[1].invoiceNumber).toMatch(/^\d+$/);
    expect(a.terms[1].paidCents).toBe(a.terms[1].priceCents);
    expect(a.lastDayLabel).toBe(mine.lastDayLabel);

    // The receipt (and its PDF line) and the renewal notice write the last day the same way.
    const receipt = await h.smtp.store.waitForLatest({ to: hh.email }, 8000);
    expect(receipt?.text).toContain(termRangeLabel(next));
    const sentAt = new Date();
    await office.agent
      .post('/api/renewals/notices')
      .set(CSRF_HEADER_NAME, office.csrf)
      .send({ agreementIds: [agreement.id] })
      .expect(202);
    const notice = await h.smtp.store.waitForLatest({ to: hh.email, after: sentAt }, 8000);
    expect(notice?.text).toContain(`covered through ${formatTermDay(termLastDay(next))}`);
  });
});
