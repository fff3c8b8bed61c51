import { randomUUID } from 'node:crypto';
import { and, eq, sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { MailDeliveryError, type Mailer, type OutgoingMail } from '../server/integrations/mail';
import { sendCampaign } from '../server/campaigns/campaigns.service';
import { campaignRecipients } from '../server/campaigns/delivery-log';
import { DEFAULT_TUNING } from '../server/campaigns/campaign-send';
import { customers, equipment, filterChanges, properties, reminderCampaigns, reminderDeliveries, reminderSends, users } from '../server/db/schema';
import { testApp, type TestContext } from './support/app';
import { CSRF_HEADER_NAME, signInHomeowner, signInStaff } from './support/auth';

const OFFICE = 'teo.marchetti@bluestem-comfort.test';
const DANA = 'dana.whitfield@example.test';

/** Accepts every message, except a 550 for "refuse" addresses and one 421 for "flaky" ones. */
function scriptedMailer(): Mailer & { sent: OutgoingMail[] } {
  const sent: OutgoingMail[] = [];
  const flaked = new Set<string>();
  return {
    sent,
    async send(m) {
      const to = String(m.to);
      if (to.startsWith('refuse.')) throw new MailDeliveryError('550 mailbox unavailable', 550);
      if (to.startsWith('flaky.') && !flaked.has(to)) {
        flaked.add(to);
        throw new MailDeliveryError('421 try again later', 421);
      }
      sent.push(m);
      return { messageId: `<${randomUUID()}@test>`, response: `250 2.0.0 Ok: queued as ${sent.length}` };
    },
    async verify() {},
    close() {},
  };
}

describe('campaigns: audience, schedule, pause, failures and the homeowner side', () => {
  let ctx: TestContext;
  let mailer: ReturnType<typeof scriptedMailer>;
  beforeAll(() => {
    mailer = scriptedMailer();
    ctx = testApp({ mailer });
  });
  afterAll(() => ctx.close());

  /** A household with one furnace and filter; `changedDaysAgo` its last "I changed it". */
  async function household(opts: { zip: string; filterSize: string; changedDaysAgo: number; factors?: string[]; prefix?: string }) {
    const { db } = ctx.database;
    const tag = randomUUID().slice(0, 8);
    const [c] = await db
      .insert(customers)
      .values({ name: `Audience ${tag}`, email: `${opts.prefix ?? 'aud'}.${tag}@example.test` })
      .returning({ id: customers.id });
    const [p] = await db
      .insert(properties)
      .values({ customerId: c!.id, street: '4 Sumac Way', city: 'Larkspur Bend', state: 'MO', zip: opts.zip })
      .returning({ id: properties.id });
    const [e] = await db.insert(equipment).values({ propertyId: p!.id, kind: 'gas_furnace', filterSize: opts.filterSize }).returning({ id: equipment.id });
    const changedOn = new Date(Date.now() - opts.changedDaysAgo * 86_400_000).toISOString().slice(0, 10);
    await db.insert(filterChanges).values({ equipmentId: e!.id, customerId: c!.id, changedOn });
    if (opts.factors) await db.execute(sql`insert into household_reminder_settings (customer_id, factors) values (${c!.id}, ${`{${opts.factors.join(',')}}`}::text[])`);
    return { customerId: c!.id, propertyId: p!.id, equipmentId: e!.id };
  }

  it('the audience statement applies filter type and household factors, and narrows by area', async () => {
    const zip = String(10000 + Math.floor(Math.random() * 80000));
    // 1-inch pleated, changed 50 days ago: 90 days plain (not due within 14), 60 with pets (due in 10).
    const plain = await household({ zip, filterSize: '16x25x1', changedDaysAgo: 50 });
    const pets = await household({ zip, filterSize: '16x25x1', changedDaysAgo: 50, factors: ['pets'] });
    // 4-inch media changed 170 days ago: 180-day interval, due in 10.
    const media = await household({ zip, filterSize: '20x25x4', changedDaysAgo: 170 });
    const office = await signInStaff(ctx, OFFICE);
    const res = await office.agent.get(`/api/reminders/preview?kind=filter&area=${zip}`);
    expect(res.status).toBe(200);
    const ids = res.body.audience.map((r: { customerId: string }) => r.customerId);
    expect(ids).toContain(pets.customerId);
    expect(ids).toContain(media.customerId);
    expect(ids).not.toContain(plain.customerId);
    expect(res.body.count).toBe(2);
    const bad = await office.agent.get('/api/reminders/preview?kind=filter&equipmentKind=boiler');
    expect(bad.status).toBe(422);
    expect(bad.body.error.fields.equipmentKind).toBeTruthy();

    const msgs = await office.agent.get(`/api/reminders/preview/messages?kind=filter&area=${zip}`);
    expect(msgs.body.messages).toHaveLength(2);
    expect(msgs.body.messages[0].html).toContain('<a href=');
    expect(msgs.body.messages[0].text).toMatch(/unsubscribe from reminders: https?:\/\/\S+\/api\/unsubscribe\?token=/);
  });

  it('a scheduled campaign waits; pause, resume and cancel move it; a wrong move is refused', async () => {
    const office = await signInStaff(ctx, OFFICE);
    const post = (body: object) => office.agent.post('/api/reminders/campaigns').set(CSRF_HEADER_NAME, office.csrf).send(body);
    const past = await post({ kind: 'heating_tune_up', expectedCount: 1, sendAt: '2020-01-01T08:00' });
    expect(past.status).toBe(422);
    expect(past.body.error.fields.sendAt).toMatch(/future/);
    // No schedule beyond the horizon, and none that is not a real time.
    for (const sendAt of ['9999-12-31T23:00', '9999-12-31T23:00:00Z', '2026-02-30T08:00', '2026-09-01T24:30']) {
      const far = await post({ kind: 'heating_tune_up', expectedCount: 0, sendAt });
      expect(far.status, sendAt).toBe(422);
      expect(far.body.error.fields.sendAt, sendAt).toBeTruthy();
    }
    const tooFar = await post({ kind: 'heating_tune_up', expectedCount: 0, sendAt: `${new Date().getUTCFullYear() + 2}-01-15T08:00` });
    expect(tooFar.status).toBe(422);
    expect(tooFar.body.error.fields.sendAt).toMatch(/12 months/);
    // The next 1 September, always within the horizon.
    const thisYear = new Date().getUTCFullYear();
    const year = Date.now() < Date.UTC(thisYear, 8, 1, 13) ? thisYear : thisYear + 1;
    const c = await post({ kind: 'heating_tune_up', audience: { plan: 'any' }, expectedCount: 0, sendAt: `${year}-09-01T08:00` });
    expect(c.status).toBe(201);
    expect(c.body).toMatchObject({ status: 'scheduled', pending: 0 });
    // 08:00 in Larkspur Bend (America/Chicago, daylight time in September) is 13:00 UTC.
    expect(c.body.scheduledAt).toBe(`${year}-09-01T13:00:00.000Z`);
    const act = (action: string) => office.agent.post(`/api/reminders/campaigns/${c.body.id}/actions`).set(CSRF_HEADER_NAME, office.csrf).send({ action });
    expect((await act('resume')).status).toBe(409);
    expect((await act('pause')).body.status).toBe('paused');
    expect((await act('resume')).body.status).toBe('scheduled');
    expect((await act('cancel')).body.status).toBe('cancelled');
    expect((await act('explode')).status).toBe(422);
  });

  it('a 5xx is recorded as a permanent failure and not retried; a 4xx is retried and then sent', async () => {
    const { db } = ctx.database;
    const [u] = await db.select({ id: users.id }).from(users).where(eq(users.email, OFFICE));
    const refuse = await household({ zip: '64790', filterSize: '16x25x1', changedDaysAgo: 1, prefix: 'refuse' });
    const flaky = await household({ zip: '64790', filterSize: '16x25x1', changedDaysAgo: 1, prefix: 'flaky' });
    const [camp] = await db.insert(reminderCampaigns).values({ kind: 'filter', createdById: u!.id, audienceCount: 2, status: 'sending' }).returning({ id: reminderCampaigns.id });
    for (const h of [refuse, flaky]) {
      const [c] = await db.select({ email: customers.email }).from(customers).where(eq(customers.id, h.customerId));
      await db.insert(reminderSends).values({ campaignId: camp!.id, customerId: h.customerId, propertyId: h.propertyId, kind: 'filter', email: c!.email!, reason: 'due' });
    }
    await sendCampaign(ctx.deps, camp!.id, { ...DEFAULT_TUNING, retryBaseMs: 20 });
    const rows = await db.select().from(reminderSends).where(eq(reminderSends.campaignId, camp!.id));
    const byCustomer = new Map(rows.map((r) => [r.customerId, r]));
    expect(byCustomer.get(refuse.customerId)).toMatchObject({ status: 'failed', attempts: 1 });
    expect(byCustomer.get(flaky.customerId)).toMatchObject({ status: 'sent', attempts: 2 });
    const log = await db.select().from(reminderDeliveries).where(eq(reminderDeliveries.campaignId, camp!.id));
    expect(log.find((l) => l.customerId === refuse.customerId)).toMatchObject({ event: 'failed', permanent: true });
    expect(
      log
        .filter((l) => l.customerId === flaky.customerId)
        .map((l) => l.event)
        .sort(),
    ).toEqual(['retry', 'sent']);
    const office = await signInStaff(ctx, OFFICE);
    const summary = await office.agent.get(`/api/reminders/campaigns/${camp!.id}`);
    expect(summary.body).toMatchObject({ status: 'done', sent: 1, failed: 1, pending: 0 });
    const deliveries = await office.agent.get(`/api/reminders/campaigns/${camp!.id}/deliveries?customerId=${refuse.customerId}`);
    expect(deliveries.body.deliveries[0]).toMatchObject({ event: 'failed', permanent: true, detail: expect.stringContaining('550') });
  });

  it('the delivery log lists each household with the server reply, per campaign and per household, in keyset pages', async () => {
    const { db } = ctx.database;
    const [u] = await db.select({ id: users.id }).from(users).where(eq(users.email, OFFICE));
    const homes = [
      ...(await Promise.all([1, 2, 3].map(() => household({ zip: '64790', filterSize: '16x25x1', changedDaysAgo: 1, prefix: 'log' })))),
      await household({ zip: '64790', filterSize: '16x25x1', changedDaysAgo: 1, prefix: 'refuse' }),
      await household({ zip: '64790', filterSize: '16x25x1', changedDaysAgo: 1, prefix: 'gone' }),
    ];
    const [camp] = await db.insert(reminderCampaigns).values({ kind: 'filter', createdById: u!.id, audienceCount: 5, status: 'sending' }).returning({ id: reminderCampaigns.id });
    for (const h of homes) {
      const [c] = await db.select({ email: customers.email }).from(customers).where(eq(customers.id, h.customerId));
      await db.insert(reminderSends).values({ campaignId: camp!.id, customerId: h.customerId, propertyId: h.propertyId, kind: 'filter', email: c!.email!, reason: 'due' });
      if (c!.email!.startsWith('gone.'))
        await db.execute(sql`insert into mail_suppressions (email, purpose, customer_id, source) values (${c!.email}, 'reminders', ${h.customerId}, 'test')`);
    }
    const office = await signInStaff(ctx, OFFICE);
    // Before sending: everyone queued.
    const queued = await office.agent.get(`/api/reminders/campaigns/${camp!.id}/recipients`);
    expect(queued.body.items.map((r: { status: string }) => r.status)).toEqual(['pending', 'pending', 'pending', 'pending', 'pending']);
    await sendCampaign(ctx.deps, camp!.id, { ...DEFAULT_TUNING, retryBaseMs: 20 });

    const all = await office.agent.get(`/api/reminders/campaigns/${camp!.id}/recipients`);
    expect(all.status).toBe(200);
    expect(all.body.next).toBeNull();
    const byStatus = (s: string) => all.body.items.filter((r: { status: string }) => r.status === s);
    expect(byStatus('sent')).toHaveLength(3);
    expect(byStatus('sent')[0].reply).toMatch(/^250 /);
    expect(byStatus('failed')).toEqual([expect.objectContaining({ reply: expect.stringContaining('550'), attempts: 1 })]);
    expect(byStatus('suppressed')).toEqual([expect.objectContaining({ reply: 'Unsubscribed: not sent.', sentAt: null })]);
    const failed = await office.agent.get(`/api/reminders/campaigns/${camp!.id}/recipients?status=failed`);
    expect(failed.body.items).toHaveLength(1);

    // Pages of two, following the cursor: every household once, in name order.
    const seen: string[] = [];
    let after: string | undefined;
    do {
      const page = await campaignRecipients(ctx.deps, camp!.id, after ? { after } : {}, 2);
      expect(page.items.length).toBeLessThanOrEqual(2);
      seen.push(...page.items.map((r) => r.name));
      after = page.next ?? undefined;
    } while (after);
    expect(seen).toHaveLength(5);
    expect(seen).toEqual([...seen].sort());
    expect((await office.agent.get(`/api/reminders/campaigns/${camp!.id}/recipients?after=bm90LWEtY3Vyc29y`)).status).toBe(422);

    const mine = await office.agent.get(`/api/reminders/households/${homes[3]!.customerId}/sends`);
    expect(mine.body.items).toEqual([expect.objectContaining({ campaignId: camp!.id, label: 'Filter change', status: 'failed', reply: expect.stringContaining('550') })]);
    const homeowner = await signInHomeowner(ctx, DANA);
    expect((await homeowner.agent.get(`/api/reminders/households/${homes[3]!.customerId}/sends`)).status).toBe(403);
  });

  it('the homeowner sees what is due, marks a filter changed, and turns a reminder off', async () => {
    const home = await signInHomeowner(ctx, DANA);
    const due = await home.agent.get('/api/my-reminders');
    expect(due.status).toBe(200);
    expect(Array.isArray(due.body.items)).toBe(true);
    for (const i of due.body.items) expect(i.label).toBeTruthy();
    const [me] = await ctx.database.db.select({ id: customers.id }).from(customers).where(eq(customers.email, DANA));
    const [mine] = await ctx.database.db
      .select({ id: equipment.id })
      .from(equipment)
      .innerJoin(properties, eq(properties.id, equipment.propertyId))
      .where(eq(properties.customerId, me!.id))
      .limit(1);
    const stranger = await household({ zip: '64790', filterSize: '16x25x1', changedDaysAgo: 1 });
    expect((await home.agent.post('/api/my-reminders/filter-changed').set(CSRF_HEADER_NAME, home.csrf).send({ equipmentId: stranger.equipmentId })).status).toBe(404);
    expect((await home.agent.post('/api/my-reminders/filter-changed').set(CSRF_HEADER_NAME, home.csrf).send({ equipmentId: 'nope' })).status).toBe(422);
    const changed = await home.agent.post('/api/my-reminders/filter-changed').set(CSRF_HEADER_NAME, home.csrf).send({ equipmentId: mine!.id });
    expect(changed.status).toBe(200);
    expect(changed.body.items.find((i: { kind: string; equipmentId?: string }) => i.kind === 'filter' && i.equipmentId === mine!.id)).toBeUndefined();
    const [row] = await ctx.database.db
      .select()
      .from(filterChanges)
      .where(and(eq(filterChanges.equipmentId, mine!.id), eq(filterChanges.customerId, me!.id)));
    expect(row).toBeTruthy();

    const bad = await home.agent
      .put('/api/my-reminders/preferences')
      .set(CSRF_HEADER_NAME, home.csrf)
      .send({ factors: ['goats'], emailOff: [] });
    expect(bad.status).toBe(422);
    const saved = await home.agent
      .put('/api/my-reminders/preferences')
      .set(CSRF_HEADER_NAME, home.csrf)
      .send({ factors: ['pets'], emailOff: ['cooling_tune_up'] });
    expect(saved.body).toEqual({ factors: ['pets'], emailOff: ['cooling_tune_up'] });
    const office = await signInStaff(ctx, OFFICE);
    const preview = await office.agent.get('/api/reminders/preview?kind=cooling_tune_up');
    expect(preview.body.audience.find((r: { email: string }) => r.email === DANA)).toBeUndefined();
    await home.agent.put('/api/my-reminders/preferences').set(CSRF_HEADER_NAME, home.csrf).send({ factors: [], emailOff: [] });
  });
});
