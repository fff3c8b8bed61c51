// Quotes from the price book with the plan's coverage, approval into an invoice, and truck stock.
import { randomUUID } from 'node:crypto';
import { and, eq, inArray, like, ne } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { equipment, files, invoices, priceBookItems, properties, quotes, stockLevels, stockLocations, technicians, users, visits, flatRateTasks } from '../server/db/schema';
import { STAFF } from '../server/db/seed/scenario';
import { DEMO_BLOWER_CAPACITOR_SKU, DEMO_BLOWER_MOTOR_SKU } from '../server/db/seed/pricebook';
import { testApp, type TestContext } from './support/app';
import { CSRF_HEADER_NAME, signInHomeowner, signInStaff, type Signed } from './support/auth';

let ctx: TestContext;
let tech: Signed;
let office: Signed;
let home: Signed;
let visitId: string;
let truckId: string;
let motorId: string;
let capId: string;
let taskId: string;
let laborId: string;

const post = (s: Signed, url: string, body: unknown) =>
  s.agent
    .post(url)
    .set(CSRF_HEADER_NAME, s.csrf)
    .send(body as object);
const put = (s: Signed, url: string, body: unknown) =>
  s.agent
    .put(url)
    .set(CSRF_HEADER_NAME, s.csrf)
    .send(body as object);

beforeAll(async () => {
  ctx = testApp();
  const db = ctx.database.db;
  const marcus = STAFF.find((s) => s.role === 'technician')!;
  tech = await signInStaff(ctx, marcus.email);
  office = await signInStaff(ctx, STAFF.find((s) => s.role === 'office')!.email);
  const [v] = await db
    .select()
    .from(visits)
    .where(and(eq(visits.reason, 'no_cooling'), like(visits.notes, 'House is warm%')));
  visitId = v!.id;
  const [tr] = await db
    .select({ id: stockLocations.id })
    .from(stockLocations)
    .innerJoin(technicians, eq(stockLocations.technicianId, technicians.id))
    .where(eq(technicians.id, v!.technicianId!));
  truckId = tr!.id;
  const item = async (sku: string) => (await db.select({ id: priceBookItems.id }).from(priceBookItems).where(eq(priceBookItems.sku, sku)))[0]!.id;
  motorId = await item(DEMO_BLOWER_MOTOR_SKU);
  capId = await item(DEMO_BLOWER_CAPACITOR_SKU);
  laborId = await item('LAB-REPAIR-CAP');
  taskId = (await db.select({ id: flatRateTasks.id }).from(flatRateTasks).where(eq(flatRateTasks.sku, 'TASK-BLOWER-050')))[0]!.id;
  const [owner] = await db
    .select({ email: users.email })
    .from(users)
    .where(and(eq(users.customerId, v!.customerId), eq(users.role, 'homeowner')));
  home = await signInHomeowner(ctx, owner!.email);
});
afterAll(() => ctx.close());

const stockOf = async (itemId: string) =>
  (
    await ctx.database.db
      .select({ q: stockLevels.quantity })
      .from(stockLevels)
      .where(and(eq(stockLevels.locationId, truckId), eq(stockLevels.itemId, itemId)))
  )[0]?.q;

