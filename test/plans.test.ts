import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { addDays } from '../shared/renewals';
import { agreements, planVersions } from '../server/db/schema';
import { localDate } from '../server/company/company';
import { newHousehold, OWNER, payOnHostedPage, seedAgreement, staff, startHarness, type Harness } from './billing-harness';
import { CSRF_HEADER_NAME } from './support/auth';

let h: Harness;
let today: string;
beforeAll(async () => {
  h = await startHarness();
  today = localDate(new Date(), 'America/Chicago');
});
afterAll(() => h.close());

const terms = {
  name: 'Heat Pump Care',
  description: 'Two heat pump tune-ups a year.',
  yearlyPriceCents: 21900,
  additionalSystemCents: 9900,
  coolingVisits: 1,
  heatingVisits: 1,
  repairDiscountBps: 1250,
  diagnosticFeeWaived: true,
  priorityWindowHours: 48,
  extras: ['Defrost board check'],
};

describe('plan tiers', () => {
  it('the owner creates a tier; editing its terms writes version 2 and an agreement sold on version 1 keeps it', async () => {
    const owner = await staff(h, OWNER);
    const code = `hp-care-${randomUUID().slice(0, 6)}`;
    const created = await owner.agent
      .post('/api/plans')
      .set(CSRF_HEADER_NAME, owner.csrf)
      .send({ ...terms, code })
      .expect(201);
    expect(created.body).toMatchObject({ code, version: 1, yearlyPriceCents: 21900, repairDiscountBps: 1250 });

    const hh = await newHousehold(h, 'plans');
    const enrolled = await hh.homeowner.agent
      .post('/api/agreements/enroll')
      .set(CSRF_HEADER_NAME, hh.homeowner.csrf)
      .send({ propertyId: hh.propertyId, planId: created.body.id })
      .expect(201);
    await payOnHostedPage(enrolled.body.checkoutUrl, '4242424242424242');
    await h.fake.fake.webhooksIdle();

    const edited = await owner.agent
      .put(`/api/plans/${created.body.id}`)
      .set(CSRF_HEADER_NAME, owner.csrf)
      .send({ ...terms, yearlyPriceCents: 23900, repairDiscountBps: 1500 })
      .expect(200);
    expect(edited.body).toMatchObject({ version: 2, yearlyPriceCents: 23900 });
    // Saving the same terms again writes no new version.
    const same = await owner.agent
      .put(`/api/plans/${created.body.id}`)
      .set(CSRF_HEADER_NAME, owner.csrf)
      .send({ ...terms, yearlyPriceCents: 23900, repairDiscountBps: 1500 })
      .expect(200);
    expect(same.body.version).toBe(2);

    const [a] = await h.ctx.database.db.select().from(agreements).where(eq(agreements.id, enrolled.body.agreementId));
    const [v] = await h.ctx.database.db.select().from(planVersions).where(eq(planVersions.id, a!.planVersionId));
    expect(a).toMatchObject({ status: 'active', priceCents: 21900 });
    expect(v).toMatchObject({ version: 1, yearlyPriceCents: 21900, repairDiscountBps: 1250 });
    const view = await hh.homeowner.agent.get(`/api/agreements/${a!.id}`).expect(200);
    expect(view.body.plan).toMatchObject({ version: 1, repairDiscountBps: 1250 });
    // The renewal will be at the current published price.
    expect(view.body.renewalPriceCents).toBe(23900);

    const versions = await owner.agent.get(`/api/plans/${created.body.id}/versions`).expect(200);
    expect(versions.body.versions.map((x: { version: number }) => x.version)).toEqual([2, 1]);
    // Off offer again, so other tests see the demo tiers only.
    await owner.agent.patch(`/api/plans/${created.body.id}`).set(CSRF_HEADER_NAME, owner.csrf).send({ active: false }).expect(200);
  });

  it('a tier taken off offer is hidden from homeowners and cannot be joined', async () => {
    const owner = await staff(h, OWNER);
    const code = `retired-${randomUUID().slice(0, 6)}`;
    const created = await owner.agent
      .post('/api/plans')
      .set(CSRF_HEADER_NAME, owner.csrf)
      .send({ ...terms, name: 'Retired Tier', code })
      .expect(201);
    await owner.agent.patch(`/api/plans/${created.body.id}`).set(CSRF_HEADER_NAME, owner.csrf).send({ active: false }).expect(200);
    const hh = await newHousehold(h, 'retired');
    const list = await hh.homeowner.agent.get('/api/plans').expect(200);
    expect(list.body.plans.map((p: { code: string }) => p.code)).not.toContain(code);
    const all = await owner.agent.get('/api/plans?all=1').expect(200);
    expect(all.body.plans.map((p: { code: string }) => p.code)).toContain(code);
    const res = await hh.homeowner.agent.post('/api/agreements/enroll').set(CSRF_HEADER_NAME, hh.homeowner.csrf).send({ propertyId: hh.propertyId, planId: created.body.id });
    expect(res.status).toBe(422);
    expect(res.body.error.fields).toHaveProperty('planId');
  });

  it('only the owner edits tiers, and bad terms are named field by field', async () => {
    const office = await staff(h);
    await office.agent
      .post('/api/plans')
      .set(CSRF_HEADER_NAME, office.csrf)
      .send({ ...terms, code: 'nope-office' })
      .expect(403);
    const owner = await staff(h, OWNER);
    const bad = await owner.agent
      .post('/api/plans')
      .set(CSRF_HEADER_NAME, owner.csrf)
      .send({ ...terms, code: 'Bad Code', yearlyPriceCents: 199.5, repairDiscountBps: 12000, priorityWindowHours: 0 });
    expect(bad.status).toBe(422);
    expect(Object.keys(bad.body.error.fields)).toEqual(expect.arrayContaining(['code', 'yearlyPriceCents', 'repairDiscountBps', 'priorityWindowHours']));
  });
});

