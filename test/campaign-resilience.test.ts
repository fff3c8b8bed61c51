import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { reminderCampaigns } from '../server/db/schema';
import { messagesTo, outboxOf, outboxStates, startMailStack, startWorker, type MailStack } from './support/campaign-processes';
import { testApp, type TestContext } from './support/app';

const N = 2000;

describe('a campaign survives its worker being killed mid-send', () => {
  let mail: MailStack;
  let ctx: TestContext;
  beforeAll(async () => {
    mail = await startMailStack(N * 2);
    ctx = testApp();
  });
  afterAll(async () => {
    await ctx.close();
    await mail.close();
  });

  it(`${N} recipients, SIGKILL after a few hundred, restart: exactly ${N} messages, none twice`, async () => {
    const { db } = ctx.database;
    const tag = `resilience.${Date.now().toString(36)}`;
    const campaignId = await outboxOf(db, N, tag);
    const env = { DATABASE_URL: ctx.deps.config.DATABASE_URL, SMTP_URL: `smtp://127.0.0.1:${mail.smtp.port}`, MAILBOX_URL: mail.mailboxUrl, CAMPAIGN_ID: campaignId };
    const ours = () => messagesTo(mail.smtp, tag);

    const t0 = Date.now();
    const first = startWorker(env);
    const deadline = Date.now() + 120_000;
    while (ours().length < 300 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 20));
    first.child.kill('SIGKILL');
    expect((await first.done).code).toBeNull();
    const atKill = ours().length;
    console.log(`killed after ${atKill} messages, ${Date.now() - t0} ms`);
    expect(atKill).toBeGreaterThan(0);
    expect(atKill).toBeLessThan(N);

    // The dead worker's leases are taken over at once (its process is gone); rows it left in doubt are checked at the mailbox.
    const second = await startWorker({ ...env, STALE_MS: '0' }).done;
    expect(second.code, second.err).toBe(0);

    const got = ours();
    console.log(`done in ${Date.now() - t0} ms`);
    expect(got.length).toBe(N);
    expect(new Set(got.map((m) => m.headers['message-id'])).size).toBe(N);
    expect(new Set(got.map((m) => m.to[0])).size).toBe(N);
    expect(await outboxStates(db, campaignId)).toEqual({ sent: N });
    const [done] = await db.select({ status: reminderCampaigns.status }).from(reminderCampaigns).where(eq(reminderCampaigns.id, campaignId));
    expect(done!.status).toBe('done');
  }, 240_000);
});
