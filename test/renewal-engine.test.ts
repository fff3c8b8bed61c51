import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { addDays, idempotencyKeyForRenewal, termEnd } from '../shared/renewals';
import { agreements, invoices, payments, renewalNotices } from '../server/db/schema';
import { localDate } from '../server/company/company';
import { chargeRenewal, runRenewals } from '../server/renewals/renewal-engine';
import { newHousehold, payOnHostedPage, seedAgreement, startHarness, type Harness } from './billing-harness';

// Webhooks off: every state change here comes from the engine's own processor calls.
let h: Harness;
let today: string;
beforeAll(async () => {
  h = await startHarness({ webhooks: false });
  today = localDate(new Date(), 'America/Chicago');
});
afterAll(() => h.close());

const row = async (id: string) => (await h.ctx.database.db.select().from(agreements).where(eq(agreements.id, id)))[0]!;
const mailsTo = (email: string) => h.smtp.store.list({ to: email });
const intentsFor = async (agreementId: string) => (await h.stripe.paymentIntents.list({ limit: 100 })).data.filter((p) => p.metadata['agreementId'] === agreementId);

describe('renewal notices', () => {
  it('go out at 60, 30 and 7 days before the end, once each, and open the renewal window', async () => {
    const hh = await newHousehold(h, 'notice');
    const endsOn = addDays(today, 60);
    const { agreement } = await seedAgreement(h, hh, { endsOn, status: 'active' });

    const first = await runRenewals(h.ctx.deps, { only: [agreement.id], today });
    expect(first.errors).toEqual([]);
    expect((await row(agreement.id)).status).toBe('renewal_due');
    await runRenewals(h.ctx.deps, { only: [agreement.id], today }); // a second run the same day sends nothing more
    await runRenewals(h.ctx.deps, { only: [agreement.id], today: addDays(endsOn, -45) }); // between notices: nothing
    await runRenewals(h.ctx.deps, { only: [agreement.id], today: addDays(endsOn, -30) });
    await runRenewals(h.ctx.deps, { only: [agreement.id], today: addDays(endsOn, -7) });
    await runRenewals(h.ctx.deps, { only: [agreement.id], today: addDays(endsOn, -6) });

    const sent = await h.ctx.database.db.select().from(renewalNotices).where(eq(renewalNotices.agreementId, agreement.id));
    // Notice days 60/30/7 (shared/renewals.ts RENEWAL_NOTICE_DAYS)
    expect(sent.map((s) => s.daysBefore).sort((a, b) => b! - a!)).toEqual([60, 30, 7]);
    await new Promise((r) => setTimeout(r, 300));
    const mails = mailsTo(hh.email);
    expect(mails).toHaveLength(3);
    expect(mails[0]!.subject).toMatch(/Time to renew/);
    expect(mails[0]!.text).toContain('/portal/plan');
    // Two-Season Care is $179.00 a year in the demo price list
    expect(mails[0]!.text).toContain('$179.00 for the next 12 months');
  });
});

