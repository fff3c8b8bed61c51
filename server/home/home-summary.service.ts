import { and, eq, inArray, sql } from 'drizzle-orm';
import { coveredThroughLabel, lastPaidTerm, termOn } from '../../shared/agreement-terms';
import { AGREEMENT_STATUS_LABELS } from '../../shared/agreements';
import { coverageFor } from '../../shared/coverage';
import { daysBetween, renewalWindowOpens } from '../../shared/renewals';
import type { HomeAgreement, HomeNextVisit, HomeSummary } from '../../shared/schemas/home';
import type { SessionUser } from '../../shared/schemas/session';
import { dateTimeFormat } from '../../shared/date-formats';
import { groupServiceHistory, visitTimeLabels, type VisitStatus } from '../../shared/visits';
import { agreements, invoices, plans, planVersions, properties, quotes } from '../db/schema';
import { companyRow, localDate } from '../company/company';
import { termsOf } from '../agreements/term-in-force';
import { customerVisits } from '../customers/customer-page';
import type { AppDeps } from '../deps';
import { notFound } from '../http/errors';

const SHOWN = ['active', 'renewal_due', 'past_due', 'lapsed'] as const;

/**
 * What the homeowner asks first: the plan and when it ends, the tune-ups left this season, the
 * next visit, what is owed and the quotes waiting for an answer. A fixed number of statements, whatever the household holds.
 */
export async function homeSummary(deps: Pick<AppDeps, 'database' | 'clock'>, user: SessionUser): Promise<HomeSummary> {
  const { db } = deps.database;
  const customerId = user.customerId;
  if (!customerId) throw notFound('Your household');
  const now = deps.clock();
  const co = await companyRow(db);
  const today = localDate(now, co.timeZone);
  const [rows, visitRows, [due]] = await Promise.all([
    db
      .select({ a: agreements, planName: plans.name, planActive: plans.active, label: properties.label, v: planVersions })
      .from(agreements)
      .innerJoin(planVersions, eq(planVersions.id, agreements.planVersionId))
      .innerJoin(plans, eq(plans.id, planVersions.planId))
      .innerJoin(properties, eq(properties.id, agreements.propertyId))
      .where(and(eq(agreements.customerId, customerId), inArray(agreements.status, [...SHOWN])))
      .orderBy(agreements.endsOn),
    customerVisits(db, customerId, now),
    // What is owed and the quotes waiting, in one statement.
    db
      .execute<{ owed_count: number; owed_balance: string; owed_first: string | null; quotes_count: number; quotes_first: string | null }>(
        sql`
      select o.count as owed_count, o.balance as owed_balance, o.first_id as owed_first, q.count as quotes_count, q.first_id as quotes_first
      from (select count(*)::int as count, coalesce(sum(greatest(${invoices.totalCents} - ${invoices.paidCents}, 0)), 0)::bigint as balance,
                   (array_agg(${invoices.id} order by ${invoices.issuedAt}))[1] as first_id
            from ${invoices} where ${invoices.customerId} = ${customerId} and ${invoices.status} = 'open') o,
           (select count(*)::int as count, (array_agg(${quotes.id} order by ${quotes.sentAt}))[1] as first_id
            from ${quotes} where ${quotes.customerId} = ${customerId} and ${quotes.status} = 'sent') q`,
      )
      .then((r) => r.rows),
  ]);
  const terms = await termsOf(
    db,
    rows.map((r) => r.a),
  );
  const seasons = { coolingStartMonth: co.coolingStartMonth, heatingStartMonth: co.heatingStartMonth };
  const list: HomeAgreement[] = rows.map(({ a, planName, planActive, label, v }) => {
    const all = terms.get(a.id) ?? [];
    const term = termOn(all, today) ?? all[all.length - 1] ?? { startsOn: a.startsOn, endsOn: a.endsOn };
    const cov = coverageFor({
      agreement: {
        status: a.status,
        startsOn: term.startsOn,
        endsOn: term.endsOn,
        plan: {
          name: planName,
          coolingVisits: v.coolingVisits,
          heatingVisits: v.heatingVisits,
          repairDiscountBps: v.repairDiscountBps,
          diagnosticFeeWaived: v.diagnosticFeeWaived,
          priorityWindowHours: v.priorityWindowHours,
        },
      },
      visit: { id: 'today', kind: 'tune_up', status: 'requested', onDate: today },
      termVisits: visitRows
        .filter((x) => x.propertyId === a.propertyId)
        .map((x) => ({ id: x.id, kind: x.kind as 'tune_up' | 'service_call', status: x.status, onDate: localDate(new Date(x.startsAt), co.timeZone) })),
      diagnosticFeeCents: co.diagnosticFeeCents,
      seasons,
    });
    const season = cov.tuneUpSeason ?? 'cooling';
    const allowance = cov.allowances.find((x) => x.season === season);
    const canRenew =
      (a.status === 'renewal_due' || a.status === 'past_due' || a.status === 'lapsed' || (a.status === 'active' && today >= renewalWindowOpens(a.endsOn))) && planActive;
    return {
      id: a.id,
      propertyId: a.propertyId,
      propertyLabel: label,
      planName,
      status: a.status,
      statusLabel: AGREEMENT_STATUS_LABELS[a.status],
      lastDayLabel: coveredThroughLabel(lastPaidTerm(all) ?? a),
      daysLeft: daysBetween(today, a.endsOn),
      canRenew,
      season,
      included: allowance?.included ?? 0,
      used: allowance?.used ?? 0,
      left: cov.covered ? (allowance?.left ?? 0) : 0,
    };
  });
  const { upcoming } = groupServiceHistory(
    visitRows.filter((x) => x.status !== 'canceled'),
    now,
  );
  const next = upcoming[0];
  const nextVisit: HomeNextVisit | null = next
    ? {
        id: next.id,
        reasonLabel: next.reasonLabel,
        status: next.status as VisitStatus,
        statusLabel: next.statusLabel,
        dayLabel: dateTimeFormat('en-US', { weekday: 'short', day: 'numeric', month: 'short', timeZone: co.timeZone }).format(new Date(next.windowStart)),
        arrivalLabel: visitTimeLabels({ windowStart: next.windowStart, windowEnd: next.windowEnd, startsAt: next.startsAt, endsAt: next.startsAt }, co.timeZone).arrival,
        technicianName: next.technicianName,
      }
    : null;
  return {
    agreements: list,
    nextVisit,
    invoicesDue: { count: Number(due?.owed_count ?? 0), balanceCents: Number(due?.owed_balance ?? 0), firstId: due?.owed_first ?? null },
    quotesWaiting: { count: Number(due?.quotes_count ?? 0), firstId: due?.quotes_first ?? null },
  };
}
