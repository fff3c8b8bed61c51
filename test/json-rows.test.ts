import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { asc, getTableName, sql, type Table } from 'drizzle-orm';
import { fromJsonRow } from '../server/db/json-rows';
import * as t from '../server/db/schema';
import { testApp, type TestContext } from './support/app';

// One statement may bring several tables as JSON (the customer page does); each row must read
// back exactly as drizzle's own select reads it: the same keys, Date instants, text dates,
// integers, booleans, arrays and jsonb.
let ctx: TestContext;
beforeAll(() => {
  ctx = testApp();
});
afterAll(async () => {
  await ctx.close();
});

const TABLES: [string, Table][] = [
  ['customers', t.customers],
  ['properties', t.properties],
  ['contacts', t.contacts],
  ['equipment', t.equipment],
  ['agreements', t.agreements],
  ['agreement_terms', t.agreementTerms],
  ['invoices', t.invoices],
  ['visits', t.visits],
  ['files', t.files],
  ['customer_notes', t.customerNotes],
  ['company', t.company],
];

class RolledBack extends Error {}

describe('rows read back from JSON', () => {
  it.each(TABLES)('%s reads as drizzle reads it', async (name, table) => {
    expect(getTableName(table)).toBe(name);
    // Inside a transaction that is rolled back: rows added so that no table is compared empty
    // touch nothing other tests see.
    await ctx.database.db
      .transaction(async (tx) => {
        const [c] = await tx.select({ id: t.customers.id }).from(t.customers).limit(1);
        await tx.insert(t.contacts).values({ customerId: c!.id, name: 'Json Rows Tester', relationship: 'neighbour', email: 'json.rows@example.test', phone: '+18165550199' });
        const [a] = await tx.select().from(t.agreements).limit(1);
        await tx
          .insert(t.agreementTerms)
          .values({ agreementId: a!.id, startsOn: '2040-01-01', endsOn: '2041-01-01', planVersionId: a!.planVersionId, priceCents: 12_345, source: 'renewal' });
        await tx.insert(t.invoices).values({
          number: 987_654_321,
          customerId: c!.id,
          purpose: 'service',
          status: 'open',
          subtotalCents: 10_000,
          discountCents: 0,
          taxCents: 825,
          totalCents: 10_825,
          issuedAt: new Date('2031-06-02T15:04:05.678Z'),
        });
        await tx.insert(t.files).values({
          storageKey: `json-rows-${Date.now()}`,
          customerId: c!.id,
          category: 'nameplate',
          contentType: 'image/jpeg',
          originalName: 'plate.jpg',
          sizeBytes: 1234,
          width: 640,
          height: 480,
        });
        await tx.insert(t.customerNotes).values({ customerId: c!.id, body: 'Side gate sticks.', audience: 'technician' });
        const id = (table as unknown as { id: Parameters<typeof asc>[0] }).id;
        const direct = await tx.select().from(table).orderBy(asc(id)).limit(25);
        const { rows } = await tx.execute<{ j: Record<string, unknown> }>(sql`select to_json(x) as j from ${table} x order by x.id limit 25`);
        expect(direct.length).toBeGreaterThan(0);
        expect(rows.map((r) => fromJsonRow(table, r.j))).toEqual(direct);
        throw new RolledBack();
      })
      .catch((err: unknown) => {
        if (!(err instanceof RolledBack)) throw err;
      });
  });
});
