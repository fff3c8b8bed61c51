import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { addDays, termEnd } from '../shared/renewals';
import { agreementHistory, agreements, invoices } from '../server/db/schema';
import { localDate } from '../server/company/company';
import { newHousehold, payOnHostedPage, planByCode, seedAgreement, startHarness, staff, waitFor, type Harness } from './billing-harness';
import { CSRF_HEADER_NAME } from './support/auth';

let h: Harness;
let today: string;
beforeAll(async () => {
  h = await startHarness();
  today = localDate(new Date(), 'America/Chicago');
});
afterAll(() => h.close());

const agreementRow = async (id: string) => (await h.ctx.database.db.select().from(agreements).where(eq(agreements.id, id)))[0]!;

describe('renewing online', () => {
  it('a plan ending in 20 days shows Renew; paying 4242 adds exactly one 12-month term and mails a receipt with a PDF', async () => {
    const hh = await newHousehold(h, 'renew');
    const endsOn = addDays(today, 20);
    const { agreement, version } = await seedAgreement(h, hh, { endsOn, status: 'renewal_due', planCode: 'priority-comfort' });
    const { agent, csrf } = hh.homeowner;

    const mine = await agent.get('/api/agreements/mine').expect(200);
    const view = mine.body.agreements.find((a: { id: string }) => a.id === agreement.id);
    expect(view).toMatchObject({ status: 'renewal_due', canRenew: true, daysLeft: 20, renewalPriceCents: version.yearlyPriceCents });

    const start = await agent.post(`/api/agreements/${agreement.id}/renew`).set(CSRF_HEADER_NAME, csrf).send({}).expect(200);
    expect(start.body.checkoutUrl).toMatch(/\/checkout\/cs_test_/);

    // The redirect alone records nothing: the agreement is unchanged until the processor confirms.
    const paid = await payOnHostedPage(start.body.checkoutUrl, '4242 4242 4242 4242');
    expect(paid.status).toBe(303);
    const back = new URL(paid.headers.get('location')!);
    expect(back.pathname).toBe('/portal/plan');
    const sessionId = back.searchParams.get('checkout')!;

    // The signed webhook (processed in the background) or the return call records it, once.
    await agent.post('/api/invoices/checkout-return').set(CSRF_HEADER_NAME, csrf).send({ sessionId }).expect(200);
    await h.fake.fake.webhooksIdle();
    const after = await agreementRow(agreement.id);
    expect(after.status).toBe('active');
    expect(after.startsOn).toBe(endsOn);
    // 12-month term, end exclusive (shared/renewals.ts termEnd)
    expect(after.endsOn).toBe(termEnd(endsOn));

    const inv = await h.ctx.database.db.select().from(invoices).where(eq(invoices.agreementId, agreement.id));
    expect(inv).toHaveLength(1);
    expect(inv[0]).toMatchObject({ status: 'paid', purpose: 'renewal', totalCents: version.yearlyPriceCents, paidCents: version.yearlyPriceCents });
    // Exactly one PaymentIntent at the processor for this household.
    const pis = await h.stripe.paymentIntents.list({ limit: 100 });
    expect(pis.data.filter((p) => p.metadata['invoiceId'] === inv[0]!.id && p.status === 'succeeded')).toHaveLength(1);

    const mail = await h.smtp.store.waitForLatest({ to: hh.email }, 8000);
    expect(mail?.subject).toContain(`Receipt for invoice ${inv[0]!.number}`);
    const pdf = mail!.attachments.find((a) => a.contentType === 'application/pdf')!;
    expect(pdf.content.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    // The PDF embeds Nunito as a font subset (pdfkit writes "/FontName /XXXXXX+Nunito-Regular")
    expect(pdf.content.toString('latin1')).toMatch(/\/FontName \/[A-Z]{6}\+Nunito-Regular/);

    // Renew is no longer offered: the next window opens 60 days before the new end.
    const again = await agent.post(`/api/agreements/${agreement.id}/renew`).set(CSRF_HEADER_NAME, csrf).send({});
    expect(again.status).toBe(409);
  });

  it('4000 0000 0000 0002 is declined on the payment page and leaves the agreement as it was', async () => {
    const hh = await newHousehold(h, 'decline');
    const endsOn = addDays(today, 20);
    const { agreement } = await seedAgreement(h, hh, { endsOn, status: 'renewal_due', planCode: 'priority-comfort' });
    const { agent, csrf } = hh.homeowner;
    const start = await agent.post(`/api/agreements/${agreement.id}/renew`).set(CSRF_HEADER_NAME, csrf).send({}).expect(200);
    const res = await payOnHostedPage(start.body.checkoutUrl, '4000 0000 0000 0002');
    expect(res.status).toBe(402);
    // Stripe's documented generic decline message (docs.stripe.com/declines/codes)
    expect(await res.text()).toContain('Your card was declined.');
    await h.fake.fake.webhooksIdle();
    const after = await agreementRow(agreement.id);
    expect(after).toMatchObject({ status: 'renewal_due', startsOn: agreement.startsOn, endsOn });
    const [inv] = await h.ctx.database.db.select().from(invoices).where(eq(invoices.agreementId, agreement.id));
    expect(inv).toMatchObject({ status: 'open', paidCents: 0 });
  });

  it('renewal is refused before the 60-day window opens, naming the date', async () => {
    const hh = await newHousehold(h, 'early');
    const { agreement } = await seedAgreement(h, hh, { endsOn: addDays(today, 200), status: 'active' });
    const res = await hh.homeowner.agent.post(`/api/agreements/${agreement.id}/renew`).set(CSRF_HEADER_NAME, hh.homeowner.csrf).send({});
    expect(res.status).toBe(409);
    expect(res.body.error.message).toContain(addDays(today, 140));
  });

  it("a homeowner cannot see or renew another household's agreement (404)", async () => {
    const a = await newHousehold(h, 'owner-a');
    const b = await newHousehold(h, 'owner-b');
    const { agreement } = await seedAgreement(h, a, { endsOn: addDays(today, 20), status: 'renewal_due' });
    await b.homeowner.agent.get(`/api/agreements/${agreement.id}`).expect(404);
    await b.homeowner.agent.post(`/api/agreements/${agreement.id}/renew`).set(CSRF_HEADER_NAME, b.homeowner.csrf).send({}).expect(404);
  });
});

describe('enrolling', () => {
  it('a homeowner picks a plan for a property; the agreement is pending until the processor confirms payment', async () => {
    const hh = await newHousehold(h, 'enroll');
    const { plan, version } = await planByCode(h, 'whole-home');
    const { agent, csrf } = hh.homeowner;
    const res = await agent.post('/api/agreements/enroll').set(CSRF_HEADER_NAME, csrf).send({ propertyId: hh.propertyId, planId: plan.id, systemsCount: 2 }).expect(201);
    const pending = await agreementRow(res.body.agreementId);
    expect(pending.status).toBe('pending');
    // Yearly price plus one additional system
    expect(pending.priceCents).toBe(version.yearlyPriceCents + version.additionalSystemCents);

    const paid = await payOnHostedPage(res.body.checkoutUrl, '4242424242424242');
    expect(paid.status).toBe(303);
    await h.fake.fake.webhooksIdle();
    const active = await waitFor('active agreement', async () => {
      const a = await agreementRow(res.body.agreementId);
      return a.status === 'active' ? a : null;
    });
    expect(active.startsOn).toBe(today);
    expect(active.endsOn).toBe(termEnd(today));
    const history = await h.ctx.database.db.select().from(agreementHistory).where(eq(agreementHistory.agreementId, res.body.agreementId));
    expect(history.map((x) => x.event)).toEqual(['enrolled', 'paid']);

    // A property holds one agreement at a time.
    await agent.post('/api/agreements/enroll').set(CSRF_HEADER_NAME, csrf).send({ propertyId: hh.propertyId, planId: plan.id }).expect(409);
  });

  it('names the field when the input is wrong', async () => {
    const hh = await newHousehold(h, 'enroll-bad');
    const res = await hh.homeowner.agent
      .post('/api/agreements/enroll')
      .set(CSRF_HEADER_NAME, hh.homeowner.csrf)
      .send({ propertyId: 'nope', planId: hh.propertyId, systemsCount: 0 });
    expect(res.status).toBe(422);
    expect(Object.keys(res.body.error.fields)).toEqual(expect.arrayContaining(['propertyId', 'systemsCount']));
  });
});

describe('office actions', () => {
  it('a manual renewal by check records the payment, extends the term and e-mails a receipt', async () => {
    const hh = await newHousehold(h, 'manual');
    const endsOn = addDays(today, -5);
    const { agreement, version } = await seedAgreement(h, hh, { endsOn, status: 'past_due' });
    const office = await staff(h);
    const res = await office.agent
      .post(`/api/agreements/${agreement.id}/manual-renewal`)
      .set(CSRF_HEADER_NAME, office.csrf)
      .send({ method: 'check', reference: 'Check 2231' })
      .expect(200);
    expect(res.body.invoice).toMatchObject({ status: 'paid', totalCents: version.yearlyPriceCents });
    expect(res.body.invoice.payments[0]).toMatchObject({ method: 'check', reference: 'Check 2231' });
    expect(res.body.agreement).toMatchObject({ status: 'active', startsOn: endsOn, endsOn: termEnd(endsOn) });
    const mail = await h.smtp.store.waitForLatest({ to: hh.email }, 8000);
    expect(mail?.subject).toContain('Receipt');
    // Homeowners cannot record offline payments.
    await hh.homeowner.agent.post(`/api/agreements/${agreement.id}/manual-renewal`).set(CSRF_HEADER_NAME, hh.homeowner.csrf).send({ method: 'cash' }).expect(403);
  });

  it('moving to a dearer tier mid-term bills the difference for the days left; a cheaper one credits it', async () => {
    const hh = await newHousehold(h, 'tier');
    const startsOn = '2026-03-15';
    const endsOn = termEnd(startsOn); // 2027-03-15, 365 days
    const { agreement } = await seedAgreement(h, hh, { endsOn, status: 'active', planCode: 'two-season' });
    await h.ctx.database.db.update(agreements).set({ startsOn }).where(eq(agreements.id, agreement.id));
    const office = await staff(h);
    const dearer = await planByCode(h, 'priority-comfort');
    // Worked example: (25900 − 17900) × 120 / 365 = 2630.136… → 2630 cents (change on 2026-11-15, 120 days left)
    const up = await office.agent
      .post(`/api/agreements/${agreement.id}/change-tier`)
      .set(CSRF_HEADER_NAME, office.csrf)
      .send({ planId: dearer.plan.id, changeDate: '2026-11-15' })
      .expect(200);
    expect(up.body.prorationCents).toBe(2630);
    expect(up.body.invoice).toMatchObject({ purpose: 'tier_change', status: 'open', totalCents: up.body.prorationCents });
  });
});
