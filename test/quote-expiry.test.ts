// A sent quote holds its prices through its valid-until day; then the hourly job marks it
// expired, tells the household, and no one can approve it. Also the open-quotes and approval figures.
import { eq, inArray, sql } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { quoteOptions, quoteRevisions, quotes } from '../server/db/schema';
import type { InlineJobs } from '../server/jobs/inline';
import { EXPIRE_QUOTES_JOB, expireQuotes } from '../server/quotes/expiry';
import { quoteStats } from '../server/quotes/quotes.service';
import { testApp, type TestContext } from './support/app';
import type { MemoryMailer } from './support/fakes';
import type { Signed } from './support/auth';
import { newHome, newTechnician, post, put, signInRole, visitToday, ZONE, type Home, type Tech } from './support/work-fixture';

let ctx: TestContext;
let office: Signed;
let tech: Tech;
let home: Home;
let visitId: string;

const line = { source: 'custom', description: 'Replace the inducer motor', kind: 'part', category: 'motor', quantity: 1, unitCents: 32000, taxable: true };
const today = () => DateTime.now().setZone(ZONE).toISODate()!;
const dayOffset = (days: number) => DateTime.now().setZone(ZONE).plus({ days }).toISODate()!;

beforeAll(async () => {
  ctx = testApp();
  office = await signInRole(ctx, 'office');
  tech = await newTechnician(ctx, office, 'expiry');
  home = await newHome(ctx);
  visitId = await visitToday(ctx, tech, home, 'on_site');
});
afterAll(() => ctx.close());

async function sentQuote(validUntil: string): Promise<{ id: string; optionId: string }> {
  const created = await post(tech.signed, '/api/quotes', { visitId, validDays: 14, options: [{ title: 'Replace the inducer', lines: [line] }] });
  expect(created.status).toBe(201);
  const sent = await post(tech.signed, `/api/quotes/${created.body.id}/send`, { revision: 1 });
  expect(sent.body.validUntil).toBe(dayOffset(14));
  // Time passes: the sent prices held through `validUntil`.
  await ctx.database.db.update(quotes).set({ validUntil }).where(eq(quotes.id, created.body.id));
  return { id: created.body.id, optionId: created.body.options[0].id };
}
const approve = (s: Signed, q: { id: string; optionId: string }, path = '/api/portal/quotes') =>
  post(s, `${path}/${q.id}/approve`, { revision: 1, optionId: q.optionId, typedName: 'Ada Fernhill', agreed: true });

