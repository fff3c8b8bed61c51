import { sql } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_HOMEOWNERS } from '../server/db/seed/scenario';
import { testApp, type TestContext } from './support/app';
import { signInHomeowner, type Signed } from './support/auth';

// Two apps on separate pools stand for two API processes sharing one database.
let a: TestContext;
let b: TestContext;
let home: Signed;
let propertyId: string;
const from = DateTime.now().setZone('America/Chicago').plus({ days: 150 }).toISODate()!;

const version = async (ctx: TestContext) => Number((await ctx.database.pool.query('select version from schedule_version')).rows[0].version);
const windows = async () =>
  (await home.agent.get(`/api/booking/windows?propertyId=${propertyId}&reason=no_cooling&from=${from}&days=7`).expect(200)).body as {
    windows: { start: string; capacity: number }[];
  };

beforeAll(async () => {
  a = testApp();
  b = testApp();
  home = await signInHomeowner(a, DEMO_HOMEOWNERS[0].email);
  const { rows } = await a.database.pool.query(`select p.id from properties p join users u on u.customer_id = p.customer_id where u.email = $1 order by p.id limit 1`, [
    DEMO_HOMEOWNERS[0].email,
  ]);
  propertyId = rows[0].id;
});

afterAll(async () => {
  await a.close();
  await b.close();
});

describe('the schedule snapshot behind booking windows', () => {
  it('is bumped inside the writing transaction, and not by one that rolls back', async () => {
    const before = await version(a);
    await b.database.db
      .transaction(async (tx) => {
        await tx.execute(sql`update visits set priority = priority where id = (select id from visits limit 1)`);
        const inside = Number(((await tx.execute(sql`select version from schedule_version`)).rows[0] as { version: string }).version);
        expect(inside).toBe(before + 1);
        throw new Error('roll back');
      })
      .catch(() => undefined);
    expect(await version(a)).toBe(before);
  });

  it('answers from the snapshot, and sees another process give every technician the week off', async () => {
    const first = await windows();
    expect(first.windows.length).toBeGreaterThan(0);
    // A week far ahead, which no other test books, so files running beside this one are not disturbed.
    const off = await b.database.pool.query(
      `insert into technician_time_off (technician_id, starts_at, ends_at, reason)
       select id, ($1::date - 2)::timestamptz, ($1::date + 10)::timestamptz, 'schedule snapshot test' from technicians returning id`,
      [from],
    );
    try {
      expect((await windows()).windows).toEqual([]);
    } finally {
      await b.database.pool.query(`delete from technician_time_off where id = any($1)`, [off.rows.map((r) => r.id as string)]);
    }
    expect(await windows()).toEqual(first);
  });
});
