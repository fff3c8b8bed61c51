import { and, desc, eq, inArray, isNull } from 'drizzle-orm';
import type { InvoiceLine } from '../../shared/money';
import { formatUsd } from '../../shared/money';
import { daysBetween, DEFAULT_GRACE_DAYS, lapseDate, prorateTierChange, renewalWindowOpens, termEnd } from '../../shared/renewals';
import type { AgreementView, EnrollInput, PlanView } from '../../shared/schemas/plans';
import { coveredThroughLabel, lastPaidTerm, termLastDay, termRangeLabel } from '../../shared/agreement-terms';
import { agreementTermViews } from './term-in-force';
import type { SessionUser } from '../../shared/schemas/session';
import type { AppDeps } from '../deps';
import { assertCustomerAccess } from '../auth/access';
import type { Db, Tx } from '../db/client';
import { agreements, invoices, plans, planVersions, properties } from '../db/schema';
import { AppError, conflict, notFound } from '../http/errors';
import { ownedProperty } from '../http/ownership';
import { assertPaymentsReachable, startInvoiceCheckout } from '../billing/checkout';
import { startCardSetup } from './card-setup';
import { insertInvoice, invoiceView, voidOpenInvoicesOf } from '../billing/invoices';
import { recordOfflinePayment } from '../billing/refunds';
import { companyToday } from '../company/company';
import { currentVersion, planViewOf } from '../plans/plans.service';
import { lockAgreement, recordHistory, transition } from './terms';

type AgreementRow = typeof agreements.$inferSelect;
type PlanVersionRow = typeof planVersions.$inferSelect;
type PlanRow = typeof plans.$inferSelect;

/** Price for a term: the yearly price plus each system beyond the first. */
export function termPriceCents(v: Pick<PlanVersionRow, 'yearlyPriceCents' | 'additionalSystemCents'>, systems: number): number {
  return v.yearlyPriceCents + v.additionalSystemCents * Math.max(systems - 1, 0);
}

function termLines(plan: PlanRow, v: PlanVersionRow, systems: number, start: string, creditCents: number): InvoiceLine[] {
  const credit = Math.min(creditCents, v.yearlyPriceCents);
  const lines: InvoiceLine[] = [
    {
      description: `${plan.name} maintenance agreement, ${termRangeLabel({ startsOn: start, endsOn: termEnd(start) })}${credit ? ` (less ${formatUsd(credit)} credit from a plan change)` : ''}`,
      kind: 'plan_fee',
      quantity: 1,
      unitCents: v.yearlyPriceCents - credit,
      // Common practice: maintenance agreements are billed as a service; tax rules vary by state.
      taxable: false,
    },
  ];
  if (systems > 1) {
    lines.push({ description: `Additional system${systems > 2 ? 's' : ''}`, kind: 'plan_fee', quantity: systems - 1, unitCents: v.additionalSystemCents, taxable: false });
  }
  return lines;
}

async function planAndVersion(tx: Db | Tx, versionId: string) {
  const found = await tx.query.planVersions.findFirst({ where: eq(planVersions.id, versionId), with: { plan: true } });
  if (!found) throw notFound('That plan');
  const { plan, ...version } = found;
  return { plan, version };
}

// ---------- Views ----------

