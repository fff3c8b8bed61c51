// Work invoiced without a quote (office and technician), the invoices of a visit, and paying one
// on the technician's device through the fake processor's hosted page, back to the visit.
import { randomUUID } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { invoices, mailSends } from '../server/db/schema';
import { payOnHostedPage, startHarness, type Harness } from './billing-harness';
import type { Signed } from './support/auth';
import { newHome, newPart, newTechnician, post, signInRole, visitToday, type Home, type Tech } from './support/work-fixture';

let h: Harness;
let owner: Signed;
let office: Signed;
let tech: Tech;
let other: Tech;
let home: Home;
let visitId: string;
let relayId: string;
let planVersionId: string;

// The pure coverage code, with a switch that makes it fail the way a bug would (not an input problem).
const coverageBug = vi.hoisted(() => ({ on: false }));
vi.mock('../shared/quote-coverage', async (original) => {
  const real = await original<typeof import('../shared/quote-coverage')>();
  return {
    ...real,
    coverOption: (...args: Parameters<typeof real.coverOption>) => {
      if (coverageBug.on) throw new TypeError("Cannot read properties of undefined (reading 'left')");
      return real.coverOption(...args);
    },
  };
});

const diag = { source: 'custom', description: 'Diagnostic fee', kind: 'fee', category: 'diagnostic_fee', quantity: 1, unitCents: 8900, taxable: false };

beforeAll(async () => {
  h = await startHarness();
  owner = await signInRole(h.ctx, 'owner');
  office = await signInRole(h.ctx, 'office');
  tech = await newTechnician(h.ctx, office, 'invoicer');
  other = await newTechnician(h.ctx, office, 'bystander');
  relayId = await newPart(owner, 'inv', 4000);
  const plans = (await owner.agent.get('/api/plans').expect(200)).body.plans as { code: string; versionId: string; repairDiscountBps: number; diagnosticFeeWaived: boolean }[];
  const two = plans.find((p) => p.code === 'two-season')!;
  expect(two.repairDiscountBps).toBeGreaterThan(0);
  planVersionId = two.versionId;
  home = await newHome(h.ctx, { planVersionId });
  visitId = await visitToday(h.ctx, tech, home, 'on_site');
});
afterAll(() => h?.close());

const payLinkMails = async (invoiceId: string) =>
  (await h.ctx.database.db.select().from(mailSends).where(eq(mailSends.kind, 'invoice_pay_link'))).filter((m) => m.key === `invoice-pay-link:${invoiceId}`);

