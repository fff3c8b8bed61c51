// The price-book CSV import over HTTP: preview with a suggested mapping, a check that names each
// row's problems, and a run that writes all rows or none.
import { randomUUID } from 'node:crypto';
import { eq, like, sql } from 'drizzle-orm';
import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { priceBookItems, priceBookItemVersions } from '../server/db/schema';
import { STAFF } from '../server/db/seed/scenario';
import { testApp, type TestContext } from './support/app';
import { CSRF_HEADER_NAME, signInStaff, type Signed } from './support/auth';

let ctx: TestContext;
let owner: Signed;
let office: Signed;
const tag = randomUUID().slice(0, 6).toUpperCase();

beforeAll(async () => {
  ctx = testApp();
  owner = await signInStaff(ctx, STAFF.find((s) => s.role === 'owner')!.email);
  office = await signInStaff(ctx, STAFF.find((s) => s.role === 'office')!.email);
});
afterAll(() => ctx.close());

// Headings as another system's export might name them; the mapping suggestion reads the aliases.
const HEAD = ['Part Number', 'Description', 'Type', 'Group', 'Sell Price', 'Our Cost', 'Taxed', 'µF', 'Volts', 'Shape'];
const capRow = (n: number, price = '24.50') => [`CAP-${tag}-${n}`, `Run capacitor ${n} µF 370 V`, 'part', 'capacitor', price, '6.10', 'yes', String(n), '370', 'round'];
const laborRow = (n: number) => [`LAB-${tag}-${n}`, `Repair labor ${n}`, 'labor', 'repair labor', '95.00', '', 'no', '', '', ''];
const csvOf = (rows: string[][], head = HEAD) => Buffer.from(Papa.unparse({ fields: head, data: rows }));

const send = (s: Signed, url: string, file: Buffer, mapping?: unknown) => {
  const req = s.agent.post(url).set(CSRF_HEADER_NAME, s.csrf);
  if (mapping !== undefined) req.field('mapping', JSON.stringify(mapping));
  return req.attach('file', file, { filename: 'price-book.csv', contentType: 'text/csv' });
};

const imported = async () =>
  (
    await ctx.database.db
      .select({ n: sql<number>`count(*)::int` })
      .from(priceBookItems)
      .where(like(priceBookItems.sku, `%-${tag}-%`))
  )[0]!.n;

let mapping: Record<string, string | null>;

