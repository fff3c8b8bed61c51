import { and, eq, inArray, sql } from 'drizzle-orm';
import { formatTermDay, termLastDay } from '../../shared/agreement-terms';
import Stripe from 'stripe';
import { formatUsd } from '../../shared/money';
import {
  DEFAULT_GRACE_DAYS,
  dunningRetryDue,
  idempotencyKeyForRenewal,
  isGraceExpired,
  lapseDate,
  nextDunningRetry,
  renewalNoticesDue,
  renewalWindowOpens,
  type RenewalNotice,
} from '../../shared/renewals';
import type { AppDeps } from '../deps';
import { agreements, planVersions, renewalNotices } from '../db/schema';
import { ensureStripeCustomer, recordFromPaymentIntent } from '../billing/checkout';
import { renderEmail } from '../integrations/mail-layout';
import { paymentErrorMessage } from '../integrations/stripe';
import { ensureRenewalInvoice, termPriceCents } from '../agreements/agreements.service';
import { COMPANY_COUNTRY, companyRow, companyToday } from '../company/company';
import { currentVersion } from '../plans/plans.service';
import { lockAgreement, recordHistory, transition } from '../agreements/terms';
import { queueMail } from '../mail/outbox';
import { formatPhone } from '../../shared/phone';

export const RENEWAL_DAILY_JOB = 'renewals-daily';
export const RENEWAL_NOTICE_JOB = 'renewal-notice';

export interface RenewalRunOptions {
  /** The local date to run for; defaults to today where the company works. */
  today?: string;
  graceDays?: number;
  /** Limit the pass to these agreements (one household's re-run, or a test's own rows). */
  only?: string[];
  /** Test hook: runs right after a charge succeeded at the processor, before it is recorded. */
  afterCharge?: (agreementId: string) => void | Promise<void>;
}

export interface RenewalRunReport {
  today: string;
  windowOpened: number;
  noticesSent: number;
  charged: number;
  chargeFailed: number;
  retried: number;
  lapsed: number;
  endedUnpaid: number;
  errors: { agreementId: string; message: string }[];
}

/**
 * The daily renewal pass. Each agreement is handled in its own steps; every step is safe to run
 * again: notices are unique per term and day, charges carry a key derived from agreement, term and
 * attempt, and a term is added at most once. A run killed half-way and started again therefore
 * sends nobody a second notice and charges nobody twice.
 */
export async function runRenewals(
  deps: Pick<AppDeps, 'config' | 'database' | 'clock' | 'logger' | 'mailer' | 'jobs' | 'stripe'>,
  opts: RenewalRunOptions = {},
): Promise<RenewalRunReport> {
  const { db } = deps.database;
  const today = opts.today ?? (await companyToday(deps));
  const grace = opts.graceDays ?? DEFAULT_GRACE_DAYS;
  const report: RenewalRunReport = { today, windowOpened: 0, noticesSent: 0, charged: 0, chargeFailed: 0, retried: 0, lapsed: 0, endedUnpaid: 0, errors: [] };
  const candidates = await db
    .select({ id: agreements.id })
    .from(agreements)
    .where(
      and(
        inArray(agreements.status, ['active', 'renewal_due', 'past_due']),
        sql`${agreements.endsOn} <= (${today}::date + 60)`,
        opts.only ? inArray(agreements.id, opts.only.length ? opts.only : ['00000000-0000-0000-0000-000000000000']) : undefined,
      ),
    );
  for (const { id } of candidates) {
    try {
      await renewOne(deps, id, today, grace, report, opts);
    } catch (err) {
      deps.logger.error({ err, agreementId: id }, 'renewal step failed');
      report.errors.push({ agreementId: id, message: (err as Error).message });
    }
  }
  return report;
}