export async function agreementView(db: Db | Tx, a: AgreementRow, todayIso: string): Promise<AgreementView> {
  // The household, the home, the plan sold and the newest open invoice, in one relational read.
  const linked = await db.query.agreements.findFirst({
    where: eq(agreements.id, a.id),
    columns: { id: true },
    with: {
      customer: { columns: { name: true } },
      property: true,
      planVersion: { with: { plan: true } },
      invoices: { columns: { id: true }, where: eq(invoices.status, 'open'), orderBy: desc(invoices.createdAt), limit: 1 },
    },
  });
  if (!linked) throw notFound('That agreement');
  const { plan: soldPlan, ...soldVersion } = linked.planVersion;
  const sold = { plan: soldPlan, version: soldVersion };
  const c = linked.customer;
  const p = linked.property;
  const open = linked.invoices[0];
  const latest = await currentVersion(db, sold.plan.id);
  const opens = renewalWindowOpens(a.endsOn);
  const termViews = await agreementTermViews(db, a, todayIso);
  const canRenew = (a.status === 'renewal_due' || a.status === 'past_due' || a.status === 'lapsed' || (a.status === 'active' && todayIso >= opens)) && sold.plan.active;
  return {
    id: a.id,
    customerId: a.customerId,
    customerName: c?.name ?? '',
    propertyId: a.propertyId,
    propertyLabel: p?.label ?? '',
    propertyAddress: p ? `${p.street}${p.unit ? ` ${p.unit}` : ''}, ${p.city}, ${p.state} ${p.zip}` : '',
    status: a.status,
    startsOn: a.startsOn,
    endsOn: a.endsOn,
    lastCoveredDay: termLastDay(lastPaidTerm(termViews) ?? a),
    lastDayLabel: coveredThroughLabel(lastPaidTerm(termViews) ?? a),
    currentTerm: termViews.find((t) => t.inForce) ?? null,
    terms: termViews,
    daysLeft: daysBetween(todayIso, a.endsOn),
    systemsCount: a.systemsCount,
    priceCents: a.priceCents,
    renewalPriceCents: Math.max(termPriceCents(latest ?? sold.version, a.systemsCount) - Math.min(a.creditCents, (latest ?? sold.version).yearlyPriceCents), 0),
    autoRenew: a.autoRenew,
    card: a.cardLast4 ? { brand: a.cardBrand ?? 'card', last4: a.cardLast4 } : null,
    canRenew,
    renewalOpensOn: opens,
    lapsesOn: a.status === 'past_due' ? lapseDate(a.endsOn, DEFAULT_GRACE_DAYS) : null,
    creditCents: a.creditCents,
    lastChargeError: a.status === 'past_due' ? a.lastChargeError : null,
    plan: planViewOf(sold.plan, sold.version),
    openInvoiceId: open?.id ?? null,
  };
}

export async function myAgreements(deps: Pick<AppDeps, 'database' | 'clock'>, user: SessionUser): Promise<AgreementView[]> {
  const { db } = deps.database;
  if (!user.customerId) return [];
  const rows = await db.select().from(agreements).where(eq(agreements.customerId, user.customerId)).orderBy(desc(agreements.createdAt));
  const t = await companyToday(deps);
  return Promise.all(rows.filter((r) => r.status !== 'canceled').map((r) => agreementView(db, r, t)));
}

/** The household's homes, for choosing where a new agreement applies. */
export async function myProperties(deps: Pick<AppDeps, 'database'>, user: SessionUser) {
  if (!user.customerId) return [];
  const { db } = deps.database;
  const rows = await db
    .select()
    .from(properties)
    .where(and(eq(properties.customerId, user.customerId), isNull(properties.archivedAt)));
  const held = await db
    .select({ propertyId: agreements.propertyId })
    .from(agreements)
    .where(and(eq(agreements.customerId, user.customerId), inArray(agreements.status, ['active', 'renewal_due', 'past_due'])));
  return rows.map((p) => ({
    id: p.id,
    label: p.label,
    address: `${p.street}${p.unit ? ` ${p.unit}` : ''}, ${p.city}, ${p.state} ${p.zip}`,
    covered: held.some((h) => h.propertyId === p.id),
  }));
}

export async function readAgreement(deps: Pick<AppDeps, 'database' | 'clock'>, user: SessionUser, id: string): Promise<AgreementView> {
  const { db } = deps.database;
  const [a] = await db.select().from(agreements).where(eq(agreements.id, id));
  if (!a) throw notFound('That agreement');
  await assertCustomerAccess(db, user, a.customerId);
  return agreementView(db, a, await companyToday(deps));
}

async function ownAgreement(deps: Pick<AppDeps, 'database'>, user: SessionUser, id: string): Promise<AgreementRow> {
  const { db } = deps.database;
  const [a] = await db.select().from(agreements).where(eq(agreements.id, id));
  if (!a) throw notFound('That agreement');
  await assertCustomerAccess(db, user, a.customerId);
  return a;
}

