import { randomUUID } from 'node:crypto';
import { eq, sql } from 'drizzle-orm';
import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { customers, equipment, properties } from '../server/db/schema';
import { toCsv } from '../server/http/csv';
import { addressKey, suggestMapping } from '../server/imports/csv.service';
import { testApp, type TestContext } from './support/app';
import { signInStaff, type Signed } from './support/auth';

let ctx: TestContext;
let office: Signed;
const tag = randomUUID().slice(0, 8);
const zip = `6${String(Math.floor(Math.random() * 9000) + 1000)}`;

beforeAll(async () => {
  ctx = testApp();
  office = await signInStaff(ctx, 'teo.marchetti@bluestem-comfort.test');
});
afterAll(() => ctx.close());

// Column headings as a spreadsheet from another system might name them.
const HEAD = ['Name', 'Email', 'Phone', 'Address', 'City', 'State', 'Zip Code', 'Equipment Type', 'Brand', 'Model', 'Serial Number', 'Installed', 'Refrigerant', 'Tons', 'Filter'];
const good = (i: number) => [
  `Import ${tag} ${i}`,
  `imp${i}.${tag}@example.test`,
  `816-555-01${String(10 + i).padStart(2, '0')}`,
  `${200 + i} Prairie Smoke Way`,
  'Larkspur Bend',
  'MO',
  zip,
  'Condensing unit',
  'Corvane',
  `AC36-${i}`,
  `CV${tag}${i}`,
  '6/15/2018',
  'R-410A',
  '3',
  '16 x 25 x 1',
];

function csvOf(rows: string[][]): Buffer {
  return Buffer.from(Papa.unparse({ fields: HEAD, data: rows }));
}

const send = (url: string, file: Buffer, mapping?: unknown) => {
  const req = office.agent.post(url).set('X-XSRF-TOKEN', office.csrf);
  if (mapping !== undefined) req.field('mapping', JSON.stringify(mapping));
  return req.attach('file', file, { filename: 'households.csv', contentType: 'text/csv' });
};

async function countImported() {
  const [c] = await ctx.database.db
    .select({ n: sql<number>`count(*)::int` })
    .from(customers)
    .where(sql`${customers.name} like ${`Import ${tag}%`}`);
  const [p] = await ctx.database.db
    .select({ n: sql<number>`count(*)::int` })
    .from(properties)
    .where(eq(properties.zip, zip));
  const [e] = await ctx.database.db
    .select({ n: sql<number>`count(*)::int` })
    .from(equipment)
    .where(sql`${equipment.serial} like ${`CV${tag}%`}`);
  return { customers: c!.n, properties: p!.n, equipment: e!.n };
}