async function renewOne(
  deps: Pick<AppDeps, 'config' | 'database' | 'clock' | 'logger' | 'mailer' | 'jobs' | 'stripe'>,
  id: string,
  today: string,
  grace: number,
  report: RenewalRunReport,
  opts: RenewalRunOptions,
) {
  const { db } = deps.database;
  // 1. The renewal window opens 60 days before the end.
  await db.transaction(async (tx) => {
    const a = await lockAgreement(tx, id);
    if (a.status === 'active' && today >= renewalWindowOpens(a.endsOn)) {
      await transition(tx, a, 'renewal_window_opened', {}, { note: `Ends ${a.endsOn}` });
      report.windowOpened++;
    }
  });

  // 2. Notices at 60, 30 and 7 days.
  const [a] = await db.select().from(agreements).where(eq(agreements.id, id));
  if (!a) return;
  const sent = await db
    .select({ daysBefore: renewalNotices.daysBefore })
    .from(renewalNotices)
    .where(and(eq(renewalNotices.agreementId, id), eq(renewalNotices.termEndsOn, a.endsOn)));
  const due = renewalNoticesDue(
    { status: a.status, termEnd: a.endsOn, noticesSent: sent.map((s) => s.daysBefore).filter((d): d is RenewalNotice => d === 60 || d === 30 || d === 7) },
    today,
  );
  for (const n of due) {
    if (await sendRenewalNotice(deps, id, { daysBefore: n })) report.noticesSent++;
  }

  // 3. Term end: charge the saved card, or fall past due.
  if (today >= a.endsOn && (a.status === 'renewal_due' || a.status === 'active')) {
    if (a.autoRenew && a.stripePaymentMethodId) {
      const ok = await chargeRenewal(deps, id, today, 0, opts);
      if (ok) report.charged++;
      else report.chargeFailed++;
    } else {
      await db.transaction(async (tx) => {
        const row = await lockAgreement(tx, id);
        if (row.status !== 'renewal_due' && row.status !== 'active') return;
        await transition(tx, row, 'term_ended_unpaid', {}, { note: `Ended ${row.endsOn} without renewal` });
        report.endedUnpaid++;
      });
    }
    return;
  }

  // 4. Past due: dunning retries on days 3, 7 and 14, then lapse after the grace period.
  if (a.status === 'past_due') {
    if (isGraceExpired(a.endsOn, today, grace)) {
      await db.transaction(async (tx) => {
        const row = await lockAgreement(tx, id);
        if (row.status !== 'past_due') return;
        await transition(tx, row, 'grace_expired', { autoRenew: false }, { note: `Unpaid ${grace} days after ${row.endsOn}` });
        report.lapsed++;
      });
      return;
    }
    if (a.chargeFailedOn && a.autoRenew && a.stripePaymentMethodId && dunningRetryDue(a.chargeFailedOn, a.dunningRetries, today)) {
      report.retried++;
      const ok = await chargeRenewal(deps, id, today, a.dunningRetries + 1, opts);
      if (ok) report.charged++;
      else report.chargeFailed++;
    }
  }
}

/**
 * One off-session charge of the saved card for the next term. The key is derived from the
 * agreement, the term it pays for and the attempt number: the same attempt run twice (a
 * crashed job restarted) replays the processor's first answer instead of charging again.
 */
export async function chargeRenewal(
  deps: Pick<AppDeps, 'config' | 'database' | 'clock' | 'logger' | 'mailer' | 'jobs' | 'stripe'>,
  id: string,
  today: string,
  attempt: number,
  opts: RenewalRunOptions = {},
): Promise<boolean> {
  const { db } = deps.database;
  const prepared = await db.transaction(async (tx) => {
    const current = await lockAgreement(tx, id);
    // Another worker may have renewed it since this run looked: then the next term is not due
    // yet, and charging for it now would bill the homeowner a year early.
    if (today < current.endsOn || !['active', 'renewal_due', 'past_due'].includes(current.status)) return null;
    return ensureRenewalInvoice(deps, tx, id, today);
  });
  if (!prepared) return true;
  const { invoice, agreement } = prepared;
  if (invoice.status !== 'open') return true;
  const stripe = deps.stripe;
  const customer = await ensureStripeCustomer(deps, agreement.customerId);
  const key = `${idempotencyKeyForRenewal(agreement.id, invoice.termStartsOn ?? agreement.endsOn)}-attempt-${attempt}`;
  let pi: Stripe.PaymentIntent;
  try {
    pi = await stripe.paymentIntents.create(
      {
        amount: invoice.totalCents - invoice.paidCents,
        currency: 'usd',
        customer,
        payment_method: agreement.stripePaymentMethodId!,
        off_session: true,
        confirm: true,
        description: `Invoice ${invoice.number}: agreement renewal`,
        metadata: { invoiceId: invoice.id, agreementId: agreement.id, attempt: String(attempt) },
        expand: ['payment_method'],
      },
      { idempotencyKey: key },
    );
  } catch (err) {
    if (!(err instanceof Stripe.errors.StripeCardError)) throw err;
    await chargeFailed(deps, id, today, attempt, paymentErrorMessage(err));
    return false;
  }
  if (opts.afterCharge) await opts.afterCharge(id);
  if (pi.status !== 'succeeded') {
    await chargeFailed(deps, id, today, attempt, 'The card needs the cardholder to confirm the payment.');
    return false;
  }
  await recordFromPaymentIntent(deps, pi, null, 'auto_renew');
  return true;
}

