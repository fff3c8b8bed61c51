// The owner's plan choices that quotes price with: which price-book categories take the repair
// discount, and whether the plan pays the labor to fit a part the manufacturer's warranty replaces.
import { randomUUID } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEFAULT_DISCOUNT_CATEGORIES } from '../shared/pricebook';
import { flatRateTasks } from '../server/db/schema';
import { testApp, type TestContext } from './support/app';
import type { Signed } from './support/auth';
import { newHome, newPart, newTechnician, post, put, signInRole, visitToday, ZONE, type Tech } from './support/work-fixture';

let ctx: TestContext;
let owner: Signed;
let office: Signed;
let tech: Tech;
let relayId: string;
let taskId: string;
let plan: { id: string; versionId: string };

const TERMS = {
  name: 'Fernhill Test Plan',
  description: 'Invented for the plan-choice tests.',
  yearlyPriceCents: 19900,
  additionalSystemCents: 9900,
  coolingVisits: 1,
  heatingVisits: 1,
  repairDiscountBps: 1500,
  diagnosticFeeWaived: true,
  priorityWindowHours: 48,
  extras: [],
};
const warrantyUntil = () => DateTime.now().setZone(ZONE).plus({ years: 3 }).toISODate()!;
const labor = { source: 'custom', description: 'Repair labor, 1 hour', kind: 'labor', category: 'repair_labor', quantity: 1, unitCents: 12000, taxable: false };

beforeAll(async () => {
  ctx = testApp();
  owner = await signInRole(ctx, 'owner');
  office = await signInRole(ctx, 'office');
  tech = await newTechnician(ctx, office, 'choices');
  relayId = await newPart(owner, 'choice', 4000);
  taskId = (await ctx.database.db.select({ id: flatRateTasks.id }).from(flatRateTasks).where(eq(flatRateTasks.sku, 'TASK-BLOWER-050')))[0]!.id;
});
afterAll(() => ctx.close());

type Line = { description: string; rules: string[]; savingsCents: number; grossCents: number; reason: string; kind: string };
async function previewLines(visitId: string, lines: unknown[], equipmentId: string | null = null): Promise<Line[]> {
  const res = await post(tech.signed, '/api/quotes/preview', { visitId, equipmentId, options: [{ title: 'Repair', lines }] });
  expect(res.status).toBe(200);
  return res.body.options[0].lines;
}

