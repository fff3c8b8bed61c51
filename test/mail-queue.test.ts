// The one path every e-mail takes: recorded in mail_sends, sent by the mail.send job, retried while
// the SMTP server is away, recorded per attempt, and never sent twice.
import { randomUUID } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sendDayBeforeReminders } from '../server/booking/day-before-notices';
import * as t from '../server/db/schema';
import { startSmtpCatcher, type SmtpCatcher } from '../server/fakes/mail';
import { MailStore } from '../server/fakes/mail/mail-store';
import { createMailer, MailDeliveryError, type Mailer, type OutgoingMail } from '../server/integrations/mail';
import { deliverMail, MAIL_MAX_ATTEMPTS, queueMail, recordMail } from '../server/mail/outbox';
import { testApp, type TestContext } from './support/app';
import { anonymous } from './support/auth';
import { startTestJobs } from './support/jobs';

const FROM = 'Bluestem Comfort <office@bluestem-comfort.test>';
let ctx: TestContext;
let queue: Awaited<ReturnType<typeof startTestJobs>>;
let catcher: SmtpCatcher | null;
let port: number;
const store = new MailStore();
let mailer: Mailer;
let now = new Date();

async function catcherUp(): Promise<void> {
  catcher = await startSmtpCatcher({ port, host: '127.0.0.1', store });
}
async function catcherDown(): Promise<void> {
  await catcher?.close();
  catcher = null;
}

async function until<T>(what: string, probe: () => Promise<T | undefined | null | false>, timeoutMs = 10_000): Promise<T> {
  const end = Date.now() + timeoutMs;
  while (Date.now() < end) {
    const v = await probe();
    if (v) return v;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`timed out waiting for ${what}`);
}

const rowsFor = (to: string) => ctx.database.db.select().from(t.mailSends).where(eq(t.mailSends.recipient, to));
const address = (what: string) => `${what}-${randomUUID().slice(0, 8)}@example.test`;

beforeAll(async () => {
  catcher = await startSmtpCatcher({ port: 0, host: '127.0.0.1', store });
  port = catcher.port;
  mailer = createMailer({ smtpUrl: `smtp://127.0.0.1:${port}`, from: FROM });
  ctx = testApp({ clock: () => now, mailer });
  queue = await startTestJobs(ctx.deps);
});

afterAll(async () => {
  await queue.stop();
  mailer.close();
  await catcherDown();
  await ctx.close();
});