describe('quote expiry', () => {
  it('is scheduled every hour', () => {
    expect((ctx.deps.jobs as InlineJobs).schedules.get(EXPIRE_QUOTES_JOB)).toBe('7 * * * *');
  });

  it('the quote e-mail names the last day the prices hold, in words', async () => {
    const mailer = ctx.deps.mailer as MemoryMailer;
    await sentQuote(dayOffset(14));
    const mail = mailer.sent.filter((m) => m.to === home.email && m.subject.startsWith('Your quote #')).at(-1)!;
    expect(mail.text).toMatch(/The prices hold through [A-Z][a-z]+ \d{1,2}, \d{4}\./);
    expect(mail.text).not.toMatch(/\d{4}-\d{2}-\d{2}/);
  });

  it('on its last day a quote can still be approved', async () => {
    const q = await sentQuote(today());
    const res = await approve(home.homeowner, q);
    expect(res.status).toBe(200);
    expect(res.body.status).toBe('approved');
  });

  it('the day after, approval answers 409 before the job has run, and after it', async () => {
    const q = await sentQuote(dayOffset(-1));
    const early = await approve(home.homeowner, q);
    expect(early.status).toBe(409);
    expect(early.body.error.code).toBe('quote_expired');
    expect(early.body.error.message).toMatch(/^This quote is expired: its prices held through [A-Z][a-z]+ \d{1,2}, \d{4}\. Ask us for a new quote\.$/);
    expect((await approve(tech.signed, q, '/api/quotes')).status).toBe(409);

    const mailer = ctx.deps.mailer as MemoryMailer;
    await ctx.deps.jobs.send(EXPIRE_QUOTES_JOB, {});
    const [row] = await ctx.database.db.select({ status: quotes.status }).from(quotes).where(eq(quotes.id, q.id));
    expect(row!.status).toBe('expired');
    const [rev] = await ctx.database.db.select({ status: quoteRevisions.status }).from(quoteRevisions).where(eq(quoteRevisions.quoteId, q.id));
    expect(rev!.status).toBe('expired');

    // One state word on the page and in the e-mail.
    const page = await home.homeowner.agent.get(`/api/portal/quotes/${q.id}`).expect(200);
    expect(page.body).toMatchObject({ status: 'expired', statusLabel: 'Expired' });
    const told = mailer.sent.filter((m) => m.to === home.email && m.text.includes(`/portal/quotes/${q.id}`) && m.subject.endsWith(': Expired'));
    expect(told).toHaveLength(1);
    expect(told[0]!.subject).toMatch(/^Your quote #\d+ from .+: Expired$/);

    const late = await approve(home.homeowner, q);
    expect(late.status).toBe(409);
    expect(late.body.error.code).toBe('quote_expired');
    expect((await post(home.homeowner, `/api/portal/quotes/${q.id}/decline`, { revision: 1, reason: 'Too late now' })).body.error.code).toBe('quote_expired');
    const edit = await put(tech.signed, `/api/quotes/${q.id}`, { revision: 1, options: [{ title: 'x', lines: [line] }] });
    expect(edit.status).toBe(409);
    expect(edit.body.error.code).toBe('quote_frozen');
    const list = await office.agent.get(`/api/quotes?status=expired&customerId=${home.customerId}`).expect(200);
    expect(list.body.items.map((i: { id: string }) => i.id)).toContain(q.id);

    // A second run finds nothing more to do for it and mails no one twice.
    await expireQuotes(ctx.deps);
    expect(mailer.sent.filter((m) => m.text.includes(`/portal/quotes/${q.id}`) && m.subject.endsWith(': Expired'))).toHaveLength(1);

    // A new revision starts from the expired one and can be sent again.
    const revised = await post(tech.signed, `/api/quotes/${q.id}/revise`, { revision: 1 });
    expect(revised.status).toBe(201);
    expect(revised.body.revisions.map((r: { status: string }) => r.status)).toEqual(['expired', 'draft']);
  });

  it('drafts never expire', async () => {
    const created = await post(tech.signed, '/api/quotes', { visitId, options: [{ title: 'Draft only', lines: [line] }] });
    await expireQuotes(ctx.deps);
    expect((await tech.signed.agent.get(`/api/quotes/${created.body.id}`)).body.status).toBe('draft');
  });
});

describe('quote figures', () => {
  it('approval rate over the period: approved ÷ (approved + declined + expired)', async () => {
    const ids: string[] = [];
    for (let i = 0; i < 6; i++) ids.push((await post(tech.signed, '/api/quotes', { visitId, options: [{ title: `Q${i}`, lines: [line] }] })).body.id);
    const statuses = ['approved', 'approved', 'approved', 'declined', 'expired', 'sent'] as const;
    // A day of our own, far ahead, that no other test's quotes fall in.
    const at = DateTime.now().plus({ years: 5 });
    for (const [i, id] of ids.entries())
      await ctx.database.db
        .update(quotes)
        .set({ status: statuses[i], createdAt: at.minus({ hours: 12 }).toJSDate() })
        .where(eq(quotes.id, id));
    const stats = await quoteStats({ database: ctx.database, clock: () => at.toJSDate() }, 1);
    expect(stats.periodDays).toBe(1);
    expect(stats.approvalRateBps).toBe(6000);
    // A period with nothing decided has no rate rather than 0 %.
    const empty = await quoteStats({ database: ctx.database, clock: () => at.plus({ days: 3 }).toJSDate() }, 1);
    expect(empty.approvalRateBps).toBeNull();
  });

  it('open quotes are the drafts and sent ones, valued at their dearest option', async () => {
    const res = await office.agent.get('/api/quotes/stats?periodDays=30').expect(200);
    expect(res.body.periodDays).toBe(30);
    const db = ctx.database.db;
    const open = await db
      .select({ id: quotes.id, revision: quotes.revision })
      .from(quotes)
      .where(inArray(quotes.status, ['draft', 'sent']));
    // Other test files write quotes at the same time: the figure matches a count taken beside it.
    expect(Math.abs(res.body.open.count - open.length)).toBeLessThanOrEqual(2);
    const [mine] = await db
      .select({ n: sql<number>`count(*)::int` })
      .from(quotes)
      .innerJoin(quoteRevisions, eq(quoteRevisions.quoteId, quotes.id))
      .innerJoin(quoteOptions, eq(quoteOptions.revisionId, quoteRevisions.id))
      .where(inArray(quotes.status, ['draft', 'sent']));
    expect(mine!.n).toBeGreaterThan(0);
    expect(res.body.open.valueCents).toBeGreaterThanOrEqual(32000);
    expect((await tech.signed.agent.get('/api/quotes/stats')).status).toBe(403);
    expect((await office.agent.get('/api/quotes/stats?periodDays=0')).status).toBe(422);
  });
});