describe('price-book CSV import over HTTP', () => {
  it('previews the rows and maps the columns from their headings', async () => {
    const res = await send(owner, '/api/price-book/import/preview', csvOf([capRow(5), capRow(10), laborRow(1)])).expect(200);
    expect(res.body.headers).toEqual(HEAD);
    expect(res.body.rowCount).toBe(3);
    expect(res.body.sample).toHaveLength(3);
    mapping = res.body.mapping;
    expect(mapping).toMatchObject({ sku: 'Part Number', name: 'Description', kind: 'Type', category: 'Group', unit_price: 'Sell Price', cost: 'Our Cost', taxable: 'Taxed' });
    expect(mapping['microfarads']).toBe('µF');
    expect(mapping['volts']).toBe('Volts');
    expect(mapping['shape']).toBe('Shape');
  });

  it('names each bad row and its column, and the run writes nothing from a file with problems', async () => {
    const bad = [capRow(5), [`CAP-${tag}-7`, 'Capacitor', 'part', 'capacitor', 'twelve', '', 'perhaps', '7', '370', 'round'], capRow(5), laborRow(2)];
    const check = await send(owner, '/api/price-book/import/check', csvOf(bad), mapping).expect(200);
    expect(check.body.valid).toBe(false);
    expect(check.body.counts).toBeNull();
    const at = (row: number) => check.body.problems.filter((p: { row: number }) => p.row === row);
    // Row 1 is the headings, so the second data row is row 3.
    expect(
      at(3)
        .map((p: { column: string }) => p.column)
        .sort(),
    ).toEqual(['Sell Price', 'Taxed']);
    expect(at(3).find((p: { column: string }) => p.column === 'Sell Price').message).toMatch(/dollars/);
    expect(at(4)[0]).toMatchObject({ column: 'Part Number', field: 'sku' });
    expect(at(4)[0].message).toMatch(/also on row 2/);
    expect(at(2)).toEqual([]);
    expect(at(5)).toEqual([]);

    const run = await send(owner, '/api/price-book/import/run', csvOf(bad), mapping);
    expect(run.status).toBe(422);
    expect(run.body.error.code).toBe('import_problems');
    expect(await imported()).toBe(0);
  });

  it('a mapping to a column the file lacks, or one without a required field, writes nothing', async () => {
    const missing = await send(owner, '/api/price-book/import/check', csvOf([capRow(5)]), { ...mapping, cost: 'Landed Cost' }).expect(200);
    expect(missing.body.problems[0]).toMatchObject({ row: 1, column: 'Landed Cost', field: 'cost' });
    const noPrice = await send(owner, '/api/price-book/import/run', csvOf([capRow(5)]), { ...mapping, unit_price: null });
    expect(noPrice.status).toBe(422);
    expect(noPrice.body.error.fields.unit_price).toMatch(/unit price/);
    const unknown = await send(owner, '/api/price-book/import/check', csvOf([capRow(5)]), { ...mapping, colour: 'Group' });
    expect(unknown.status).toBe(422);
    expect((await send(owner, '/api/price-book/import/check', Buffer.from(''), mapping)).status).toBe(422);
    expect(await imported()).toBe(0);
  });

  it('checks without writing, then imports all rows; a second run updates only the changed price as a new version', async () => {
    const rows = [capRow(5), capRow(10), laborRow(1)];
    const check = await send(owner, '/api/price-book/import/check', csvOf(rows), mapping).expect(200);
    expect(check.body).toMatchObject({ valid: true, rowCount: 3, problems: [], counts: { created: 3, updated: 0, unchanged: 0 } });
    expect(await imported()).toBe(0);

    const run = await send(owner, '/api/price-book/import/run', csvOf(rows), mapping).expect(201);
    expect(run.body.counts).toEqual({ created: 3, updated: 0, unchanged: 0 });
    expect(await imported()).toBe(3);
    const db = ctx.database.db;
    const [cap] = await db
      .select()
      .from(priceBookItems)
      .where(eq(priceBookItems.sku, `CAP-${tag}-5`));
    expect(cap).toMatchObject({ kind: 'part', category: 'capacitor', unitCents: 2450, costCents: 610, taxable: true, version: 1 });
    const [labor] = await db
      .select()
      .from(priceBookItems)
      .where(eq(priceBookItems.sku, `LAB-${tag}-1`));
    expect(labor).toMatchObject({ kind: 'labor', category: 'repair_labor', unitCents: 9500, taxable: false });

    const again = await send(owner, '/api/price-book/import/run', csvOf([capRow(5, '26.00'), capRow(10), laborRow(1)]), mapping).expect(201);
    expect(again.body.counts).toEqual({ created: 0, updated: 1, unchanged: 2 });
    const [after] = await db
      .select()
      .from(priceBookItems)
      .where(eq(priceBookItems.sku, `CAP-${tag}-5`));
    expect(after).toMatchObject({ unitCents: 2600, version: 2 });
    const versions = await db
      .select({ v: priceBookItemVersions.version, cents: priceBookItemVersions.unitCents })
      .from(priceBookItemVersions)
      .where(eq(priceBookItemVersions.itemId, cap!.id));
    expect(versions.sort((a, b) => a.v - b.v)).toEqual([
      { v: 1, cents: 2450 },
      { v: 2, cents: 2600 },
    ]);
  });

  it('the export reads back as the same rows', async () => {
    const res = await office.agent.get('/api/price-book/export.csv').expect(200);
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    const parsed = Papa.parse<Record<string, string>>(res.text, { header: true, skipEmptyLines: true });
    const cap = parsed.data.find((r) => r['sku'] === `CAP-${tag}-10`)!;
    expect(cap).toMatchObject({ kind: 'part', category: 'capacitor', unit_price: '24.50', microfarads: '10' });
  });

  it('only the owner imports; the office is refused and nothing is written', async () => {
    const res = await send(office, '/api/price-book/import/run', csvOf([capRow(33)]), mapping);
    expect(res.status).toBe(403);
    const [n] = await ctx.database.db
      .select({ n: sql<number>`count(*)::int` })
      .from(priceBookItems)
      .where(eq(priceBookItems.sku, `CAP-${tag}-33`));
    expect(n!.n).toBe(0);
  });
});
