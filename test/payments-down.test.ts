/**
 * The fake card processor with its port closed, as when the processor cannot be reached at all:
 * every homeowner payment step answers 503 `payments_unavailable` in the one error shape, with
 * Retry-After, nothing is charged and no table gains or loses a row. Once the port opens again
 * the same invoice is paid as usual.
 */
import type { Server } from 'node:http';
import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addDays } from '../shared/renewals';
import { localDate } from '../server/company/company';
import { newHousehold, payOnHostedPage, planByCode, seedAgreement, staff, startHarness, type Harness, type Household } from './billing-harness';
import { CSRF_HEADER_NAME } from './support/auth';

let h: Harness;
let reopened: Server | null = null;
beforeAll(async () => {
  h = await startHarness({ webhooks: false });
});
afterAll(async () => {
  reopened?.closeAllConnections();
  await new Promise((r) => (reopened ? reopened.close(r) : r(null)));
  await h.close();
});

/** Row count of every table in the public schema, in one statement. */
async function rowCounts(): Promise<Record<string, number>> {
  const { db } = h.ctx.database;
  const tables = await db.execute<{ t: string }>(sql`select table_name as t from information_schema.tables where table_schema = 'public' and table_type = 'BASE TABLE' order by 1`);
  const parts = tables.rows.map((r) => sql`select ${r.t}::text as t, count(*)::int as n from ${sql.identifier(r.t)}`);
  const rows = await db.execute<{ t: string; n: number }>(sql.join(parts, sql` union all `));
  return Object.fromEntries(rows.rows.map((r) => [r.t, r.n]));
}

const post = (hh: Household, path: string, body: object = {}) => hh.homeowner.agent.post(path).set(CSRF_HEADER_NAME, hh.homeowner.csrf).send(body);

describe('the card processor unreachable (its port closed)', () => {
  it('every payment step answers 503 payments_unavailable, charges nothing and records nothing; the same invoice is paid once it is back', async () => {
    const today = localDate(new Date(), 'America/Chicago');
    const payer = await newHousehold(h, 'down-pay');
    const office = await staff(h);
    const invoice = await office.agent
      .post('/api/invoices')
      .set(CSRF_HEADER_NAME, office.csrf)
      .send({ customerId: payer.customerId, lines: [{ description: 'Labor: replace run capacitor', kind: 'labor', quantity: 1, unitCents: 9500, taxable: false }] })
      .expect(201);
    const renewer = await newHousehold(h, 'down-renew');
    const { agreement } = await seedAgreement(h, renewer, { endsOn: addDays(today, 10), status: 'renewal_due' });
    const newcomer = await newHousehold(h, 'down-enroll');
    const { plan } = await planByCode(h, 'two-season');

    const port = h.fake.port;
    await h.fake.close();
    const requestsBefore = h.fake.fake.requests().length;
    const intentsBefore = h.fake.fake.engine.paymentIntents.size;
    const before = await rowCounts();

    const answers = {
      'pay an invoice': await post(payer, `/api/invoices/${invoice.body.id}/checkout`),
      renew: await post(renewer, `/api/agreements/${agreement.id}/renew`),
      'save a card': await post(renewer, `/api/agreements/${agreement.id}/card`),
      enrol: await post(newcomer, '/api/agreements/enroll', { propertyId: newcomer.propertyId, planId: plan.id, systemsCount: 1 }),
    };
    for (const [step, res] of Object.entries(answers)) {
      expect(res.status, `${step}: ${JSON.stringify(res.body)}`).toBe(503);
      expect(res.headers['retry-after']).toBe('5');
      expect(Object.keys(res.body)).toEqual(['error']);
      expect(res.body.error).toEqual({ code: 'payments_unavailable', message: expect.stringMatching(/^Payments are unavailable right now\. Nothing was charged/) });
    }
    expect(await rowCounts(), 'no table gained or lost a row').toEqual(before);
    expect(h.fake.fake.engine.paymentIntents.size, 'nothing charged').toBe(intentsBefore);
    expect(h.fake.fake.requests().length).toBe(requestsBefore);

    // The port opens again with the processor's state as it was: the same invoice is paid.
    reopened = await new Promise<Server>((resolve) => {
      const s = h.fake.fake.app.listen(port, '127.0.0.1', () => resolve(s));
    });
    const start = await post(payer, `/api/invoices/${invoice.body.id}/checkout`).expect(200);
    expect((await payOnHostedPage(start.body.checkoutUrl, '4242424242424242')).status).toBe(303);
    const charged = [...h.fake.fake.engine.paymentIntents.values()].filter((p) => p.metadata['invoiceId'] === invoice.body.id && p.status === 'succeeded');
    expect(charged).toHaveLength(1);
  }, 60_000);
});