describe('CSV import', () => {
  it('previews the first rows and guesses the column mapping from the headings', async () => {
    const res = await send('/api/imports/preview', csvOf([good(1), good(2)])).expect(200);
    expect(res.body.rowCount).toBe(2);
    expect(res.body.sample[0].Name).toBe(`Import ${tag} 1`);
    expect(res.body.mapping).toMatchObject({
      customer_name: 'Name',
      customer_email: 'Email',
      street: 'Address',
      zip: 'Zip Code',
      equipment_kind: 'Equipment Type',
      make: 'Brand',
      serial: 'Serial Number',
      capacity_tons: 'Tons',
      filter_size: 'Filter',
    });
  });

  it('reports exactly the three bad rows with their column and reason, and imports nothing', async () => {
    const rows = Array.from({ length: 8 }, (_, i) => good(i));
    rows[2]![1] = 'not-an-email'; // spreadsheet row 4
    rows[4]![6] = '6479'; // row 6: ZIP
    rows[6]![7] = 'Flux capacitor'; // row 8: kind
    const file = csvOf(rows);
    const { mapping } = (await send('/api/imports/preview', file).expect(200)).body;
    const check = await send('/api/imports/check', file, mapping).expect(200);
    expect(check.body.valid).toBe(false);
    expect(check.body.problems.map((p: { row: number; column: string }) => [p.row, p.column])).toEqual([
      [4, 'Email'],
      [6, 'Zip Code'],
      [8, 'Equipment Type'],
    ]);
    expect(check.body.problems[1].message).toMatch(/5 digits/);
    const run = await send('/api/imports/run', file, mapping).expect(422);
    expect(run.body.error.code).toBe('import_invalid');
    expect(run.body.error.message).toBe('3 rows have problems; nothing was imported.');
    expect(Object.keys(run.body.error.fields)).toEqual(['row 4: Email', 'row 6: Zip Code', 'row 8: Equipment Type']);
    expect(await countImported()).toEqual({ customers: 0, properties: 0, equipment: 0 });
  });

  it('imports the corrected file completely, and a second import of it adds nothing', async () => {
    const rows = Array.from({ length: 8 }, (_, i) => good(i));
    // Row 9 is a second system at household 0's address: same household, same property.
    rows.push([
      `Import ${tag} 0`,
      `imp0.${tag}@example.test`,
      '816-555-0110',
      '200 prairie smoke way',
      'Larkspur Bend',
      'mo',
      zip,
      'Gas furnace',
      'Corvane',
      'GF80',
      `CV${tag}F`,
      '2018-06-15',
      '',
      '',
      '16x25x1',
    ]);
    const file = csvOf(rows);
    const { mapping } = (await send('/api/imports/preview', file).expect(200)).body;
    const check = await send('/api/imports/check', file, mapping).expect(200);
    expect(check.body).toMatchObject({ valid: true, counts: { customers: { created: 8 }, properties: { created: 8 }, equipment: { created: 9 } } });
    expect(await countImported()).toEqual({ customers: 0, properties: 0, equipment: 0 });

    const first = await send('/api/imports/run', file, mapping).expect(201);
    expect(first.body.counts).toEqual({ customers: { created: 8, matched: 0 }, properties: { created: 8, matched: 0 }, equipment: { created: 9, matched: 0 } });
    expect(await countImported()).toEqual({ customers: 8, properties: 8, equipment: 9 });
    const [unit] = await ctx.database.db
      .select()
      .from(equipment)
      .where(eq(equipment.serial, `CV${tag}1`));
    // 1 ton = 12,000 Btu/h (definition of the ton of refrigeration); 6/15/2018 read as a US date.
    expect(unit).toMatchObject({ kind: 'condensing_unit', capacityBtuh: 36000, installedOn: '2018-06-15', filterSize: '16x25x1', refrigerant: 'R-410A' });

    const again = await send('/api/imports/run', file, mapping).expect(201);
    expect(again.body.counts).toEqual({ customers: { created: 0, matched: 8 }, properties: { created: 0, matched: 8 }, equipment: { created: 0, matched: 9 } });
    expect(await countImported()).toEqual({ customers: 8, properties: 8, equipment: 9 });
  });

  it('matches a household on its address when the file has no e-mail', async () => {
    const rows = [[`Import ${tag} 3`, '', '816-555-0113', '203 Prairie Smoke Way.', 'Larkspur Bend', 'MO', zip, 'Thermostat', 'Corvane', 'T-9', `CV${tag}T`, '', '', '', '']];
    const file = csvOf(rows);
    const { mapping } = (await send('/api/imports/preview', file).expect(200)).body;
    const res = await send('/api/imports/run', file, mapping).expect(201);
    expect(res.body.counts).toMatchObject({ customers: { created: 0, matched: 1 }, properties: { created: 0, matched: 1 }, equipment: { created: 1 } });
  });

  it('exports the current table view in the import format, and that file imports back as all matches', async () => {
    const res = await office.agent
      .get('/api/customers/export.csv')
      .query({ q: `import ${tag}` })
      .expect(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename="households-\d{4}-\d{2}-\d{2}\.csv"$/);
    const parsed = Papa.parse<Record<string, string>>(res.text, { header: true, skipEmptyLines: true });
    expect(parsed.data).toHaveLength(10);
    // Phones start with "+", so the cell is guarded against formula injection (OWASP CSV injection).
    expect(parsed.data[0]!.customer_phone).toMatch(/^'\+1816555/);
    const mapping = suggestMapping(parsed.meta.fields!);
    const back = await send('/api/imports/run', Buffer.from(res.text), mapping);
    expect(back.status, JSON.stringify(back.body)).toBe(201);
    expect(back.body.counts).toEqual({ customers: { created: 0, matched: 8 }, properties: { created: 0, matched: 8 }, equipment: { created: 0, matched: 10 } });
  });

  it('refuses a binary file, a file without the required columns, and non-office callers', async () => {
    await send('/api/imports/preview', Buffer.from([0xff, 0xfe, 0x00, 0x00, 0x81])).expect(415);
    const res = await send('/api/imports/run', csvOf([good(1)]), { customer_name: 'Name' }).expect(422);
    expect(Object.keys(res.body.error.fields)).toEqual(expect.arrayContaining(['street', 'city', 'state', 'zip']));
    const tech = await signInStaff(ctx, 'marcus.bellweather@bluestem-comfort.test');
    await tech.agent
      .post('/api/imports/preview')
      .set('X-XSRF-TOKEN', tech.csrf)
      .attach('file', csvOf([good(1)]), 'a.csv')
      .expect(403);
  });
});

describe('CSV helpers', () => {
  it('treats USPS street suffix abbreviations as the same address', () => {
    // USPS Publication 28, Appendix C1: STREET → ST, DRIVE → DR, NORTH → N.
    expect(addressKey('12 North Kestrel Street', null, '64790-1234')).toBe(addressKey('12 n. kestrel st', null, '64790'));
    expect(addressKey('12 Kestrel Drive', null, '64790')).not.toBe(addressKey('12 Kestrel Street', null, '64790'));
  });

  it('guards cells a spreadsheet would run as a formula', () => {
    // OWASP CSV Injection: prefix cells starting with = + - @ with a single quote.
    const cells = (values: (string | number)[]) =>
      Papa.parse<string[]>(
        toCsv(
          ['cell'],
          values.map((v) => [v]),
        ).trim(),
      )
        .data.slice(1)
        .map((r) => r[0]);
    expect(cells(['=HYPERLINK("x")', '@SUM(A1)', '+1 816', '-2+3', 'Hollis household'])).toEqual([`'=HYPERLINK("x")`, `'@SUM(A1)`, `'+1 816`, `'-2+3`, 'Hollis household']);
    // A line break later in the cell does not let a formula through; a number is written as it is.
    expect(cells(['=1+1\nsecond line', -3])).toEqual([`'=1+1\nsecond line`, '-3']);
  });
});
