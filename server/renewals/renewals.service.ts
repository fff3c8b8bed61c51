import { and, desc, eq, gte, inArray, lte, max, sql, type SQL } from 'drizzle-orm';
import { AGREEMENT_STATUS_LABELS } from '../../shared/agreements';
import { addDays, daysBetween } from '../../shared/renewals';
import { RENEWAL_VIEWS, type RenewalBoard, type RenewalRow, type RenewalView } from '../../shared/schemas/plans';
import type { AppDeps } from '../deps';
import { agreements, agreementTerms, customers, invoices, plans, planVersions, renewalNotices } from '../db/schema';
import { toCsv } from '../http/csv';
import { companyToday } from '../company/company';

const RENEWED_LOOKBACK_DAYS = 30;

function viewFilter(view: RenewalView, today: string): SQL {
  switch (view) {
    case 'due30':
    case 'due60':
    case 'due90': {
      const days = Number(view.slice(3));
      return and(inArray(agreements.status, ['active', 'renewal_due']), gte(agreements.endsOn, today), lte(agreements.endsOn, addDays(today, days)))!;
    }
    case 'past_due':
      return eq(agreements.status, 'past_due');
    case 'lapsed':
      return eq(agreements.status, 'lapsed');
    case 'renewed':
      return sql`exists (select 1 from ${agreementTerms} t join ${invoices} i on i.id = t.invoice_id
        where t.agreement_id = ${agreements.id} and i.purpose = 'renewal' and t.created_at >= now() - make_interval(days => ${RENEWED_LOOKBACK_DAYS}))`;
  }
}

export async function renewalBoard(deps: Pick<AppDeps, 'database' | 'clock'>, view: RenewalView): Promise<RenewalBoard> {
  const { db } = deps.database;
  const today = await companyToday(deps);
  // Every view's count and total in one pass over agreements, beside the rows of the one shown.
  const aggregates = Object.fromEntries(
    RENEWAL_VIEWS.flatMap((v) => {
      const where = viewFilter(v, today);
      return [
        [`${v}_count`, sql<number>`(count(*) filter (where ${where}))::int`],
        [`${v}_total`, sql<string>`coalesce(sum(${agreements.priceCents}) filter (where ${where}), 0)::bigint`],
      ];
    }),
  ) as Record<string, SQL<number | string>>;
  const [[row], rows] = await Promise.all([db.select(aggregates).from(agreements), renewalRows(deps, view, today)]);
  const counts = {} as RenewalBoard['counts'];
  for (const v of RENEWAL_VIEWS) counts[v] = { count: Number(row?.[`${v}_count`] ?? 0), totalCents: Number(row?.[`${v}_total`] ?? 0) };
  return { view, counts, rows };
}

async function renewalRows(deps: Pick<AppDeps, 'database'>, view: RenewalView, today: string): Promise<RenewalRow[]> {
  const { db } = deps.database;
  const lastNotice = db
    .select({ agreementId: renewalNotices.agreementId, at: max(renewalNotices.sentAt).as('last_at') })
    .from(renewalNotices)
    .groupBy(renewalNotices.agreementId)
    .as('last_notice');
  const rows = await db
    .select({ a: agreements, name: customers.name, email: customers.email, planName: plans.name, lastAt: lastNotice.at })
    .from(agreements)
    .innerJoin(customers, eq(agreements.customerId, customers.id))
    .innerJoin(planVersions, eq(agreements.planVersionId, planVersions.id))
    .innerJoin(plans, eq(planVersions.planId, plans.id))
    .leftJoin(lastNotice, eq(lastNotice.agreementId, agreements.id))
    .where(viewFilter(view, today))
    .orderBy(view === 'renewed' ? desc(agreements.startsOn) : agreements.endsOn, customers.name)
    .limit(1000);
  return rows.map((r) => ({
    agreementId: r.a.id,
    customerName: r.name,
    email: r.email,
    planName: r.planName,
    status: r.a.status,
    endsOn: r.a.endsOn,
    daysLeft: daysBetween(today, r.a.endsOn),
    priceCents: r.a.priceCents,
    autoRenew: r.a.autoRenew,
    lastNoticeAt: r.lastAt ? new Date(r.lastAt as unknown as string).toISOString() : null,
  }));
}

export async function renewalCsv(deps: Pick<AppDeps, 'database' | 'clock'>, view: RenewalView): Promise<string> {
  const today = await companyToday(deps);
  const rows = await renewalRows(deps, view, today);
  return toCsv(
    ['Household', 'E-mail', 'Plan', 'Status', 'Ends on', 'Days left', 'Price (USD)', 'Automatic renewal', 'Last notice'],
    rows.map((r) => [
      r.customerName,
      r.email ?? '',
      r.planName,
      AGREEMENT_STATUS_LABELS[r.status],
      r.endsOn,
      r.daysLeft,
      (r.priceCents / 100).toFixed(2),
      r.autoRenew ? 'yes' : 'no',
      r.lastNoticeAt ?? '',
    ]),
  );
}
