// Shared set-up for the billing, agreement, renewal and webhook tests: the real app on the run's
// database, the fake card processor and the SMTP catcher on loopback, and invented households.
import { randomUUID } from 'node:crypto';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { eq } from 'drizzle-orm';
import type Stripe from 'stripe';
import { termEnd } from '../shared/renewals';
import { agreements, billingAccounts, customers, plans, planVersions, properties, users } from '../server/db/schema';
import { startFakeStripe, type StartedFakeStripe } from '../server/fakes/stripe';
import { startSmtpCatcher, type SmtpCatcher } from '../server/fakes/mail';
import { createMailer } from '../server/integrations/mail';
import { createStripe } from '../server/integrations/stripe';
import { signInHomeowner, signInStaff, type Signed } from './support/auth';
import { testApp, type TestContext } from './support/app';

export const WEBHOOK_SECRET = 'whsec_billing_tests_0123456789';
export const OFFICE = 'teo.marchetti@bluestem-comfort.test';
export const OWNER = 'rosalind.okafor@bluestem-comfort.test';
const nextYear = String((new Date().getUTCFullYear() + 2) % 100).padStart(2, '0');

export interface Harness {
  ctx: TestContext;
  fake: StartedFakeStripe;
  smtp: SmtpCatcher;
  stripe: Stripe;
  appUrl: string;
  close(): Promise<void>;
}

export async function startHarness(opts: { retries?: number; webhooks?: boolean } = {}): Promise<Harness> {
  const fake = await startFakeStripe({ port: 0, webhookSecret: WEBHOOK_SECRET, webhookRetryBaseMs: 20, webhookMaxAttempts: 4 });
  const smtp = await startSmtpCatcher({ port: 0 });
  const mailer = createMailer({ smtpUrl: `smtp://127.0.0.1:${smtp.port}`, from: 'Bluestem Comfort <billing@bluestem-comfort.test>' });
  const stripe = createStripe({ secretKey: 'sk_test_billing_harness', apiUrl: fake.url, maxNetworkRetries: opts.retries ?? 0 });
  const ctx = testApp({ stripe, mailer, env: { STRIPE_WEBHOOK_SECRET: WEBHOOK_SECRET, PUBLIC_URL: 'http://localhost:4999' } });
  const server: Server = await new Promise((resolve) => {
    const s = ctx.app.listen(0, '127.0.0.1', () => resolve(s));
  });
  const appUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  if (opts.webhooks !== false) fake.fake.setWebhookUrl(`${appUrl}/api/webhooks/stripe`);
  return {
    ctx,
    fake,
    smtp,
    stripe,
    appUrl,
    async close() {
      await fake.fake.webhooksIdle().catch(() => {});
      server.closeAllConnections();
      await new Promise<void>((r) => server.close(() => r()));
      mailer.close();
      await Promise.allSettled([fake.close(), smtp.close()]);
      await ctx.close();
    },
  };
}

export interface Household {
  customerId: string;
  propertyId: string;
  email: string;
  homeowner: Signed;
}

/** A new invented household with a portal sign-in and one property. */
export async function newHousehold(h: Harness, label = 'billing'): Promise<Household> {
  const { db } = h.ctx.database;
  const tag = randomUUID().slice(0, 8);
  const email = `${label}.${tag}@example.test`;
  const [c] = await db
    .insert(customers)
    .values({ name: `Testwood household ${tag}`, email })
    .returning({ id: customers.id });
  await db.insert(users).values({ email, name: `Robin Testwood ${tag}`, role: 'homeowner', customerId: c!.id });
  const [p] = await db
    .insert(properties)
    .values({ customerId: c!.id, street: `${100 + Math.floor(Math.random() * 800)} Quarry Lane`, city: 'Larkspur Bend', state: 'MO', zip: '64790' })
    .returning({ id: properties.id });
  return { customerId: c!.id, propertyId: p!.id, email, homeowner: await signInHomeowner(h.ctx, email) };
}

export async function planByCode(h: Harness, code: string) {
  const { db } = h.ctx.database;
  const [row] = await db
    .select({ plan: plans, version: planVersions })
    .from(plans)
    .innerJoin(planVersions, eq(planVersions.planId, plans.id))
    .where(eq(plans.code, code))
    .orderBy(planVersions.version);
  return row!;
}

/** An agreement written straight to the database, for engine scenarios. */
export async function seedAgreement(
  h: Harness,
  hh: Household,
  o: { endsOn: string; status: 'active' | 'renewal_due' | 'past_due' | 'lapsed'; planCode?: string; card?: string; autoRenew?: boolean; systems?: number },
) {
  const { db } = h.ctx.database;
  const { version } = await planByCode(h, o.planCode ?? 'two-season');
  const startsOn = addYears(o.endsOn, -1);
  let pm: { id: string; last4: string } | null = null;
  if (o.card) {
    const customer = await h.stripe.customers.create({ email: hh.email, metadata: { customerId: hh.customerId } });
    await db.insert(billingAccounts).values({ customerId: hh.customerId, stripeCustomerId: customer.id });
    const attached = await h.stripe.paymentMethods.attach(o.card, { customer: customer.id });
    pm = { id: attached.id, last4: attached.card!.last4 };
  }
  const systems = o.systems ?? 1;
  const [a] = await db
    .insert(agreements)
    .values({
      customerId: hh.customerId,
      propertyId: hh.propertyId,
      planVersionId: version.id,
      status: o.status,
      startsOn,
      endsOn: o.endsOn,
      systemsCount: systems,
      priceCents: version.yearlyPriceCents + version.additionalSystemCents * (systems - 1),
      autoRenew: o.autoRenew ?? Boolean(pm),
      stripePaymentMethodId: pm?.id ?? null,
      cardBrand: pm ? 'visa' : null,
      cardLast4: pm?.last4 ?? null,
    })
    .returning();
  return { agreement: a!, version };
}

export function addYears(date: string, years: number): string {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number];
  const dt = new Date(Date.UTC(y + years, m - 1, d));
  return dt.toISOString().slice(0, 10);
}

export const staff = (h: Harness, email = OFFICE) => signInStaff(h.ctx, email);

/** Types a test card into the hosted page the way a browser form posts it. */
export async function payOnHostedPage(url: string, card: string, expiry = `12/${nextYear}`): Promise<Response> {
  return fetch(url, {
    method: 'POST',
    redirect: 'manual',
    headers: { 'content-type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams({ card_number: card, expiry, cvc: '123' }).toString(),
  });
}

export async function waitFor<T>(what: string, probe: () => Promise<T | null | undefined | false>, timeoutMs = 8000): Promise<T> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const v = await probe();
    if (v) return v;
    if (Date.now() > until) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

export { termEnd };