describe('automatic renewal and the saved card', () => {
  it('switching automatic renewal on without a card opens a card page (SetupIntent); saving the card turns it on', async () => {
    const hh = await newHousehold(h, 'autoon');
    const { agreement } = await seedAgreement(h, hh, { endsOn: addDays(today, 100), status: 'active' });
    const { agent, csrf } = hh.homeowner;
    const on = await agent.post(`/api/agreements/${agreement.id}/auto-renew`).set(CSRF_HEADER_NAME, csrf).send({ enabled: true }).expect(200);
    expect(on.body.checkoutUrl).toMatch(/\/checkout\/cs_test_/);
    expect(on.body.agreement.autoRenew).toBe(false);
    const page = await fetch(on.body.checkoutUrl);
    expect(await page.text()).toContain('Save card');
    const saved = await payOnHostedPage(on.body.checkoutUrl, '4242424242424242');
    expect(saved.status).toBe(303);
    const sessionId = new URL(saved.headers.get('location')!).searchParams.get('checkout')!;
    const back = await agent.post('/api/invoices/checkout-return').set(CSRF_HEADER_NAME, csrf).send({ sessionId }).expect(200);
    expect(back.body.state).toBe('saved');
    const view = await agent.get(`/api/agreements/${agreement.id}`).expect(200);
    expect(view.body).toMatchObject({ autoRenew: true, card: { brand: 'visa', last4: '4242' } });

    const off = await agent.post(`/api/agreements/${agreement.id}/auto-renew`).set(CSRF_HEADER_NAME, csrf).send({ enabled: false }).expect(200);
    expect(off.body.agreement).toMatchObject({ autoRenew: false, card: { last4: '4242' } });
    const again = await agent.post(`/api/agreements/${agreement.id}/auto-renew`).set(CSRF_HEADER_NAME, csrf).send({ enabled: true }).expect(200);
    expect(again.body.checkoutUrl).toBeUndefined();
    expect(again.body.agreement.autoRenew).toBe(true);
  });

  it('renewing with "save my card" keeps the card for next year and switches automatic renewal on', async () => {
    const hh = await newHousehold(h, 'savecard');
    const { agreement } = await seedAgreement(h, hh, { endsOn: addDays(today, 20), status: 'renewal_due' });
    const { agent, csrf } = hh.homeowner;
    const start = await agent.post(`/api/agreements/${agreement.id}/renew`).set(CSRF_HEADER_NAME, csrf).send({ autoRenew: true }).expect(200);
    await payOnHostedPage(start.body.checkoutUrl, '5555 5555 5555 4444');
    await h.fake.fake.webhooksIdle();
    const view = await agent.get(`/api/agreements/${agreement.id}`).expect(200);
    expect(view.body).toMatchObject({ status: 'active', autoRenew: true, card: { brand: 'mastercard', last4: '4444' } });
  });
});