describe('the mail queue', () => {
  it('retries a send the SMTP server did not take, records each attempt, and sends once when it is back', async () => {
    const to = address('retry');
    await catcherDown();
    expect(await queueMail(ctx.deps, { kind: 'test_notice', message: { to, subject: 'Queued while the server was away', text: 'Hello.' } })).toBe(true);

    const failed = await until('a recorded failure', async () => (await rowsFor(to)).find((r) => r.status === 'retrying'));
    expect(failed.attempts).toBeGreaterThanOrEqual(1);
    expect(failed.lastError).toMatch(/not accepted/);
    expect(failed.sentAt).toBeNull();

    await catcherUp();
    const sent = await until('the retried send', async () => (await rowsFor(to)).find((r) => r.status === 'sent'));
    expect(sent.attempts).toBeGreaterThanOrEqual(2);
    expect(sent.sentAt).not.toBeNull();
    expect(sent.messageId).toMatch(/^<.+@bluestem-comfort\.test>$/);
    expect(sent.kind).toBe('test_notice');
    // The body goes once it is delivered.
    expect(sent.message).toBeNull();
    expect(store.list({ to })).toHaveLength(1);
    expect(store.list({ to })[0].subject).toBe('Queued while the server was away');
  });

  it('sends a message once when its job runs again after the SMTP server accepted it', async () => {
    const to = address('twice');
    const id = await recordMail(ctx.deps, { kind: 'test_notice', message: { to, subject: 'Only once', text: 'Hello.' } });
    expect(await deliverMail(ctx.deps, id!)).toBe('sent');
    expect(await deliverMail(ctx.deps, id!)).toBe('skipped');
    expect(store.list({ to })).toHaveLength(1);
  });

  it('leaves a mail claimed by a live worker to it, and takes over a claim gone stale', async () => {
    const to = address('claimed');
    const id = await recordMail(ctx.deps, { kind: 'test_notice', message: { to, subject: 'Claimed', text: 'Hello.' } });
    await ctx.database.db
      .update(t.mailSends)
      .set({ status: 'sending', attempts: 1, claimedAt: new Date(now.getTime() - 10_000) })
      .where(eq(t.mailSends.id, id!));
    // Thrown, so the job is retried later rather than finished with the mail unsent.
    await expect(deliverMail(ctx.deps, id!)).rejects.toThrow(/another worker/);
    expect(store.list({ to })).toHaveLength(0);
    await ctx.database.db
      .update(t.mailSends)
      .set({ claimedAt: new Date(now.getTime() - 3 * 60_000) })
      .where(eq(t.mailSends.id, id!));
    expect(await deliverMail(ctx.deps, id!)).toBe('sent');
    const [row] = await rowsFor(to);
    expect(row).toMatchObject({ status: 'sent', attempts: 2 });
    expect(store.list({ to })).toHaveLength(1);
  });

  it('queues a keyed message once, however often it is asked for', async () => {
    const to = address('keyed');
    const key = `test-keyed:${randomUUID()}`;
    const mail = { kind: 'test_notice', key, message: { to, subject: 'Keyed', text: 'Hello.' } };
    expect(await queueMail(ctx.deps, mail)).toBe(true);
    expect(await queueMail(ctx.deps, mail)).toBe(false);
    await until('the keyed mail', async () => store.list({ to }).length > 0);
    await new Promise((r) => setTimeout(r, 300));
    expect(store.list({ to })).toHaveLength(1);
    expect(await rowsFor(to)).toHaveLength(1);
  });

  it('keeps attachments byte for byte', async () => {
    const to = address('attach');
    const bytes = Buffer.from([0x25, 0x50, 0x44, 0x46, 0x00, 0xff, 0x10]);
    await queueMail(ctx.deps, {
      kind: 'test_notice',
      message: { to, subject: 'Attached', text: 'See the file.', attachments: [{ filename: 'x.pdf', content: bytes, contentType: 'application/pdf' }] },
    });
    const mail = await until('the mail with its file', async () => store.latest({ to }));
    expect(Buffer.compare(mail.attachments[0].content, bytes)).toBe(0);
  });
});

describe('giving up', () => {
  const failing = (responseCode: number | undefined): Mailer & { calls: number } => {
    const m = {
      calls: 0,
      async send(_message: OutgoingMail): Promise<{ messageId: string }> {
        m.calls++;
        throw new MailDeliveryError('Mail to 1 recipient was not accepted: refused', responseCode);
      },
      async verify() {},
      close() {},
    };
    return m;
  };

  it('stops at the first permanent refusal (5xx) and records it', async () => {
    const to = address('permanent');
    const m = failing(550);
    const deps = { ...ctx.deps, mailer: m };
    const id = await recordMail(deps, { kind: 'test_notice', message: { to, subject: 'Refused', text: 'Hello.' } });
    expect(await deliverMail(deps, id!)).toBe('failed');
    expect(await deliverMail(deps, id!)).toBe('skipped');
    expect(m.calls).toBe(1);
    const [row] = await rowsFor(to);
    expect(row).toMatchObject({ status: 'failed', attempts: 1, lastError: expect.stringMatching(/refused/) });
  });

  it(`gives up after ${MAIL_MAX_ATTEMPTS} attempts at a server that keeps failing`, async () => {
    const to = address('transient');
    const m = failing(421);
    const deps = { ...ctx.deps, mailer: m };
    const id = await recordMail(deps, { kind: 'test_notice', message: { to, subject: 'Try later', text: 'Hello.' } });
    for (let i = 1; i < MAIL_MAX_ATTEMPTS; i++) await expect(deliverMail(deps, id!)).rejects.toThrow(/not accepted/);
    expect(await deliverMail(deps, id!)).toBe('failed');
    const [row] = await rowsFor(to);
    expect(row).toMatchObject({ status: 'failed', attempts: MAIL_MAX_ATTEMPTS });
  });
});

