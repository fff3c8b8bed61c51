import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { simpleParser, type ParsedMail } from 'mailparser';
import request from 'supertest';
import { startSmtpCatcher, type SmtpCatcher } from '../server/fakes/mail';
import { createMailer } from '../server/integrations/mail';
import { sendCampaign } from '../server/campaigns/campaigns.service';
import { queueMail } from '../server/mail/outbox';
import { company, customers, mailSuppressions, properties, reminderCampaigns, reminderSends, users } from '../server/db/schema';
import { testApp, type TestContext } from './support/app';

const OFFICE = 'teo.marchetti@bluestem-comfort.test';
// The raw header line, unfolded (RFC 5322 §2.2.3).
const listHeader = (m: ParsedMail) => String(m.headerLines.find((l) => l.key === 'list-unsubscribe')?.line ?? '').replace(/\r\n[ \t]+/g, ' ');

describe('reminders carry the sender, the postal address and a working opt-out', () => {
  let smtp: SmtpCatcher;
  let ctx: TestContext;
  beforeAll(async () => {
    smtp = await startSmtpCatcher({ port: 0 });
    const mailer = createMailer({ smtpUrl: `smtp://127.0.0.1:${smtp.port}`, from: 'Mailer <office@bluestem-comfort.test>' });
    ctx = testApp({ mailer, env: { PUBLIC_URL: 'https://portal.bluestem-comfort.test' } });
  });
  afterAll(async () => {
    await ctx.close();
    await smtp.close();
  });

  async function household() {
    const { db } = ctx.database;
    const tag = randomUUID().slice(0, 8);
    const email = `reminded.${tag}@example.test`;
    const [c] = await db
      .insert(customers)
      .values({ name: `Reminded ${tag}`, email })
      .returning({ id: customers.id });
    const [p] = await db.insert(properties).values({ customerId: c!.id, street: '12 Fern Row', city: 'Larkspur Bend', state: 'MO', zip: '64790' }).returning({ id: properties.id });
    return { customerId: c!.id, propertyId: p!.id, email };
  }

  async function remind(h: { customerId: string; propertyId: string; email: string }, waitMs = 5000): Promise<{ sendId: string; mail: ParsedMail | null }> {
    const { db } = ctx.database;
    const [office] = await db.select({ id: users.id }).from(users).where(eq(users.email, OFFICE));
    const [camp] = await db.insert(reminderCampaigns).values({ kind: 'cooling_tune_up', createdById: office!.id, audienceCount: 1 }).returning({ id: reminderCampaigns.id });
    const [send] = await db
      .insert(reminderSends)
      .values({ campaignId: camp!.id, customerId: h.customerId, propertyId: h.propertyId, kind: 'cooling_tune_up', email: h.email, reason: 'due' })
      .returning({ id: reminderSends.id });
    const before = new Date();
    await sendCampaign(ctx.deps, camp!.id);
    const got = await smtp.store.waitForLatest({ to: h.email, after: before }, waitMs);
    return { sendId: send!.id, mail: got ? await simpleParser(got.raw) : null };
  }

  it('a reminder names the company as sender, carries its postal address, both List headers and a booking link', async () => {
    const h = await household();
    const [co] = await ctx.database.db.select().from(company);
    const { mail } = await remind(h);
    expect(mail).not.toBeNull();
    expect(mail!.from?.value[0]).toMatchObject({ name: co!.name, address: 'office@bluestem-comfort.test' });
    expect(mail!.text).toContain(`${co!.street}, ${co!.city}, ${co!.state} ${co!.zip}`);
    // RFC 2369: one header, angle-bracketed URIs, HTTPS first; RFC 8058 one-click.
    const list = listHeader(mail!);
    expect(list).toMatch(/^List-Unsubscribe: <https:\/\/portal\.bluestem-comfort\.test\/api\/unsubscribe\?token=[^>]+>,\s*<mailto:[^>]+>$/);
    // mailparser folds List-* headers into one "list" value; the raw line shows the header as sent.
    expect(mail!.headerLines.find((l) => l.key === 'list-unsubscribe-post')?.line).toBe('List-Unsubscribe-Post: List-Unsubscribe=One-Click');
    expect(mail!.text).toContain(`/portal/booking?kind=tune_up&property=${h.propertyId}`);
  });

  it('the one-click POST needs no cookie or CSRF token, answers 200 and stops the next reminder; a receipt still arrives', async () => {
    const h = await household();
    const { mail } = await remind(h);
    const url = new URL(/<(https:[^>]+)>/.exec(listHeader(mail!))![1]!);
    const path = `${url.pathname}${url.search}`;

    // GET only shows the button.
    const page = await request(ctx.app).get(path).expect(200);
    expect(page.text).toMatch(/<button type="submit">Unsubscribe<\/button>/);
    expect(await ctx.database.db.select().from(mailSuppressions).where(eq(mailSuppressions.customerId, h.customerId))).toHaveLength(0);

    // A tampered token is refused; the mail program's POST, from its own origin, works at once.
    await request(ctx.app)
      .post(path.replace(/.(?=$)/, 'x'))
      .type('form')
      .send('List-Unsubscribe=One-Click')
      .expect(404);
    const done = await request(ctx.app).post(path).set('Origin', 'https://mail.example.test').type('form').send('List-Unsubscribe=One-Click');
    expect(done.status).toBe(200);
    expect(done.headers['location']).toBeUndefined();
    expect(await ctx.database.db.select().from(mailSuppressions).where(eq(mailSuppressions.customerId, h.customerId))).toHaveLength(1);

    // The exemption is that path alone: other writes from another origin are still refused.
    expect((await request(ctx.app).post('/api/reminders/campaigns').set('Origin', 'https://mail.example.test').send({})).status).toBe(403);

    const next = await remind(h, 1000);
    expect(next.mail).toBeNull();
    const [row] = await ctx.database.db.select().from(reminderSends).where(eq(reminderSends.id, next.sendId));
    expect(row).toMatchObject({ status: 'suppressed', error: 'Unsubscribed: not sent.' });

    // Transactional mail is never suppressed.
    const before = new Date();
    await queueMail(ctx.deps, { kind: 'receipt', key: `receipt-test-${h.customerId}`, message: { to: h.email, subject: 'Receipt for invoice 9001', text: 'Thank you.' } });
    const receipt = await smtp.store.waitForLatest({ to: h.email, after: before }, 8000);
    expect(receipt?.subject).toBe('Receipt for invoice 9001');
  });
});