describe('a quote on a no-cooling visit', () => {
  let quoteId: string;
  let optionA: string;

  it('the technician finds the matching blower motor and its capacitor on their truck', async () => {
    const res = await post(tech, '/api/stock/replacements', {
      visitId,
      failed: {
        category: 'motor',
        application: 'indoor_blower',
        horsepower: '1/2',
        volts: '115',
        phase: 1,
        rpm: 1075,
        speeds: 4,
        speedsUsed: 2,
        amps: 7.2,
        rotation: 'cw',
        rotationViewedFrom: 'shaft_end',
      },
    });
    expect(res.status).toBe(200);
    const first = res.body.fits[0];
    expect(first.candidate.sku).toBe(DEMO_BLOWER_MOTOR_SKU);
    expect(first.place).toBe('this_truck');
    expect(first.capacitor.microfarads).toBe(10);
    expect(first.capacitor.fits[0].candidate.sku).toBe(DEMO_BLOWER_CAPACITOR_SKU);
  });

  it('builds a two-option quote with coverage per line, sends it, and the homeowner approves one', async () => {
    const created = await post(tech, '/api/quotes', {
      visitId,
      note: 'The blower motor has failed.',
      options: [
        { title: 'Replace the motor and the capacitor', lines: [{ source: 'task', taskId, quantity: 1, stockLocationId: truckId }] },
        {
          title: 'Replace the capacitor only',
          lines: [
            { source: 'item', itemId: capId, quantity: 1, stockLocationId: truckId },
            { source: 'item', itemId: laborId, quantity: 1 },
          ],
        },
      ],
    });
    expect(created.status).toBe(201);
    quoteId = created.body.id;
    optionA = created.body.options[0].id;
    expect(created.body.options).toHaveLength(2);
    for (const l of created.body.options[0].lines) expect(l.reason.length).toBeGreaterThan(0);
    // Totals add up by the invoice rule: subtotal − savings + tax.
    const o = created.body.options[0];
    expect(o.totalCents).toBe(o.subtotalCents - o.savingsCents + o.taxCents);

    // The homeowner's first screen counts the quote as waiting once it is sent, and not once it is answered.
    const waiting = async () => (await home.agent.get('/api/my-home/summary').expect(200)).body.quotesWaiting as { count: number; firstId: string | null };
    const unsent = await waiting();
    expect((await post(tech, `/api/quotes/${quoteId}/send`, { revision: 1 })).body.status).toBe('sent');
    expect((await waiting()).count).toBe(unsent.count + 1);
    if (unsent.count === 0) expect((await waiting()).firstId).toBe(quoteId);
    const before = { motor: await stockOf(motorId), cap: await stockOf(capId) };
    const approved = await post(home, `/api/portal/quotes/${quoteId}/approve`, { revision: 1, optionId: optionA, typedName: 'Sam Oduya', agreed: true });
    expect(approved.status).toBe(200);
    expect(approved.body.status).toBe('approved');
    expect(approved.body.approval.onDevice).toBe('portal');
    expect((await waiting()).count).toBe(unsent.count);
    expect(approved.body.approval.ip).toBeTruthy();
    expect(await stockOf(motorId)).toBe(before.motor! - 1);
    expect(await stockOf(capId)).toBe(before.cap! - 1);

    const inv = await office.agent.get(`/api/invoices/${approved.body.invoiceId}`);
    expect(inv.status).toBe(200);
    expect(inv.body.lines).toHaveLength(o.lines.length);
    expect(inv.body.discountCents).toBe(o.savingsCents);
    expect(inv.body.totalCents).toBe(o.totalCents);
    // The invoice keeps the visit the work was done on, for the revenue report's split by visit kind.
    const [row] = await ctx.database.db.select({ visitId: invoices.visitId }).from(invoices).where(eq(invoices.id, approved.body.invoiceId));
    expect(row!.visitId).toBe(visitId);
    inv.body.lines.forEach((l: { discountCents: number; reason: string }, i: number) => {
      expect(l.discountCents).toBe(o.lines[i].savingsCents);
      expect(l.reason).toBe(o.lines[i].reason);
    });
    const restock = await office.agent.get(`/api/stock/levels?locationId=${truckId}&belowMinimum=true`);
    expect(restock.body.map((r: { sku: string }) => r.sku)).toContain(DEMO_BLOWER_MOTOR_SKU);
  });

  it("a technician's invoice for work without a quote keeps its visit; the office's invoice without a visit has none", async () => {
    const [v] = await ctx.database.db.select({ customerId: visits.customerId }).from(visits).where(eq(visits.id, visitId));
    const work = await post(tech, '/api/work-invoices', { customerId: v!.customerId, visitId, lines: [{ source: 'item', itemId: laborId, quantity: 1 }], sendPayLink: false });
    expect(work.status, JSON.stringify(work.body)).toBe(201);
    const typed = await post(office, '/api/invoices', {
      customerId: v!.customerId,
      lines: [{ description: 'Labor: reset the float switch', kind: 'labor', quantity: 1, unitCents: 9500, taxable: false }],
    });
    expect(typed.status).toBe(201);
    const rows = await ctx.database.db
      .select({ id: invoices.id, visitId: invoices.visitId })
      .from(invoices)
      .where(inArray(invoices.id, [work.body.id, typed.body.id]));
    expect(Object.fromEntries(rows.map((r) => [r.id, r.visitId]))).toEqual({ [work.body.id]: visitId, [typed.body.id]: null });
  });

  it('another household cannot see or approve the quote; its technician and the office can', async () => {
    const db = ctx.database.db;
    const [q] = await db.select({ customerId: visits.customerId }).from(visits).where(eq(visits.id, visitId));
    const others = await db.select({ email: users.email, customerId: users.customerId }).from(users).where(eq(users.role, 'homeowner'));
    const other = others.find((o) => o.customerId && o.customerId !== q!.customerId)!;
    const stranger = await signInHomeowner(ctx, other.email);
    expect((await stranger.agent.get(`/api/portal/quotes/${quoteId}`)).status).toBe(404);
    expect((await post(stranger, `/api/portal/quotes/${quoteId}/decline`, { revision: 1, reason: 'Not mine at all' })).status).toBe(404);
    expect((await stranger.agent.get('/api/portal/quotes')).body.map((x: { id: string }) => x.id)).not.toContain(quoteId);
    expect((await stranger.agent.get('/api/my-home/summary')).body.quotesWaiting.firstId).not.toBe(quoteId);
    expect((await office.agent.get(`/api/quotes/${quoteId}`)).status).toBe(200);
    const priya = await signInStaff(ctx, STAFF.filter((s) => s.role === 'technician')[1]!.email);
    expect((await priya.agent.get(`/api/quotes/${quoteId}`)).status).toBe(404);
  });

  it('an approved quote answers 409 to an edit; a new revision keeps the approved one in the history', async () => {
    const edit = await put(tech, `/api/quotes/${quoteId}`, { revision: 1, options: [{ title: 'x', lines: [{ source: 'item', itemId: laborId, quantity: 1 }] }] });
    expect(edit.status).toBe(409);
    expect(edit.body.error.code).toBe('quote_frozen');
    const revised = await post(tech, `/api/quotes/${quoteId}/revise`, { revision: 1 });
    expect(revised.status).toBe(201);
    expect(revised.body.revision).toBe(2);
    expect(revised.body.revisions.map((r: { status: string }) => r.status)).toEqual(['approved', 'draft']);
    const old = await tech.agent.get(`/api/quotes/${quoteId}?revision=1`);
    expect(old.body.status).toBe('approved');
    expect(old.body.approval.typedName).toBe('Sam Oduya');
  });
});