async function chargeFailed(deps: Pick<AppDeps, 'config' | 'database' | 'clock' | 'logger' | 'mailer' | 'jobs'>, id: string, today: string, attempt: number, message: string) {
  const { db } = deps.database;
  const changed = await db.transaction(async (tx) => {
    const a = await lockAgreement(tx, id);
    // A replayed decline for an attempt already counted changes nothing.
    if (attempt > 0 && a.dunningRetries >= attempt) return false;
    if (attempt === 0 && a.status === 'past_due') return false;
    await transition(
      tx,
      a,
      'charge_failed',
      { chargeFailedOn: attempt === 0 ? today : a.chargeFailedOn, dunningRetries: attempt, lastChargeError: message },
      { note: attempt === 0 ? `Renewal charge declined: ${message}` : `Retry ${attempt} declined: ${message}` },
    );
    return true;
  });
  if (changed) await sendDunningMail(deps, id, attempt, message);
}

// ---------- Mail ----------

async function householdOf(deps: Pick<AppDeps, 'database'>, agreementId: string) {
  const found = await deps.database.db.query.agreements.findFirst({
    where: eq(agreements.id, agreementId),
    with: { customer: { columns: { email: true, name: true } }, planVersion: { columns: {}, with: { plan: { columns: { name: true } } } } },
  });
  if (!found) return undefined;
  const { customer, planVersion, ...agreement } = found;
  return { agreement, email: customer.email, name: customer.name, planName: planVersion.plan.name };
}

/**
 * Sends one renewal notice. Automatic ones (60/30/7) are claimed with a unique row first, so two
 * runs never both send; the claim is released if the mail fails, so the next run tries again.
 */
export async function sendRenewalNotice(
  deps: Pick<AppDeps, 'config' | 'database' | 'clock' | 'logger' | 'mailer' | 'jobs'>,
  agreementId: string,
  opts: { daysBefore?: RenewalNotice; sentById?: string } = {},
): Promise<boolean> {
  const { db } = deps.database;
  const h = await householdOf(deps, agreementId);
  if (!h) return false;
  const a = h.agreement;
  const claim = await db
    .insert(renewalNotices)
    .values({ agreementId, termEndsOn: a.endsOn, daysBefore: opts.daysBefore ?? null, sentById: opts.sentById ?? null })
    .onConflictDoNothing()
    .returning({ id: renewalNotices.id });
  if (claim.length === 0) return false;
  if (!h.email) return true;
  const company = await companyRow(db);
  const base = deps.config.publicUrl.replace(/\/$/, '');
  // The agreement row holds the latest paid term; its last day reads as on every other screen.
  const lastDay = formatTermDay(termLastDay(a));
  const auto = a.autoRenew && a.cardLast4;
  const body = renderEmail({
    title: `Your ${h.planName} agreement is covered through ${lastDay}`,
    paragraphs: [
      `Hello ${h.name},`,
      auto
        ? `Your maintenance agreement is covered through ${lastDay} and renews automatically after that day. We will charge the card ending ${a.cardLast4}. You can switch automatic renewal off in your portal at any time before then.`
        : `Your maintenance agreement is covered through ${lastDay}. Renew online to keep your two tune-ups a year, priority service and your repair discount.`,
      `The renewal price is ${formatUsd(await renewalPrice(deps, a))} for the next 12 months.`,
    ],
    action: { label: auto ? 'Review your agreement' : 'Renew online', url: `${base}/portal/plan` },
    footer: `${company.name} · ${formatPhone(company.phone, COMPANY_COUNTRY)}`,
  });
  try {
    // The mail queue sends and retries it; should queueing itself fail, the claim goes so a rerun tries again.
    await queueMail(deps, {
      kind: 'renewal_notice',
      key: `renewal-notice-${agreementId}-${a.endsOn}-${opts.daysBefore ?? claim[0]!.id}`,
      message: {
        to: h.email,
        subject: auto ? `Your agreement renews automatically: covered through ${lastDay}` : `Time to renew: your agreement is covered through ${lastDay}`,
        text: body.text,
        html: body.html,
      },
    });
  } catch (err) {
    await db.delete(renewalNotices).where(eq(renewalNotices.id, claim[0]!.id));
    throw err;
  }
  return true;
}