// ---------- Enrolling ----------

/** A pending agreement and its first invoice; the Checkout payment makes it active. */
export async function enroll(
  deps: Pick<AppDeps, 'config' | 'database' | 'clock' | 'stripe'>,
  user: SessionUser,
  input: EnrollInput,
): Promise<{ agreementId: string; invoiceId: string; checkoutUrl: string }> {
  const { db } = deps.database;
  const prop = await ownedProperty(db, user, input.propertyId, 'propertyId');
  const [plan] = await db.select().from(plans).where(eq(plans.id, input.planId));
  if (!plan || !plan.active) throw new AppError(422, 'validation_failed', 'That plan is not offered.', { planId: 'That plan is not offered.' });
  const version = await currentVersion(db, plan.id);
  if (!version) throw new AppError(422, 'validation_failed', 'That plan has no price yet.', { planId: 'That plan has no price yet.' });
  const t = await companyToday(deps);
  await assertPaymentsReachable(deps, prop.customerId);

  const { agreementId, invoiceId } = await db.transaction(async (tx) => {
    const held = await tx
      .select({ id: agreements.id, status: agreements.status })
      .from(agreements)
      .where(and(eq(agreements.propertyId, prop.id), inArray(agreements.status, ['active', 'renewal_due', 'past_due', 'pending'])))
      .for('update');
    const live = held.find((h) => h.status !== 'pending');
    if (live) throw conflict('This property already has an agreement. Renew it instead.');
    // A pending enrollment left unpaid is replaced by the new choice.
    for (const h of held) {
      await tx.update(agreements).set({ status: 'canceled', canceledAt: deps.clock() }).where(eq(agreements.id, h.id));
      await voidOpenInvoicesOf(tx, h.id, deps.clock());
      await recordHistory(tx, { agreementId: h.id, event: 'canceled', fromStatus: 'pending', toStatus: 'canceled', note: 'Replaced by a new enrollment', actorId: user.id });
    }
    const [a] = await tx
      .insert(agreements)
      .values({
        customerId: prop.customerId,
        propertyId: prop.id,
        planVersionId: version.id,
        status: 'pending',
        startsOn: t,
        endsOn: termEnd(t),
        systemsCount: input.systemsCount,
        priceCents: termPriceCents(version, input.systemsCount),
        autoRenew: false,
      })
      .returning();
    await recordHistory(tx, { agreementId: a!.id, event: 'enrolled', toStatus: 'pending', note: `${plan.name} v${version.version}`, actorId: user.id });
    const inv = await insertInvoice(
      tx,
      {
        customerId: prop.customerId,
        agreementId: a!.id,
        purpose: 'enrollment',
        planVersionId: version.id,
        termStartsOn: t,
        lines: termLines(plan, version, input.systemsCount, t, 0),
        issue: true,
      },
      deps.clock(),
    );
    return { agreementId: a!.id, invoiceId: inv.id };
  });
  const { checkoutUrl } = await startInvoiceCheckout(deps, invoiceId, { returnPath: '/portal/plan', saveCard: input.autoRenew });
  return { agreementId, invoiceId, checkoutUrl };
}

// ---------- Renewing ----------

/**
 * The open renewal invoice for the agreement's next term, created once. Renewal is at the
 * plan's current price (a new term is a new sale); the term already sold is never repriced.
 */
export async function ensureRenewalInvoice(deps: Pick<AppDeps, 'clock'>, tx: Tx, agreementId: string, todayIso: string) {
  const a = await lockAgreement(tx, agreementId);
  const [existing] = await tx
    .select()
    .from(invoices)
    .where(and(eq(invoices.agreementId, a.id), eq(invoices.purpose, 'renewal'), eq(invoices.status, 'open')))
    .orderBy(desc(invoices.createdAt))
    .limit(1);
  if (existing) return { agreement: a, invoice: existing };
  const sold = await planAndVersion(tx, a.planVersionId);
  const latest = (await currentVersion(tx, sold.plan.id)) ?? sold.version;
  const start = a.status === 'lapsed' && todayIso > a.endsOn ? todayIso : a.endsOn;
  const credit = Math.min(a.creditCents, latest.yearlyPriceCents);
  const invoice = await insertInvoice(
    tx,
    {
      customerId: a.customerId,
      agreementId: a.id,
      purpose: 'renewal',
      planVersionId: latest.id,
      termStartsOn: start,
      lines: termLines(sold.plan, latest, a.systemsCount, start, credit),
      notes: credit ? `[credit:${credit}]` : '',
      issue: true,
    },
    deps.clock(),
  );
  return { agreement: a, invoice };
}

