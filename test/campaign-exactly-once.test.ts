/**
 * Exactly once across the crash window (SMTP has accepted, the outbox row is not yet marked sent)
 * and with two worker processes sending one campaign at once, each against the real SMTP catcher.
 */
import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { acceptedBy, messagesTo, outboxOf, outboxStates, startMailStack, startWorker, type MailStack } from './support/campaign-processes';
import { testApp, type TestContext } from './support/app';

let mail: MailStack;
let ctx: TestContext;
beforeAll(async () => {
  mail = await startMailStack(5000);
  ctx = testApp();
});
afterAll(async () => {
  await ctx.close();
  await mail.close();
});

const envFor = (campaignId: string, extra: Record<string, string> = {}) => ({
  DATABASE_URL: ctx.deps.config.DATABASE_URL,
  SMTP_URL: `smtp://127.0.0.1:${mail.smtp.port}`,
  CAMPAIGN_ID: campaignId,
  ...extra,
});

/** One worker that dies right after SMTP accepts its 25th message, then a second worker. */
async function crashThenRestart(tag: string, n: number, restartEnv: Record<string, string>) {
  const campaignId = await outboxOf(ctx.database.db, n, tag);
  // One message at a time, so exactly one row is caught between SMTP's reply and the UPDATE.
  const first = await startWorker(envFor(campaignId, { CONCURRENCY: '1', BATCH: '10', CRASH_AFTER_ACCEPT: '25' })).done;
  expect(first.code, first.err).toBeNull();
  expect(messagesTo(mail.smtp, tag).length).toBe(25);
  const before = await outboxStates(ctx.database.db, campaignId);
  expect(before).toMatchObject({ sent: 24, sending: 1 });
  const second = await startWorker(envFor(campaignId, { STALE_MS: '0', ...restartEnv })).done;
  expect(second.code, second.err).toBe(0);
  const log = await ctx.database.db.execute<{ detail: string }>(
    sql`select d.detail from reminder_deliveries d join reminder_sends s on s.customer_id = d.customer_id and s.campaign_id = d.campaign_id
      where d.campaign_id = ${campaignId} and d.detail like '%interrupted%'`,
  );
  return { campaignId, got: messagesTo(mail.smtp, tag), log: log.rows.map((r) => r.detail), second };
}

describe('the crash window between SMTP accepting a message and the outbox marking it sent', () => {
  it('a restarted worker asks the mail server for the row in doubt by its Message-ID and does not send it again', async () => {
    const n = 60;
    const { campaignId, got, log } = await crashThenRestart(`once.${Date.now().toString(36)}`, n, { MAILBOX_URL: mail.mailboxUrl });
    expect(got.length).toBe(n);
    expect(new Set(got.map((m) => m.headers['message-id'])).size).toBe(n);
    expect(await outboxStates(ctx.database.db, campaignId)).toEqual({ sent: n });
    expect(log).toEqual(['Confirmed at the mail server after an interrupted send; not sent again.']);
  }, 120_000);

  it('where the mail server cannot be asked, the row in doubt is sent again under the same Message-ID, and the log says so', async () => {
    const n = 30;
    const { got, log } = await crashThenRestart(`twice.${Date.now().toString(36)}`, n, {});
    // The residual window, stated honestly: one message twice, recognisable as one by its Message-ID.
    expect(got.length).toBe(n + 1);
    expect(new Set(got.map((m) => m.headers['message-id'])).size).toBe(n);
    expect(log).toEqual(['Sent again after an interrupted send: the mail server cannot be asked, so it may arrive twice.']);
  }, 120_000);
});

describe('two worker processes sending one campaign at once', () => {
  it('every recipient gets exactly one message, and both workers share the work', async () => {
    const n = 1500;
    const tag = `pair.${Date.now().toString(36)}`;
    const campaignId = await outboxOf(ctx.database.db, n, tag);
    // Small batches and leases that go stale after 300 ms: the workers keep taking over each other's
    // leased rows, so only the lease check before each send keeps a message from going twice.
    const env = envFor(campaignId, { MAILBOX_URL: mail.mailboxUrl, BATCH: '20', STALE_MS: '300', DOUBT_MS: '120000' });
    const [a, b] = await Promise.all([startWorker(env).done, startWorker(env).done]);
    expect(a.code, a.err).toBe(0);
    expect(b.code, b.err).toBe(0);
    const got = messagesTo(mail.smtp, tag);
    console.log(`two workers: ${acceptedBy(a.out)} + ${acceptedBy(b.out)} messages`);
    expect(got.length).toBe(n);
    expect(new Set(got.map((m) => m.to[0])).size).toBe(n);
    expect(new Set(got.map((m) => m.headers['message-id'])).size).toBe(n);
    expect(acceptedBy(a.out) + acceptedBy(b.out)).toBe(n);
    expect(acceptedBy(a.out)).toBeGreaterThan(0);
    expect(acceptedBy(b.out)).toBeGreaterThan(0);
    expect(await outboxStates(ctx.database.db, campaignId)).toEqual({ sent: n });
  }, 240_000);
});