describe('sign-in links through the queue', () => {
  it('answers without waiting for SMTP; the link arrives when the server is back', async () => {
    const email = address('link');
    const [c] = await ctx.database.db.insert(t.customers).values({ name: 'Queue household', email }).returning();
    await ctx.database.db.insert(t.users).values({ email, name: 'Queue homeowner', role: 'homeowner', customerId: c.id });
    await catcherDown();

    // An address of its own (IPv6 documentation range, RFC 3849), so no other test's requests count against it.
    const { agent, csrf } = await anonymous(ctx);
    const t0 = performance.now();
    const res = await agent
      .post('/api/auth/link')
      .set('X-XSRF-TOKEN', csrf)
      .set('X-Forwarded-For', `2001:db8:${randomUUID().slice(0, 4)}::77`)
      .send({ email });
    const ms = performance.now() - t0;
    expect(res.status).toBe(202);
    // Generous for a loaded machine; an SMTP timeout is 10 s and more.
    expect(ms).toBeLessThan(2000);
    await until('the failed first attempt', async () => (await rowsFor(email)).find((r) => r.status === 'retrying'));
    expect(store.list({ to: email })).toHaveLength(0);

    await catcherUp();
    const mail = await until('the link', async () => store.latest({ to: email }));
    expect(mail.subject).toBe('Your sign-in link');
    expect(mail.links.some((l) => l.includes('/sign-in/confirm?token='))).toBe(true);
  });
});

describe('the day-before reminder', () => {
  it('is retried after a failed send, and sent once', async () => {
    const db = ctx.database.db;
    const tag = randomUUID().slice(0, 8);
    const email = `reminder-${tag}@example.test`;
    const [c] = await db
      .insert(t.customers)
      .values({ name: `Reminder household ${tag}`, email })
      .returning();
    const [p] = await db
      .insert(t.properties)
      .values({ customerId: c.id, street: `${tag} Queue Row`, city: 'Larkspur Bend', state: 'MO', zip: '64790', area: 'Riverside' })
      .returning();
    // Far from any other test's visits, so this run claims only this one.
    const start = new Date(Date.UTC(2033, 2, 9 + Math.floor(Math.random() * 300), 15));
    const [v] = await db
      .insert(t.visits)
      .values({
        customerId: c.id,
        propertyId: p.id,
        kind: 'tune_up',
        reason: 'tune_up',
        status: 'scheduled',
        windowStart: start,
        windowEnd: new Date(start.getTime() + 2 * 3_600_000),
        startsAt: start,
        endsAt: new Date(start.getTime() + 5_400_000),
      })
      .returning();
    now = new Date(start.getTime() - 20 * 3_600_000);
    try {
      await catcherDown();
      expect(await sendDayBeforeReminders(ctx.deps)).toBeGreaterThanOrEqual(1);
      const failed = await until('the failed reminder', async () => (await rowsFor(email)).find((r) => r.status === 'retrying'));
      expect(failed.kind).toBe('visit_reminder');

      // The next hourly run finds the visit handed over already: no second copy is queued.
      await sendDayBeforeReminders(ctx.deps);
      expect(await rowsFor(email)).toHaveLength(1);

      await catcherUp();
      const mail = await until('the reminder', async () => store.latest({ to: email }));
      expect(mail.subject).toBe('Reminder: your visit is tomorrow');
      await until('the recorded send', async () => (await rowsFor(email)).find((r) => r.status === 'sent'));
      const [visit] = await db.select().from(t.visits).where(eq(t.visits.id, v.id));
      expect(visit.reminderSentAt).not.toBeNull();
      await new Promise((r) => setTimeout(r, 300));
      expect(store.list({ to: email })).toHaveLength(1);
    } finally {
      now = new Date();
    }
  });
});