function assertRenewable(a: AgreementRow, todayIso: string) {
  if (a.status === 'canceled' || a.status === 'pending')
    throw conflict(a.status === 'pending' ? 'This agreement is waiting for its first payment.' : 'A canceled agreement cannot be renewed.');
  if (a.status === 'active' && todayIso < renewalWindowOpens(a.endsOn)) {
    throw conflict(`Renewal opens on ${renewalWindowOpens(a.endsOn)}, 60 days before the agreement ends.`);
  }
}

export async function renewOnline(
  deps: Pick<AppDeps, 'config' | 'database' | 'clock' | 'stripe'>,
  user: SessionUser,
  id: string,
  saveCard: boolean,
): Promise<{ invoiceId: string; checkoutUrl: string }> {
  const a0 = await ownAgreement(deps, user, id);
  const t = await companyToday(deps);
  assertRenewable(a0, t);
  await assertPaymentsReachable(deps, a0.customerId);
  const invoiceId = await deps.database.db.transaction(async (tx) => (await ensureRenewalInvoice(deps, tx, id, t)).invoice.id);
  const { checkoutUrl } = await startInvoiceCheckout(deps, invoiceId, { returnPath: '/portal/plan', saveCard });
  return { invoiceId, checkoutUrl };
}

/** The office records a check or cash renewal: renewal invoice, payment, new term, receipt. */
export async function manualRenewal(
  deps: Pick<AppDeps, 'database' | 'clock' | 'logger' | 'jobs' | 'stripe'>,
  user: SessionUser,
  id: string,
  input: { method: 'check' | 'cash'; reference: string },
) {
  const { db } = deps.database;
  const [a0] = await db.select().from(agreements).where(eq(agreements.id, id));
  if (!a0) throw notFound('That agreement');
  const t = await companyToday(deps);
  if (a0.status === 'canceled' || a0.status === 'pending') throw conflict('Only an agreement that has started can be renewed.');
  const inv = await db.transaction(async (tx) => (await ensureRenewalInvoice(deps, tx, id, t)).invoice);
  const view = await recordOfflinePayment(deps, user, inv.id, { method: input.method, amountCents: inv.totalCents - inv.paidCents, reference: input.reference });
  return { invoice: view, agreement: await readAgreement(deps, user, id) };
}

// ---------- Automatic renewal and saved card ----------

export async function setAutoRenew(
  deps: Pick<AppDeps, 'config' | 'database' | 'clock' | 'stripe'>,
  user: SessionUser,
  id: string,
  enabled: boolean,
): Promise<{ agreement: AgreementView; checkoutUrl?: string }> {
  const a = await ownAgreement(deps, user, id);
  if (a.status === 'canceled' || a.status === 'lapsed') throw conflict('Automatic renewal is only for a current agreement.');
  if (enabled && !a.stripePaymentMethodId) {
    // No card on file: save one first (SetupIntent through Checkout); the card's arrival switches it on.
    const { checkoutUrl } = await startCardSetup(deps, a, true);
    return { agreement: await readAgreement(deps, user, id), checkoutUrl };
  }
  await deps.database.db.transaction(async (tx) => {
    const row = await lockAgreement(tx, id);
    if (row.autoRenew === enabled) return;
    await tx.update(agreements).set({ autoRenew: enabled }).where(eq(agreements.id, id));
    await recordHistory(tx, { agreementId: id, event: enabled ? 'auto_renew_on' : 'auto_renew_off', actorId: user.id });
  });
  return { agreement: await readAgreement(deps, user, id) };
}

