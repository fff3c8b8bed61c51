import { spawn, type ChildProcess } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { eq, sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { MailStore, startSmtpCatcher, type SmtpCatcher } from '../server/fakes/mail';
import { reminderCampaigns, users } from '../server/db/schema';
import { testApp, type TestContext } from './support/app';

const ROOT = fileURLToPath(new URL('..', import.meta.url));
const N = 2000;

function worker(env: Record<string, string>): ChildProcess {
  return spawn(process.execPath, ['--import', 'tsx', 'test/support/campaign-worker.ts'], { cwd: ROOT, env: { ...process.env, ...env }, stdio: ['ignore', 'pipe', 'pipe'] });
}
const exited = (c: ChildProcess) => new Promise<number | null>((r) => c.once('exit', (code) => r(code)));

describe('a campaign survives its worker being killed mid-send', () => {
  let smtp: SmtpCatcher;
  let ctx: TestContext;
  beforeAll(async () => {
    smtp = await startSmtpCatcher({ port: 0, store: new MailStore({ capacity: N * 2 }) });
    ctx = testApp();
  });
  afterAll(async () => {
    await ctx.close();
    await smtp.close();
  });

  it(`${N} recipients, SIGKILL after a few hundred, restart: exactly ${N} messages, none twice`, async () => {
    const { db } = ctx.database;
    const tag = Date.now().toString(36);
    const [office] = await db.select({ id: users.id }).from(users).where(eq(users.email, 'teo.marchetti@bluestem-comfort.test'));
    const [camp] = await db
      .insert(reminderCampaigns)
      .values({ kind: 'filter', createdById: office!.id, audienceCount: N, status: 'sending', startedAt: new Date() })
      .returning({ id: reminderCampaigns.id });
    // Households and the outbox in two set-based statements.
    await db.execute(sql`insert into customers (name, email) select 'Resilience ' || g, 'resilience.' || ${tag} || '.' || g || '@example.test' from generate_series(1, ${N}) g`);
    await db.execute(sql`insert into reminder_sends (campaign_id, customer_id, kind, email, reason)
      select ${camp!.id}::uuid, c.id, 'filter', c.email, 'due' from customers c where c.email like ${`resilience.${tag}.%`}`);
    const env = { DATABASE_URL: ctx.deps.config.DATABASE_URL, SMTP_URL: `smtp://127.0.0.1:${smtp.port}`, CAMPAIGN_ID: camp!.id };
    const ours = () => smtp.store.list().filter((m) => m.to.some((t) => t.includes(`resilience.${tag}.`)));

    const t0 = Date.now();
    const first = worker(env);
    const firstExit = exited(first);
    const deadline = Date.now() + 120_000;
    while (ours().length < 300 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 20));
    first.kill('SIGKILL');
    expect(await firstExit).toBeNull();
    const atKill = ours().length;
    console.log(`killed after ${atKill} messages, ${Date.now() - t0} ms`);
    expect(atKill).toBeGreaterThan(0);
    expect(atKill).toBeLessThan(N);

    // The dead worker's claims are taken over at once (its process is gone).
    const second = worker({ ...env, STALE_MS: '0' });
    let err = '';
    second.stderr!.on('data', (d) => (err += String(d)));
    expect(await exited(second), err).toBe(0);

    const got = ours();
    console.log(`done in ${Date.now() - t0} ms`);
    const ids = new Set(got.map((m) => m.headers['message-id']));
    const recipients = new Set(got.map((m) => m.to[0]));
    expect(got.length).toBe(N);
    expect(ids.size).toBe(N);
    expect(recipients.size).toBe(N);
    const states = await db.execute<{ status: string; n: number }>(sql`select status, count(*)::int as n from reminder_sends where campaign_id = ${camp!.id} group by status`);
    expect(states.rows).toEqual([{ status: 'sent', n: N }]);
    const [done] = await db.select({ status: reminderCampaigns.status }).from(reminderCampaigns).where(eq(reminderCampaigns.id, camp!.id));
    expect(done!.status).toBe('done');
  }, 240_000);
});