/** What the next term costs: the plan's current terms, extra systems, less any credit. */
async function renewalPrice(deps: Pick<AppDeps, 'database'>, a: typeof agreements.$inferSelect): Promise<number> {
  const [sold] = await deps.database.db.select().from(planVersions).where(eq(planVersions.id, a.planVersionId));
  const latest = (sold && (await currentVersion(deps.database.db, sold.planId))) ?? sold;
  if (!latest) return a.priceCents;
  return Math.max(termPriceCents(latest, a.systemsCount) - Math.min(a.creditCents, latest.yearlyPriceCents), 0);
}

async function sendDunningMail(deps: Pick<AppDeps, 'config' | 'database' | 'clock' | 'logger' | 'mailer' | 'jobs'>, agreementId: string, attempt: number, message: string) {
  const h = await householdOf(deps, agreementId);
  if (!h?.email) return;
  const a = h.agreement;
  const company = await companyRow(deps.database.db);
  const base = deps.config.publicUrl.replace(/\/$/, '');
  const next = a.chargeFailedOn ? nextDunningRetry(a.chargeFailedOn, a.dunningRetries) : null;
  const lapses = lapseDate(a.endsOn, DEFAULT_GRACE_DAYS);
  const body = renderEmail({
    title: 'We could not renew your maintenance agreement',
    paragraphs: [
      `Hello ${h.name},`,
      `We tried to charge the card ending ${a.cardLast4 ?? '----'} for your ${h.planName} renewal. ${message}`,
      next ? `We will try again on ${next}. To use a different card, update it now.` : 'This was our last automatic try. Please update your card or renew online.',
      `Your agreement stays in place until ${lapses}; after that the priority service and repair discount end.`,
    ],
    action: { label: 'Update your card', url: `${base}/portal/plan?update-card=${agreementId}` },
    footer: `${company.name} · ${formatPhone(company.phone, COMPANY_COUNTRY)}`,
  });
  try {
    await queueMail(deps, {
      kind: 'renewal_declined',
      key: `dunning-${agreementId}-${a.endsOn}-${attempt}`,
      message: { to: h.email, subject: 'Action needed: your agreement renewal payment was declined', text: body.text, html: body.html },
    });
  } catch (err) {
    deps.logger.error({ err, agreementId }, 'dunning e-mail was not queued');
  }
}

/** Office: queue a notice per agreement (one click or in bulk); the job sends it. */
export async function queueRenewalNotices(deps: Pick<AppDeps, 'database' | 'jobs'>, agreementIds: string[], sentById: string): Promise<{ queued: number }> {
  const { db } = deps.database;
  const found = await db.select({ id: agreements.id }).from(agreements).where(inArray(agreements.id, agreementIds));
  let queued = 0;
  for (const { id } of found) {
    await deps.jobs.send(RENEWAL_NOTICE_JOB, { agreementId: id, sentById });
    queued++;
  }
  await Promise.all(found.map(({ id }) => db.transaction((tx) => recordHistory(tx, { agreementId: id, event: 'notice_requested', actorId: sentById }))));
  return { queued };
}