export async function updateCard(deps: Pick<AppDeps, 'config' | 'database' | 'stripe'>, user: SessionUser, id: string): Promise<{ checkoutUrl: string }> {
  const a = await ownAgreement(deps, user, id);
  if (a.status === 'canceled') throw conflict('This agreement is canceled.');
  return startCardSetup(deps, a, false);
}

// ---------- Changing tier mid-term ----------

/**
 * Moves to another tier part-way through the term, prorated by days (shared/renewals.ts). A dearer
 * tier takes effect when its invoice is paid; a cheaper one takes effect now and the difference is
 * credited against the next renewal.
 */
export async function changeTier(deps: Pick<AppDeps, 'database' | 'clock'>, user: SessionUser, id: string, input: { planId: string; changeDate?: string }) {
  const { db } = deps.database;
  const t = await companyToday(deps);
  const changeDate = input.changeDate ?? t;
  const result = await db.transaction(async (tx) => {
    const a = await lockAgreement(tx, id);
    await assertCustomerAccess(tx, user, a.customerId);
    if (a.status !== 'active' && a.status !== 'renewal_due') throw conflict('Only a current agreement can change plans.');
    const [plan] = await tx.select().from(plans).where(eq(plans.id, input.planId));
    if (!plan || !plan.active) throw new AppError(422, 'validation_failed', 'That plan is not offered.', { planId: 'That plan is not offered.' });
    const target = await currentVersion(tx, plan.id);
    if (!target) throw new AppError(422, 'validation_failed', 'That plan has no price yet.', { planId: 'That plan has no price yet.' });
    if (target.id === a.planVersionId) throw conflict('The agreement is already on that plan.');
    if (changeDate < a.startsOn || changeDate >= a.endsOn) {
      throw new AppError(422, 'validation_failed', `The change date must fall within the term ${a.startsOn} to ${a.endsOn}.`, { changeDate: 'Outside the current term.' });
    }
    const newPrice = termPriceCents(target, a.systemsCount);
    const delta = prorateTierChange({ termStart: a.startsOn, termEnd: a.endsOn, changeDate, oldPriceCents: a.priceCents, newPriceCents: newPrice });
    const remaining = daysBetween(changeDate, a.endsOn);
    if (delta > 0) {
      const inv = await insertInvoice(
        tx,
        {
          customerId: a.customerId,
          agreementId: a.id,
          purpose: 'tier_change',
          planVersionId: target.id,
          lines: [{ description: `Change to ${plan.name} for the ${remaining} days left in the term`, kind: 'plan_fee', quantity: 1, unitCents: delta, taxable: false }],
          issue: true,
        },
        deps.clock(),
      );
      await recordHistory(tx, { agreementId: a.id, event: 'tier_change_invoiced', note: `${plan.name}: ${formatUsd(delta)} for ${remaining} days`, actorId: user.id });
      return { prorationCents: delta, invoiceId: inv.id as string | null };
    }
    await tx
      .update(agreements)
      .set({ planVersionId: target.id, priceCents: newPrice, creditCents: a.creditCents + -delta })
      .where(eq(agreements.id, a.id));
    await recordHistory(tx, { agreementId: a.id, event: 'tier_changed', note: `${plan.name}: credit ${formatUsd(-delta)} for ${remaining} days`, actorId: user.id });
    return { prorationCents: delta, invoiceId: null };
  });
  return { ...result, agreement: await readAgreement(deps, user, id), invoice: result.invoiceId ? await invoiceView(db, result.invoiceId) : null };
}

export async function cancelAgreement(deps: Pick<AppDeps, 'database' | 'clock'>, user: SessionUser, id: string, reason: string) {
  await deps.database.db.transaction(async (tx) => {
    const a = await lockAgreement(tx, id);
    await transition(tx, a, 'canceled', { canceledAt: deps.clock(), autoRenew: false }, { note: reason, actorId: user.id });
    await voidOpenInvoicesOf(tx, id, deps.clock(), { unpaidOnly: true });
  });
  return readAgreement(deps, user, id);
}

export type { PlanView };