describe('automatic renewal on the end date', () => {
  it('charges the saved card off-session with a key from agreement and term, and adds one term', async () => {
    const hh = await newHousehold(h, 'auto');
    const endsOn = addDays(today, 0);
    const { agreement, version } = await seedAgreement(h, hh, { endsOn, status: 'renewal_due', card: 'pm_card_visa' });

    const report = await runRenewals(h.ctx.deps, { only: [agreement.id], today: endsOn });
    expect(report).toMatchObject({ charged: 1, chargeFailed: 0, errors: [] });
    const after = await row(agreement.id);
    expect(after).toMatchObject({ status: 'active', startsOn: endsOn, endsOn: termEnd(endsOn) });
    const pis = await intentsFor(agreement.id);
    expect(pis).toHaveLength(1);
    expect(pis[0]).toMatchObject({ status: 'succeeded', amount: version.yearlyPriceCents });
    // The processor log shows the key the engine used.
    const key = h.fake.fake.requests().find((r) => r.path === '/v1/payment_intents' && r.method === 'POST' && r.idempotencyKey?.includes(agreement.id))?.idempotencyKey;
    expect(key).toBe(`${idempotencyKeyForRenewal(agreement.id, endsOn)}-attempt-0`);

    const again = await runRenewals(h.ctx.deps, { only: [agreement.id], today: endsOn });
    expect(again.charged).toBe(0);
    expect(await intentsFor(agreement.id)).toHaveLength(1);
  });

  it('without automatic renewal the agreement falls past due at the end and lapses after 30 days of grace', async () => {
    const hh = await newHousehold(h, 'lapse');
    const endsOn = addDays(today, 0);
    const { agreement } = await seedAgreement(h, hh, { endsOn, status: 'renewal_due' });
    await runRenewals(h.ctx.deps, { only: [agreement.id], today: endsOn });
    expect((await row(agreement.id)).status).toBe('past_due');
    await runRenewals(h.ctx.deps, { only: [agreement.id], today: addDays(endsOn, 29) });
    expect((await row(agreement.id)).status).toBe('past_due');
    // Grace period 30 days (shared/renewals.ts DEFAULT_GRACE_DAYS)
    await runRenewals(h.ctx.deps, { only: [agreement.id], today: addDays(endsOn, 30) });
    expect((await row(agreement.id)).status).toBe('lapsed');
  });
});

describe('dunning', () => {
  it('a declined renewal goes past due and retries on days 3, 7 and 14, each with an update-card e-mail', async () => {
    const hh = await newHousehold(h, 'dunning');
    const endsOn = addDays(today, 0);
    // 4000 0000 0000 0341: saves fine, later charges decline (Stripe testing docs)
    const { agreement } = await seedAgreement(h, hh, { endsOn, status: 'renewal_due', card: 'pm_card_chargeCustomerFail' });

    const first = await runRenewals(h.ctx.deps, { only: [agreement.id], today: endsOn });
    expect(first).toMatchObject({ charged: 0, chargeFailed: 1 });
    let a = await row(agreement.id);
    expect(a).toMatchObject({ status: 'past_due', chargeFailedOn: endsOn, dunningRetries: 0 });
    expect(a.lastChargeError).toMatch(/declined/);

    const attemptsOn: string[] = [];
    for (let d = 1; d <= 20; d++) {
      const r = await runRenewals(h.ctx.deps, { only: [agreement.id], today: addDays(endsOn, d) });
      if (r.retried) attemptsOn.push(addDays(endsOn, d));
    }
    // Retries 3, 7 and 14 days after the failure (shared/renewals.ts DUNNING_RETRY_DAYS)
    expect(attemptsOn).toEqual([addDays(endsOn, 3), addDays(endsOn, 7), addDays(endsOn, 14)]);
    a = await row(agreement.id);
    expect(a).toMatchObject({ status: 'past_due', dunningRetries: 3 });
    expect(await intentsFor(agreement.id)).toHaveLength(4);
    await new Promise((r) => setTimeout(r, 300));
    const mails = mailsTo(hh.email).filter((m) => m.subject.includes('declined'));
    expect(mails).toHaveLength(4);
    expect(mails[0]!.links.some((l) => l.includes(`/portal/plan?update-card=${agreement.id}`))).toBe(true);

    await runRenewals(h.ctx.deps, { only: [agreement.id], today: addDays(endsOn, 30) });
    expect((await row(agreement.id)).status).toBe('lapsed');
  });
});

