// Restocks and transfers (never below zero; both halves of a transfer in one transaction), what a
// technician may see of stock, and the "parts to load" list on the technician's home page.
import { and, eq, inArray } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { stockLevels, stockMovements } from '../server/db/schema';
import { testApp, type TestContext } from './support/app';
import type { Signed } from './support/auth';
import { newHome, newPart, newShop, newTechnician, post, put, signInRole, visitToday, type Tech } from './support/work-fixture';

let ctx: TestContext;
let owner: Signed;
let office: Signed;
let a: Tech;
let b: Tech;
let shop: string;
let relay: string;
let fuse: string;
let labor: string;

beforeAll(async () => {
  ctx = testApp();
  owner = await signInRole(ctx, 'owner');
  office = await signInRole(ctx, 'office');
  a = await newTechnician(ctx, office, 'stock-a');
  b = await newTechnician(ctx, office, 'stock-b');
  shop = await newShop(office);
  relay = await newPart(owner, 'stk');
  fuse = await newPart(owner, 'fuse', 900);
  labor = (
    await post(owner, '/api/price-book/items', {
      sku: `LAB-STK-${Date.now()}`,
      name: 'Stock test labor',
      kind: 'labor',
      category: 'repair_labor',
      unitCents: 5000,
      costCents: 0,
      taxable: false,
    })
  ).body.id;
});
afterAll(() => ctx.close());

const qty = async (locationId: string, itemId: string) =>
  (
    await ctx.database.db
      .select({ q: stockLevels.quantity })
      .from(stockLevels)
      .where(and(eq(stockLevels.locationId, locationId), eq(stockLevels.itemId, itemId)))
  )[0]?.q ?? 0;

describe('restocks and transfers', () => {
  it('a restock adds to the location and records the movement', async () => {
    const res = await post(office, '/api/stock/restocks', {
      locationId: shop,
      lines: [
        { itemId: relay, quantity: 6 },
        { itemId: fuse, quantity: 3 },
      ],
      note: 'Supplier delivery',
    });
    expect(res.status).toBe(201);
    expect(res.body.map((r: { quantity: number }) => r.quantity).sort()).toEqual([3, 6]);
    expect(await qty(shop, relay)).toBe(6);
    const moves = await ctx.database.db
      .select()
      .from(stockMovements)
      .where(and(eq(stockMovements.locationId, shop), eq(stockMovements.itemId, relay)));
    expect(moves).toMatchObject([{ kind: 'restock', quantity: 6, note: 'Supplier delivery' }]);
  });

  it('refuses a restock that would take a location past the most it holds, and keeps nothing of it', async () => {
    const first = await post(office, '/api/stock/restocks', { locationId: shop, lines: [{ itemId: fuse, quantity: 9000 }] });
    expect(first.status).toBe(201);
    const had = await qty(shop, fuse);
    const relayBefore = await qty(shop, relay);
    const over = await post(office, '/api/stock/restocks', {
      locationId: shop,
      lines: [
        { itemId: relay, quantity: 2 },
        { itemId: fuse, quantity: 9999 },
      ],
    });
    expect(over.status).toBe(422);
    expect(over.body.error.fields['lines.1.quantity']).toMatch(/at most 9,999 of one part/);
    expect(await qty(shop, fuse)).toBe(had);
    expect(await qty(shop, relay), 'the first line of the refused restock is not kept').toBe(relayBefore);
    // The same ceiling holds for a transfer into a location.
    const moved = await post(office, '/api/stock/transfers', { fromLocationId: a.truckId, toLocationId: shop, lines: [{ itemId: fuse, quantity: 9999 }] });
    expect(moved.status).toBeGreaterThanOrEqual(400);
    expect(moved.status).toBeLessThan(500);
    expect(await qty(shop, fuse)).toBe(had);
  });

  it('refuses labor, nothing, and the technician', async () => {
    const notPart = await post(office, '/api/stock/restocks', { locationId: shop, lines: [{ itemId: labor, quantity: 1 }] });
    expect(notPart.status).toBe(422);
    expect(notPart.body.error.fields['lines.0.itemId']).toBe('Only parts are stocked.');
    expect((await post(office, '/api/stock/restocks', { locationId: shop, lines: [{ itemId: relay, quantity: 0 }] })).status).toBe(422);
    expect((await post(a.signed, '/api/stock/restocks', { locationId: a.truckId, lines: [{ itemId: relay, quantity: 5 }] })).status).toBe(403);
    expect((await post(a.signed, '/api/stock/transfers', { fromLocationId: shop, toLocationId: a.truckId, lines: [{ itemId: relay, quantity: 1 }] })).status).toBe(403);
    expect(await qty(a.truckId, relay)).toBe(0);
  });

  it('moves parts from the shop to a truck and between trucks, both halves under one transfer', async () => {
    const res = await post(office, '/api/stock/transfers', { fromLocationId: shop, toLocationId: a.truckId, lines: [{ itemId: relay, quantity: 4 }] });
    expect(res.status).toBe(201);
    expect(await qty(shop, relay)).toBe(2);
    expect(await qty(a.truckId, relay)).toBe(4);
    const between = await post(office, '/api/stock/transfers', { fromLocationId: a.truckId, toLocationId: b.truckId, lines: [{ itemId: relay, quantity: 1 }] });
    expect(between.status).toBe(201);
    expect([await qty(a.truckId, relay), await qty(b.truckId, relay)]).toEqual([3, 1]);
    const halves = await ctx.database.db
      .select()
      .from(stockMovements)
      .where(and(eq(stockMovements.itemId, relay), inArray(stockMovements.kind, ['transfer_out', 'transfer_in']), inArray(stockMovements.locationId, [a.truckId, b.truckId])));
    const last = halves.filter((m) => m.transferId === halves.find((x) => x.locationId === b.truckId)!.transferId);
    expect(last.map((m) => [m.kind, m.quantity]).sort()).toEqual([
      ['transfer_in', 1],
      ['transfer_out', -1],
    ]);
  });

  it('a transfer short on any line moves nothing at all, and no count goes below zero', async () => {
    const before = { shopRelay: await qty(shop, relay), shopFuse: await qty(shop, fuse), truckRelay: await qty(a.truckId, relay), truckFuse: await qty(a.truckId, fuse) };
    const res = await post(office, '/api/stock/transfers', {
      fromLocationId: shop,
      toLocationId: a.truckId,
      lines: [
        { itemId: fuse, quantity: 2 },
        { itemId: relay, quantity: before.shopRelay + 1 },
      ],
    });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('out_of_stock');
    expect(res.body.error.message).toMatch(new RegExp(`has ${before.shopRelay} of RLY-STK`));
    expect({ shopRelay: await qty(shop, relay), shopFuse: await qty(shop, fuse), truckRelay: await qty(a.truckId, relay), truckFuse: await qty(a.truckId, fuse) }).toEqual(before);
    const same = await post(office, '/api/stock/transfers', { fromLocationId: shop, toLocationId: shop, lines: [{ itemId: relay, quantity: 1 }] });
    expect(same.status).toBe(422);
    expect(same.body.error.fields.toLocationId).toBe('Choose two different places.');
  });

  it('a technician sees only their own truck', async () => {
    expect((await a.signed.agent.get('/api/stock/locations')).body.map((l: { id: string }) => l.id)).toEqual([a.truckId]);
    const rows = (await a.signed.agent.get('/api/stock/levels').expect(200)).body as { locationId: string }[];
    expect(new Set(rows.map((r) => r.locationId))).toEqual(new Set([a.truckId]));
    expect((await a.signed.agent.get(`/api/stock/levels?locationId=${b.truckId}`)).status).toBe(404);
    expect((await a.signed.agent.get(`/api/stock/movements?locationId=${shop}`)).status).toBe(404);
    expect((await a.signed.agent.get('/api/stock/movements')).body.every((m: { locationId: string }) => m.locationId === a.truckId)).toBe(true);
    expect((await put(a.signed, `/api/stock/levels/${a.truckId}`, { itemId: relay, minimum: 1, quantity: 99 })).status).toBe(403);
  });
});

