// Campaign workers in processes of their own against the test database, the SMTP catcher and the
// mailbox API in front of it, and an outbox of N fresh households written in two statements.
import { spawn, type ChildProcess } from 'node:child_process';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { fileURLToPath } from 'node:url';
import { eq, sql } from 'drizzle-orm';
import { MailStore, createMailboxApp, startSmtpCatcher, type CapturedMessage, type SmtpCatcher } from '../../server/fakes/mail';
import type { Db } from '../../server/db/client';
import { reminderCampaigns, users } from '../../server/db/schema';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));

export interface Worker {
  child: ChildProcess;
  /** Exit code (null when killed), with what it wrote. */
  done: Promise<{ code: number | null; out: string; err: string }>;
}

export function startWorker(env: Record<string, string>): Worker {
  const child = spawn(process.execPath, ['--import', 'tsx', 'test/support/campaign-worker.ts'], { cwd: ROOT, env: { ...process.env, ...env }, stdio: ['ignore', 'pipe', 'pipe'] });
  let out = '';
  let err = '';
  child.stdout!.on('data', (d) => (out += String(d)));
  child.stderr!.on('data', (d) => (err += String(d)));
  return { child, done: new Promise((r) => child.once('exit', (code) => r({ code, out, err }))) };
}

/** Messages a worker reports having had accepted (its last stdout line). */
export const acceptedBy = (out: string) => (JSON.parse(out.trim().split('\n').at(-1) || '{}') as { accepted?: number }).accepted ?? 0;

export interface MailStack {
  smtp: SmtpCatcher;
  mailboxUrl: string;
  close(): Promise<void>;
}

export async function startMailStack(capacity: number): Promise<MailStack> {
  const store = new MailStore({ capacity });
  const smtp = await startSmtpCatcher({ port: 0, store });
  const server: Server = await new Promise((r) => {
    const s = createMailboxApp(store).listen(0, '127.0.0.1', () => r(s));
  });
  const mailboxUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  return { smtp, mailboxUrl, close: async () => (await new Promise((r) => server.close(r)), await smtp.close()) };
}

/** A sending campaign whose outbox holds `n` new households tagged `tag`. */
export async function outboxOf(db: Db, n: number, tag: string): Promise<string> {
  const [office] = await db.select({ id: users.id }).from(users).where(eq(users.email, 'teo.marchetti@bluestem-comfort.test'));
  const [camp] = await db
    .insert(reminderCampaigns)
    .values({ kind: 'filter', createdById: office!.id, audienceCount: n, status: 'sending', startedAt: new Date() })
    .returning({ id: reminderCampaigns.id });
  await db.execute(sql`insert into customers (name, email) select 'Outbox ' || g, ${tag} || '.' || g || '@example.test' from generate_series(1, ${n}) g`);
  await db.execute(sql`insert into reminder_sends (campaign_id, customer_id, kind, email, reason)
    select ${camp!.id}::uuid, c.id, 'filter', c.email, 'due' from customers c where c.email like ${`${tag}.%`}`);
  return camp!.id;
}

export const messagesTo = (smtp: SmtpCatcher, tag: string): CapturedMessage[] => smtp.store.list().filter((m) => m.to.some((t) => t.startsWith(`${tag}.`)));

export async function outboxStates(db: Db, campaignId: string): Promise<Record<string, number>> {
  const r = await db.execute<{ status: string; n: number }>(sql`select status, count(*)::int as n from reminder_sends where campaign_id = ${campaignId} group by status`);
  return Object.fromEntries(r.rows.map((x) => [x.status, x.n]));
}
