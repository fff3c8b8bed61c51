import { inArray, sql } from 'drizzle-orm';
import { coveredThroughLabel, lastPaidTerm, termOn } from '../../shared/agreement-terms';
import { AGREEMENT_STATUS_LABELS } from '../../shared/agreements';
import { coverageFor } from '../../shared/coverage';
import { daysBetween, renewalWindowOpens } from '../../shared/renewals';
import type { HomeAgreement, HomeNextVisit, HomeSummary } from '../../shared/schemas/home';
import type { SessionUser } from '../../shared/schemas/session';
import { dateTimeFormat } from '../../shared/date-formats';
import { groupServiceHistory, technicianToTell, visitTimeLabels, type VisitStatus } from '../../shared/visits';
import { agreements, company, invoices, plans, planVersions, properties, quotes } from '../db/schema';
import { localDate, notSetUp } from '../company/company';
import { assembleTerms, termRowsJson, type TermRow } from '../agreements/term-in-force';
import { customerVisit, customerVisitsJson, type CustomerVisitRow } from '../customers/customer-page';
import type { AppDeps } from '../deps';
import { notFound } from '../http/errors';
import { preparedSql } from '../db/prepared-sql';

const SHOWN = ['active', 'renewal_due', 'past_due', 'lapsed'] as const;

type SummaryAgreement = Pick<typeof agreements.$inferSelect, 'id' | 'propertyId' | 'status' | 'startsOn' | 'endsOn' | 'planVersionId' | 'priceCents'> &
  Pick<typeof planVersions.$inferSelect, 'coolingVisits' | 'heatingVisits' | 'repairDiscountBps' | 'diagnosticFeeWaived' | 'priorityWindowHours'> & {
    planName: string;
    planActive: boolean;
    label: string;
    terms: TermRow[];
  };

type SummaryRow = {
  company: { timeZone: string; coolingStartMonth: number; heatingStartMonth: number; diagnosticFeeCents: number } | null;
  agreements: SummaryAgreement[];
  visits: CustomerVisitRow[];
  owed: { count: number; balance: number | string; firstId: string | null };
  waiting: { count: number; firstId: string | null };
};

// The company's settings, the agreements with their plans and terms, the visits, what is owed and
// the quotes waiting: one statement, one round trip, whatever the household holds.
const summaryStatement = preparedSql<SummaryRow, 'customerId'>(
  'home_summary',
  ['customerId'],
  (p) => sql`
    select
      (select json_build_object('timeZone', ${company.timeZone}, 'coolingStartMonth', ${company.coolingStartMonth},
                                'heatingStartMonth', ${company.heatingStartMonth}, 'diagnosticFeeCents', ${company.diagnosticFeeCents})
         from ${company} where ${company.id} = 1) as company,
      (select coalesce(json_agg(json_build_object(
          'id', ${agreements.id}, 'propertyId', ${agreements.propertyId}, 'status', ${agreements.status},
          'startsOn', ${agreements.startsOn}, 'endsOn', ${agreements.endsOn}, 'planVersionId', ${agreements.planVersionId}, 'priceCents', ${agreements.priceCents},
          'planName', ${plans.name}, 'planActive', ${plans.active}, 'label', ${properties.label},
          'coolingVisits', ${planVersions.coolingVisits}, 'heatingVisits', ${planVersions.heatingVisits}, 'repairDiscountBps', ${planVersions.repairDiscountBps},
          'diagnosticFeeWaived', ${planVersions.diagnosticFeeWaived}, 'priorityWindowHours', ${planVersions.priorityWindowHours},
          'terms', ${termRowsJson(sql`t.agreement_id = ${agreements.id}`)}
        ) order by ${agreements.endsOn}), '[]')
       from ${agreements}
       join ${planVersions} on ${planVersions.id} = ${agreements.planVersionId}
       join ${plans} on ${plans.id} = ${planVersions.planId}
       join ${properties} on ${properties.id} = ${agreements.propertyId}
       where ${agreements.customerId} = ${p.customerId} and ${inArray(agreements.status, [...SHOWN])}) as agreements,
      ${customerVisitsJson(p.customerId)} as visits,
      (select json_build_object('count', count(*), 'balance', coalesce(sum(greatest(${invoices.totalCents} - ${invoices.paidCents}, 0)), 0),
                                'firstId', (array_agg(${invoices.id} order by ${invoices.issuedAt}))[1])
         from ${invoices} where ${invoices.customerId} = ${p.customerId} and ${invoices.status} = 'open') as owed,
      (select json_build_object('count', count(*), 'firstId', (array_agg(${quotes.id} order by ${quotes.sentAt}))[1])
         from ${quotes} where ${quotes.customerId} = ${p.customerId} and ${quotes.status} = 'sent') as waiting`,
);

/**
 * What the homeowner asks first: the plan and when it ends, the tune-ups left this season, the
 * next visit, what is owed and the quotes waiting for an answer. A fixed number of statements, whatever the household holds.
 */
export async function homeSummary(deps: Pick<AppDeps, 'database' | 'clock'>, user: SessionUser): Promise<HomeSummary> {
  const { db } = deps.database;
  const customerId = user.customerId;
  if (!customerId) throw notFound('Your household');
  const now = deps.clock();
  const {
    rows: [r],
  } = await summaryStatement(db, { customerId });
  if (!r?.company) throw notSetUp();
  const co = r.company;
  const today = localDate(now, co.timeZone);
  const rows = r.agreements;
  const visitRows = r.visits.map((v) => customerVisit(v, now));
  const terms = assembleTerms(
    rows,
    rows.flatMap((a) => a.terms),
  );
  const seasons = { coolingStartMonth: co.coolingStartMonth, heatingStartMonth: co.heatingStartMonth };
  const list: HomeAgreement[] = rows.map((a) => {
    const { planName, planActive, label } = a;
    const all = terms.get(a.id) ?? [];
    const term = termOn(all, today) ?? all[all.length - 1] ?? { startsOn: a.startsOn, endsOn: a.endsOn };
    const cov = coverageFor({
      agreement: {
        status: a.status,
        startsOn: term.startsOn,
        endsOn: term.endsOn,
        plan: {
          name: planName,
          coolingVisits: a.coolingVisits,
          heatingVisits: a.heatingVisits,
          repairDiscountBps: a.repairDiscountBps,
          diagnosticFeeWaived: a.diagnosticFeeWaived,
          priorityWindowHours: a.priorityWindowHours,
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
        technicianName: technicianToTell(next.status as VisitStatus, next.technicianName),
      }
    : null;
  return {
    agreements: list,
    nextVisit,
    invoicesDue: { count: Number(r.owed.count), balanceCents: Number(r.owed.balance), firstId: r.owed.firstId },
    quotesWaiting: { count: Number(r.waiting.count), firstId: r.waiting.firstId },
  };
}