describe('truck stock', () => {
  it('two requests take the last capacitor at once: exactly one succeeds, the other gets 409', async () => {
    expect((await put(office, `/api/stock/levels/${truckId}`, { itemId: capId, minimum: 2, quantity: 1 })).status).toBe(200);
    const body = { lines: [{ itemId: capId, quantity: 1 }] };
    const [a, b] = await Promise.all([
      post(tech, `/api/stock/visits/${visitId}/parts-used`, body),
      post(office, `/api/stock/visits/${visitId}/parts-used`, { ...body, locationId: truckId }),
    ]);
    expect([a.status, b.status].sort()).toEqual([201, 409]);
    const loser = a.status === 409 ? a : b;
    expect(loser.body.error.code).toBe('out_of_stock');
    expect(await stockOf(capId)).toBe(0);
  });

  it('a technician sees only their own truck', async () => {
    const res = await tech.agent.get('/api/stock/locations');
    expect(res.body.map((l: { id: string }) => l.id)).toEqual([truckId]);
  });
});

describe("a quote names only the visit's own systems and photos", () => {
  const photo = async (customerId: string, propertyId: string, onVisit: string | null) => {
    const [f] = await ctx.database.db
      .insert(files)
      .values({
        customerId,
        propertyId,
        visitId: onVisit,
        storageKey: `quotes-test/${randomUUID()}.png`,
        category: 'other',
        contentType: 'image/png',
        originalName: 'p.png',
        sizeBytes: 1,
      })
      .returning({ id: files.id });
    return f!.id;
  };
  const line = (equipmentId: string | null) => ({ source: 'item', itemId: laborId, quantity: 1, equipmentId });

  it("refuses another household's system on a line and another visit's photo, naming the field, and saves nothing", async () => {
    const db = ctx.database.db;
    const [v] = await db.select().from(visits).where(eq(visits.id, visitId));
    const [own] = await db.select({ id: equipment.id }).from(equipment).where(eq(equipment.propertyId, v!.propertyId)).limit(1);
    const [foreign] = await db
      .select({ id: equipment.id })
      .from(equipment)
      .innerJoin(properties, eq(properties.id, equipment.propertyId))
      .where(ne(properties.customerId, v!.customerId))
      .limit(1);
    const [otherVisit] = await db.select().from(visits).where(ne(visits.id, visitId)).limit(1);
    expect(own && foreign && otherVisit, 'the demo has a system at this home, one elsewhere and another visit').toBeTruthy();
    const mine = await photo(v!.customerId, v!.propertyId, visitId);
    const elsewhere = await photo(otherVisit!.customerId, otherVisit!.propertyId, otherVisit!.id);
    const loose = await photo(v!.customerId, v!.propertyId, null);
    const count = async () => (await db.select({ id: quotes.id }).from(quotes).where(eq(quotes.visitId, visitId))).length;
    const before = await count();
    const body = (o: { lines?: unknown[]; photoIds?: string[] }) => ({
      visitId,
      photoIds: o.photoIds ?? [],
      options: [{ title: 'Clean the coil', lines: o.lines ?? [line(own!.id)] }],
    });

    for (const url of ['/api/quotes', '/api/quotes/preview']) {
      const sys = await post(tech, url, body({ lines: [line(own!.id), line(foreign!.id)] }));
      expect(sys.status, url).toBe(422);
      expect(Object.keys(sys.body.error.fields)).toEqual(['options.0.lines.1.equipmentId']);
      const pics = await post(tech, url, body({ photoIds: [mine, elsewhere, loose] }));
      expect(pics.status, url).toBe(422);
      expect(Object.keys(pics.body.error.fields).sort()).toEqual(['photoIds.1', 'photoIds.2']);
    }
    expect(await count()).toBe(before);

    const ok = await post(tech, '/api/quotes', body({ photoIds: [mine] }));
    expect(ok.status, JSON.stringify(ok.body)).toBe(201);
    expect(ok.body.photos.map((p: { id: string }) => p.id)).toEqual([mine]);
    const edit = (photoIds: string[], unit: string) =>
      put(tech, `/api/quotes/${ok.body.id}`, { revision: 1, photoIds, options: [{ title: 'Clean the coil', lines: [line(unit)] }] });
    const pics = await edit([elsewhere], own!.id);
    expect(pics.status).toBe(422);
    expect(pics.body.error.fields).toEqual({ 'photoIds.0': 'Choose a photo from this visit.' });
    const sys = await edit([mine], foreign!.id);
    expect(sys.status).toBe(422);
    expect(sys.body.error.fields).toEqual({ 'options.0.lines.0.equipmentId': 'Choose a system at this home.' });
    const kept = await tech.agent.get(`/api/quotes/${ok.body.id}`).expect(200);
    expect(kept.body.photos.map((p: { id: string }) => p.id)).toEqual([mine]);
  });
});