describe('plan choices for quotes', () => {
  it('a new plan starts from the usual repair categories, without warranty labor', async () => {
    const res = await post(owner, '/api/plans', { ...TERMS, code: `fernhill-${randomUUID().slice(0, 6)}` });
    expect(res.status).toBe(201);
    expect(res.body.discountCategories.sort()).toEqual([...DEFAULT_DISCOUNT_CATEGORIES].sort());
    expect(res.body.warrantyLaborCovered).toBe(false);
    plan = { id: res.body.id, versionId: res.body.versionId };
    // Not on offer, so the homeowners' plan list stays as other tests expect it.
    expect((await owner.agent.patch(`/api/plans/${plan.id}`).set('X-XSRF-TOKEN', owner.csrf).send({ active: false })).status).toBe(200);
  });

  it('the owner marks the categories and warranty labor; a bad category is a field error; the office may not', async () => {
    const bad = await put(owner, `/api/plans/${plan.id}`, { ...TERMS, discountCategories: ['relay', 'snacks'] });
    expect(bad.status).toBe(422);
    expect(Object.keys(bad.body.error.fields)).toContain('discountCategories.1');
    const twice = await put(owner, `/api/plans/${plan.id}`, { ...TERMS, discountCategories: ['relay', 'relay'] });
    expect(twice.status).toBe(422);
    expect(twice.body.error.fields.discountCategories).toBe('Each category once.');
    expect((await put(office, `/api/plans/${plan.id}`, { ...TERMS, warrantyLaborCovered: true })).status).toBe(403);

    const saved = await put(owner, `/api/plans/${plan.id}`, { ...TERMS, discountCategories: ['relay'], warrantyLaborCovered: true });
    expect(saved.status).toBe(200);
    expect(saved.body).toMatchObject({ version: 2, discountCategories: ['relay'], warrantyLaborCovered: true });
    plan.versionId = saved.body.versionId;
    // The same choices again write no new version.
    const same = await put(owner, `/api/plans/${plan.id}`, { ...TERMS, discountCategories: ['relay'], warrantyLaborCovered: true });
    expect(same.body.version).toBe(2);
    const listed = (await owner.agent.get('/api/plans?all=1').expect(200)).body.plans;
    const found = listed.find((p: { id: string }) => p.id === plan.id);
    expect(found).toMatchObject({ discountCategories: ['relay'], warrantyLaborCovered: true });
  });

  it('only the marked categories take the repair discount', async () => {
    const home = await newHome(ctx, { planVersionId: plan.versionId });
    const visitId = await visitToday(ctx, tech, home, 'on_site');
    const [relay, work] = await previewLines(visitId, [{ source: 'item', itemId: relayId, quantity: 1 }, labor]);
    expect(relay!.rules).toEqual(['repair_discount']);
    // 15 % of $40.00, rounded half up per line (shared/money.ts).
    expect(relay!.savingsCents).toBe(600);
    expect(relay!.reason).toBe('Repair discount 15 %: −$6.00.');
    expect(work!.rules).toEqual(['regular']);
    expect(work!.savingsCents).toBe(0);
    expect(work!.reason).toBe("Not part of your plan's repair discount: regular price.");
  });

  it("with warranty labor covered, the labor to fit a warranty part is the plan's; the agreement keeps its version", async () => {
    const home = await newHome(ctx, { planVersionId: plan.versionId, warrantyEndsOn: warrantyUntil() });
    const visitId = await visitToday(ctx, tech, home, 'on_site');
    // A later version without warranty labor is for new sales; this agreement keeps version 2.
    const v3 = await put(owner, `/api/plans/${plan.id}`, { ...TERMS, discountCategories: ['relay'], warrantyLaborCovered: false });
    expect(v3.body.version).toBe(3);
    const lines = await previewLines(visitId, [{ source: 'task', taskId, quantity: 1 }], home.equipmentId);
    const fit = lines.find((l) => l.kind === 'labor')!;
    expect(fit.rules).toEqual(['warranty_labor']);
    expect(fit.savingsCents).toBe(fit.grossCents);
    for (const p of lines.filter((l) => l.kind === 'part')) expect(p.rules).toEqual(['warranty_part']);
    expect(lines.find((l) => l.kind === 'part')!.reason).toMatch(/your plan covers the labor to fit it/);

    const newer = await newHome(ctx, { planVersionId: v3.body.versionId, warrantyEndsOn: warrantyUntil() });
    const later = await visitToday(ctx, tech, newer, 'on_site');
    const charged = (await previewLines(later, [{ source: 'task', taskId, quantity: 1 }], newer.equipmentId)).find((l) => l.kind === 'labor')!;
    expect(charged.rules).not.toContain('warranty_labor');
    expect(charged.reason).toMatch(/^Labor to fit a part under the manufacturer's warranty is charged\./);
  });

  it('the same choices price a work invoice, line by line', async () => {
    const home = await newHome(ctx, { planVersionId: plan.versionId });
    const visitId = await visitToday(ctx, tech, home, 'on_site');
    const res = await post(tech.signed, '/api/work-invoices', {
      customerId: home.customerId,
      visitId,
      lines: [{ source: 'item', itemId: relayId, quantity: 2 }, labor],
      sendPayLink: false,
    });
    expect(res.status).toBe(201);
    expect(res.body.lines.map((l: { discountCents: number }) => l.discountCents)).toEqual([1200, 0]);
    expect(res.body.discountCents).toBe(1200);
  });
});