describe('no double payment', () => {
  it('an automatic charge closes a payment page the homeowner left open for the same renewal', async () => {
    const hh = await newHousehold(h, 'open-tab');
    const endsOn = addDays(today, 0);
    const { agreement } = await seedAgreement(h, hh, { endsOn, status: 'renewal_due', card: 'pm_card_visa' });
    const start = await hh.homeowner.agent.post(`/api/agreements/${agreement.id}/renew`).set('X-XSRF-TOKEN', hh.homeowner.csrf).send({}).expect(200);
    const report = await runRenewals(h.ctx.deps, { only: [agreement.id], today: endsOn });
    expect(report.charged).toBe(1);
    const late = await payOnHostedPage(start.body.checkoutUrl, '4242424242424242');
    expect(late.status).toBe(410);
    const [inv] = await h.ctx.database.db
      .select()
      .from(invoices)
      .where(and(eq(invoices.agreementId, agreement.id), eq(invoices.purpose, 'renewal')));
    expect(inv).toMatchObject({ status: 'paid', paidCents: inv!.totalCents });
  });
});

describe('crash safety', () => {
  it('a run killed after the charge and started again charges nobody twice', async () => {
    const hh = await newHousehold(h, 'crash');
    const endsOn = addDays(today, 0);
    const { agreement } = await seedAgreement(h, hh, { endsOn, status: 'renewal_due', card: 'pm_card_visa' });

    const killed = await runRenewals(h.ctx.deps, {
      today: endsOn,
      afterCharge: () => {
        throw new Error('worker killed');
      },
    });
    expect(killed.errors.map((e) => e.agreementId)).toContain(agreement.id);
    // The processor charged once; nothing is recorded yet.
    expect((await intentsFor(agreement.id)).filter((p) => p.status === 'succeeded')).toHaveLength(1);
    expect((await row(agreement.id)).status).toBe('renewal_due');

    const restarted = await runRenewals(h.ctx.deps, { only: [agreement.id], today: endsOn });
    expect(restarted.errors).toEqual([]);
    expect((await intentsFor(agreement.id)).filter((p) => p.status === 'succeeded')).toHaveLength(1);
    const replayed = h.fake.fake.requests().filter((r) => r.idempotencyKey?.startsWith(idempotencyKeyForRenewal(agreement.id, endsOn)));
    expect(replayed.map((r) => r.replayed)).toEqual([false, true]);
    expect(await row(agreement.id)).toMatchObject({ status: 'active', endsOn: termEnd(endsOn) });
    const inv = await h.ctx.database.db
      .select()
      .from(invoices)
      .where(and(eq(invoices.agreementId, agreement.id), eq(invoices.purpose, 'renewal')));
    expect(inv).toHaveLength(1);
    const pays = await h.ctx.database.db.select().from(payments).where(eq(payments.invoiceId, inv[0]!.id));
    expect(pays.filter((p) => p.status === 'succeeded')).toHaveLength(1);
  });

  it('two workers running at once charge once', async () => {
    const hh = await newHousehold(h, 'twin');
    const endsOn = addDays(today, 0);
    const { agreement } = await seedAgreement(h, hh, { endsOn, status: 'renewal_due', card: 'pm_card_visa' });
    await Promise.all([runRenewals(h.ctx.deps, { only: [agreement.id], today: endsOn }), runRenewals(h.ctx.deps, { only: [agreement.id], today: endsOn })]);
    expect((await intentsFor(agreement.id)).filter((p) => p.status === 'succeeded')).toHaveLength(1);
    expect(await row(agreement.id)).toMatchObject({ status: 'active', endsOn: termEnd(endsOn) });
  });

  it('a worker that read the agreement before another renewed it does not bill the next term early', async () => {
    const hh = await newHousehold(h, 'late-worker');
    const endsOn = addDays(today, 0);
    const { agreement } = await seedAgreement(h, hh, { endsOn, status: 'renewal_due', card: 'pm_card_visa' });
    await runRenewals(h.ctx.deps, { only: [agreement.id], today: endsOn });
    // The slower worker still believes the term ends today.
    expect(await chargeRenewal(h.ctx.deps, agreement.id, endsOn, 0)).toBe(true);
    expect((await intentsFor(agreement.id)).filter((p) => p.status === 'succeeded')).toHaveLength(1);
    expect(await row(agreement.id)).toMatchObject({ status: 'active', endsOn: termEnd(endsOn) });
  });
});