describe('direct work invoices', () => {
  let invoiceId: string;

  it("the technician invoices work on their own visit with the plan's coverage per line, and the homeowner gets the pay link", async () => {
    const body = { customerId: home.customerId, visitId, lines: [{ source: 'item', itemId: relayId, quantity: 1 }, diag] };
    const preview = await post(tech.signed, '/api/work-invoices/preview', body);
    expect(preview.status).toBe(200);
    const [relay, fee] = preview.body.lines;
    expect(relay.rules).toEqual(['repair_discount']);
    expect(fee.rules).toEqual(['diagnostic_waived']);
    expect(fee.chargedCents).toBe(0);
    const before = await h.ctx.database.db.select({ id: invoices.id }).from(invoices).where(eq(invoices.customerId, home.customerId));
    expect(before).toHaveLength(0);

    const res = await post(tech.signed, '/api/work-invoices', body);
    expect(res.status).toBe(201);
    invoiceId = res.body.id;
    expect(res.body.status).toBe('open');
    expect(res.body.totalCents).toBe(preview.body.totalCents);
    res.body.lines.forEach((l: { discountCents: number; reason: string }, i: number) => {
      expect(l.discountCents).toBe(preview.body.lines[i].savingsCents);
      expect(l.reason).toBe(preview.body.lines[i].reason);
    });
    const [row] = await h.ctx.database.db.select().from(invoices).where(eq(invoices.id, invoiceId));
    expect(row).toMatchObject({ visitId, agreementId: home.agreementId, purpose: 'service' });

    expect(await payLinkMails(invoiceId)).toHaveLength(1);
    const mail = await h.smtp.store.waitForLatest({ to: home.email }, 8000);
    expect(mail?.subject.startsWith(`Invoice ${res.body.number} from `)).toBe(true);
    expect(mail?.text).toContain(`/portal/invoices/${invoiceId}`);

    const mine = (await home.homeowner.agent.get('/api/invoices').expect(200)).body.rows.map((r: { id: string }) => r.id);
    expect(mine).toContain(invoiceId);
  });

  it('a technician must name their own visit; the office may invoice a household without one', async () => {
    const none = await post(tech.signed, '/api/work-invoices', { customerId: home.customerId, lines: [diag] });
    expect(none.status).toBe(422);
    expect(none.body.error.fields.visitId).toMatch(/visit/);
    expect((await post(other.signed, '/api/work-invoices', { customerId: home.customerId, visitId, lines: [diag] })).status).toBe(404);
    expect((await post(other.signed, '/api/work-invoices/preview', { customerId: home.customerId, visitId, lines: [diag] })).status).toBe(404);
    const elsewhere = await newHome(h.ctx);
    const wrongHome = await post(tech.signed, '/api/work-invoices', { customerId: elsewhere.customerId, visitId, lines: [diag] });
    expect(wrongHome.status).toBe(422);
    expect(wrongHome.body.error.fields.visitId).toBe('That visit is at another household.');

    const res = await post(office, '/api/work-invoices', { customerId: elsewhere.customerId, lines: [diag], sendPayLink: false });
    expect(res.status).toBe(201);
    // No agreement: regular price, and no e-mail when the pay link is not asked for.
    expect(res.body.lines[0]).toMatchObject({ discountCents: 0, netCents: 8900 });
    expect(await payLinkMails(res.body.id)).toHaveLength(0);
    const [row] = await h.ctx.database.db.select().from(invoices).where(eq(invoices.id, res.body.id));
    expect(row!.visitId).toBeNull();
  });

  it('only input problems are 422, each naming its field; a missing visit is 404 and a fault of ours stays a 500', async () => {
    for (const url of ['/api/work-invoices', '/api/work-invoices/preview']) {
      const missing = await post(office, url, { customerId: home.customerId, visitId: randomUUID(), lines: [diag], sendPayLink: false });
      expect(missing.status, url).toBe(404);
      expect(missing.body.error.code).toBe('not_found');
      // The coverage code's own input check, named where the caller sent it.
      const halfTuneUp = { source: 'custom', description: 'Tune-up', kind: 'fee', category: 'tune_up', quantity: 1.5, unitCents: 12900, taxable: false };
      const half = await post(tech.signed, url, { customerId: home.customerId, visitId, lines: [diag, halfTuneUp], sendPayLink: false });
      expect(half.status, url).toBe(422);
      expect(half.body.error.fields).toEqual({ 'lines.1.quantity': 'counts whole tune-ups' });
      const nowhere = await post(tech.signed, url, { customerId: home.customerId, visitId, lines: [{ source: 'item', itemId: randomUUID(), quantity: 1 }], sendPayLink: false });
      expect(nowhere.status, url).toBe(422);
      expect(Object.keys(nowhere.body.error.fields)).toEqual(['lines.0.itemId']);
      coverageBug.on = true;
      try {
        const bug = await post(tech.signed, url, { customerId: home.customerId, visitId, lines: [diag], sendPayLink: false });
        expect(bug.status, url).toBe(500);
        expect(bug.body.error.code).toBe('internal');
        expect(JSON.stringify(bug.body)).not.toContain('reading');
      } finally {
        coverageBug.on = false;
      }
    }
  });

  it("lists the visit's invoices to its technician and the office, not to another technician", async () => {
    const list = await tech.signed.agent.get(`/api/work-invoices?visitId=${visitId}`).expect(200);
    expect(list.body).toHaveLength(1);
    expect(list.body[0]).toMatchObject({ id: invoiceId, status: 'open' });
    expect(list.body[0].balanceCents).toBe(list.body[0].totalCents);
    expect((await office.agent.get(`/api/work-invoices?visitId=${visitId}`)).body).toHaveLength(1);
    expect((await other.signed.agent.get(`/api/work-invoices?visitId=${visitId}`)).status).toBe(404);
    expect((await tech.signed.agent.get('/api/work-invoices?visitId=nope')).status).toBe(422);
    expect((await home.homeowner.agent.get(`/api/work-invoices?visitId=${visitId}`)).status).toBe(403);
  });

  it("pays on the technician's device: the hosted page returns to the visit, which then shows it paid", async () => {
    expect((await post(other.signed, `/api/work-invoices/${invoiceId}/checkout`, { visitId })).status).toBe(404);
    expect((await post(home.homeowner, `/api/work-invoices/${invoiceId}/checkout`, { visitId })).status).toBe(403);
    const otherVisit = await visitToday(h.ctx, tech, home, 'scheduled');
    expect((await post(tech.signed, `/api/work-invoices/${invoiceId}/checkout`, { visitId: otherVisit })).status).toBe(404);

    const start = await post(tech.signed, `/api/work-invoices/${invoiceId}/checkout`, { visitId });
    expect(start.status).toBe(200);
    expect(start.body.checkoutUrl).toMatch(/^http/);
    const paid = await payOnHostedPage(start.body.checkoutUrl, '4242424242424242');
    expect(paid.status).toBe(303);
    const back = new URL(paid.headers.get('location')!);
    expect(back.pathname).toBe(`/field/visits/${visitId}`);
    const sessionId = back.searchParams.get('checkout')!;
    expect(sessionId).toMatch(/^cs_/);

    const synced = await post(tech.signed, '/api/invoices/checkout-return', { sessionId });
    expect(synced.status).toBe(200);
    expect(synced.body).toMatchObject({ state: 'paid', invoiceId });
    const list = await tech.signed.agent.get(`/api/work-invoices?visitId=${visitId}`).expect(200);
    expect(list.body[0]).toMatchObject({ status: 'paid', balanceCents: 0 });
    const again = await post(tech.signed, `/api/work-invoices/${invoiceId}/checkout`, { visitId });
    expect(again.status).toBe(409);
  });

  it('work the plan covers in full is settled as issued, and the mail asks for nothing', async () => {
    // A member's diagnostic fee is waived by the plan: the invoice comes to $0.00.
    const startedAt = new Date();
    const res = await post(tech.signed, '/api/work-invoices', { customerId: home.customerId, visitId, lines: [diag] });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ totalCents: 0, status: 'paid' });
    const [row] = await h.ctx.database.db.select().from(invoices).where(eq(invoices.id, res.body.id));
    expect(row!.paidAt).not.toBeNull();
    expect(await payLinkMails(res.body.id)).toHaveLength(1);
    const mail = await h.smtp.store.waitForLatest({ to: home.email, after: startedAt }, 8000);
    expect(mail?.subject.startsWith(`Invoice ${res.body.number} from `)).toBe(true);
    expect(mail?.text).toContain('there is nothing to pay');
    expect(mail?.text).not.toContain('Pay online');
    const open = (await home.homeowner.agent.get('/api/invoices').expect(200)).body.rows.find((r: { id: string }) => r.id === res.body.id);
    expect(open).toMatchObject({ status: 'paid' });
  });

  it('the portal keeps its own return pages: a homeowner cannot send the payment page back to a visit', async () => {
    const res = await post(office, '/api/work-invoices', { customerId: home.customerId, visitId, lines: [{ source: 'item', itemId: relayId, quantity: 1 }], sendPayLink: false });
    const bad = await post(home.homeowner, `/api/invoices/${res.body.id}/checkout`, { returnPath: `/field/visits/${visitId}` });
    expect(bad.status).toBe(422);
    expect(bad.body.error.fields.returnPath).toBe('Must be a portal page.');
  });
});