describe('parts to load', () => {
  it("lists what today's approved repairs need beyond the truck, with where the rest is", async () => {
    // Truck A: 3 relays (from the transfers above), 0 fuses; the shop holds some of each; truck B one relay.
    await put(office, `/api/stock/levels/${shop}`, { itemId: fuse, minimum: 0, quantity: 3 });
    const home = await newHome(ctx);
    const visitId = await visitToday(ctx, a, home, 'scheduled');
    const done = await visitToday(ctx, a, home, 'done');
    const quote = async (onVisit: string, lines: unknown[]) => {
      const q = await post(a.signed, '/api/quotes', { visitId: onVisit, options: [{ title: 'Fix', lines }] });
      expect(q.status).toBe(201);
      const ok = await post(a.signed, `/api/quotes/${q.body.id}/approve`, { revision: 1, optionId: q.body.options[0].id, typedName: 'Ada Fernhill', agreed: true });
      expect(ok.status).toBe(200);
    };
    // 5 relays to order (no truck named) and 2 fuses; 1 relay taken off truck A at approval.
    await quote(visitId, [
      { source: 'item', itemId: relay, quantity: 5 },
      { source: 'item', itemId: fuse, quantity: 2 },
      { source: 'item', itemId: relay, quantity: 1, stockLocationId: a.truckId },
    ]);
    // Work on a visit already done today needs nothing loaded.
    await quote(done, [{ source: 'item', itemId: fuse, quantity: 7 }]);
    expect(await qty(a.truckId, relay)).toBe(2);

    const res = await a.signed.agent.get('/api/stock/parts-to-load').expect(200);
    const bySku = new Map((res.body.parts as { itemId: string; elsewhere: { locationId: string; kind: string; quantity: number }[] }[]).map((p) => [p.itemId, p]));
    expect(bySku.get(relay)).toMatchObject({ needed: 5, onTruck: 2, short: 3, visits: [{ visitId, customerName: expect.stringContaining('Fernhill') }] });
    expect(bySku.get(relay)!.elsewhere).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ locationId: shop, kind: 'shop', quantity: 2 }),
        expect.objectContaining({ locationId: b.truckId, kind: 'truck', quantity: 1 }),
      ]),
    );
    expect(bySku.get(fuse)).toMatchObject({ needed: 2, onTruck: 0, short: 2 });
    expect(bySku.get(fuse)!.elsewhere.map((e) => e.locationId)).toContain(shop);

    // Enough on the truck: off the list.
    await post(office, '/api/stock/transfers', { fromLocationId: shop, toLocationId: a.truckId, lines: [{ itemId: fuse, quantity: 2 }] });
    const after = (await a.signed.agent.get('/api/stock/parts-to-load').expect(200)).body.parts.map((p: { itemId: string }) => p.itemId);
    expect(after).not.toContain(fuse);
    expect(after).toContain(relay);
  });

  it("is each technician's own: another technician's list is empty, the office is refused", async () => {
    expect((await b.signed.agent.get('/api/stock/parts-to-load').expect(200)).body.parts).toEqual([]);
    expect((await office.agent.get('/api/stock/parts-to-load')).status).toBe(403);
  });
});
