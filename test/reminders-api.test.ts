import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startSmtpCatcher, type SmtpCatcher } from '../server/fakes/mail';
import { createMailer } from '../server/integrations/mail';
import { sendCampaign } from '../server/campaigns/campaigns.service';
import { testApp, type TestContext } from './support/app';
import { anonymous, CSRF_HEADER_NAME, signInHomeowner, signInStaff } from './support/auth';

const OFFICE = 'teo.marchetti@bluestem-comfort.test';
const DANA = 'dana.whitfield@example.test';

describe('seasonal reminder campaigns', () => {
  let smtp: SmtpCatcher;
  let ctx: TestContext;

  beforeAll(async () => {
    smtp = await startSmtpCatcher({ port: 0 });
    const mailer = createMailer({ smtpUrl: `smtp://127.0.0.1:${smtp.port}`, from: 'Bluestem <office@bluestem-comfort.test>' });
    ctx = testApp({ mailer });
  });
  afterAll(async () => {
    await ctx.close();
    await smtp.close();
  });

  it('keeps homeowners and strangers out', async () => {
    const anon = await anonymous(ctx);
    expect((await anon.agent.get('/api/reminders/preview?kind=filter')).status).toBe(401);
    const home = await signInHomeowner(ctx, DANA);
    expect((await home.agent.get('/api/reminders/preview?kind=filter')).status).toBe(403);
    expect((await home.agent.post('/api/reminders/campaigns').set(CSRF_HEADER_NAME, home.csrf).send({ kind: 'filter', expectedCount: 1 })).status).toBe(403);
  });

  it('names the field when the kind is not one we send', async () => {
    const office = await signInStaff(ctx, OFFICE);
    const res = await office.agent.get('/api/reminders/preview?kind=gutters');
    expect(res.status).toBe(422);
    expect(res.body.error.fields.kind).toMatch(/cooling tune-up/);
  });

  it('previews, refuses a stale count, sends once to each household, and never twice', async () => {
    const office = await signInStaff(ctx, OFFICE);
    const preview = await office.agent.get('/api/reminders/preview?kind=cooling_tune_up');
    expect(preview.status).toBe(200);
    // In December the coming season is next spring; every plan member with an address is due.
    const dana = preview.body.audience.find((r: { email: string }) => r.email === DANA);
    expect(dana?.reason).toMatch(/cooling tune-up/);
    const count = preview.body.audience.length as number;

    const stale = await office.agent
      .post('/api/reminders/campaigns')
      .set(CSRF_HEADER_NAME, office.csrf)
      .send({ kind: 'cooling_tune_up', expectedCount: count + 5 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('audience_changed');

    let sent = await office.agent.post('/api/reminders/campaigns').set(CSRF_HEADER_NAME, office.csrf).send({ kind: 'cooling_tune_up', expectedCount: count });
    if (sent.status === 409) {
      // Another test changed the plans in between: send to the audience as it is now.
      const again = await office.agent.get('/api/reminders/preview?kind=cooling_tune_up');
      sent = await office.agent.post('/api/reminders/campaigns').set(CSRF_HEADER_NAME, office.csrf).send({ kind: 'cooling_tune_up', expectedCount: again.body.audience.length });
    }
    expect(sent.status).toBe(201);
    expect(sent.body.sent).toBe(sent.body.audienceCount);
    expect(sent.body.pending).toBe(0);
    expect(sent.body.finishedAt).not.toBeNull();

    const mail = smtp.store.list().filter((m) => m.to.some((t) => t.toLowerCase() === DANA));
    expect(mail).toHaveLength(1);
    expect(mail[0]!.subject).toBe('Time to book your spring cooling tune-up');
    expect(mail[0]!.text).toContain('/portal');

    // A retried job finds nothing pending and sends nothing more.
    const before = smtp.store.list().length;
    await sendCampaign(ctx.deps, sent.body.id);
    expect(smtp.store.list().length).toBe(before);

    // The households just reminded are not due again this month.
    const after = await office.agent.get('/api/reminders/preview?kind=cooling_tune_up');
    expect(after.body.audience.find((r: { email: string }) => r.email === DANA)).toBeUndefined();

    const progress = await office.agent.get(`/api/reminders/campaigns/${sent.body.id}`);
    expect(progress.body).toMatchObject({ id: sent.body.id, kind: 'cooling_tune_up', failed: 0 });
    const list = await office.agent.get('/api/reminders/campaigns');
    expect(list.body.campaigns.map((c: { id: string }) => c.id)).toContain(sent.body.id);
  });

  it('answers 404 for a campaign that does not exist', async () => {
    const office = await signInStaff(ctx, OFFICE);
    expect((await office.agent.get('/api/reminders/campaigns/00000000-0000-4000-8000-000000000000')).status).toBe(404);
  });
});
