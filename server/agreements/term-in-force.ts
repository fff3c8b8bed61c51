import { asc, eq, inArray, sql, type SQL } from 'drizzle-orm';
import { coveredThroughLabel, termLastDay, termOn, termRangeLabel, type TermRange } from '../../shared/agreement-terms';
import type { AgreementTermView } from '../../shared/schemas/plans';
import type { Db, Tx } from '../db/client';
import { agreements, agreementTerms, invoices, plans, planVersions } from '../db/schema';

export interface AgreementTerm extends TermRange {
  /** Null for a term known only from the agreement row (one made before terms were recorded). */
  id: string | null;
  planVersionId: string;
  priceCents: number;
  invoiceId: string | null;
  invoiceNumber: string | null;
  paidCents: number | null;
  source: string;
}

type AgreementDates = Pick<typeof agreements.$inferSelect, 'id' | 'startsOn' | 'endsOn' | 'planVersionId' | 'priceCents' | 'status'>;

/**
 * Every term of each agreement, oldest first. The agreement row holds the latest paid term (the
 * renewal engine works from its end); a range on the row that no term row records yet (an
 * agreement set up before terms were kept) counts as a term too. A pending agreement has none.
 */
export async function termsOf(db: Db | Tx, rows: readonly AgreementDates[]): Promise<Map<string, AgreementTerm[]>> {
  if (!rows.length) return new Map();
  const found = await db
    .select({ t: agreementTerms, number: invoices.number, paidCents: invoices.paidCents })
    .from(agreementTerms)
    .leftJoin(invoices, eq(invoices.id, agreementTerms.invoiceId))
    .where(
      inArray(
        agreementTerms.agreementId,
        rows.map((r) => r.id),
      ),
    )
    .orderBy(asc(agreementTerms.startsOn));
  return assembleTerms(
    rows,
    found.map(({ t, number, paidCents }) => ({ ...t, number, paidCents })),
  );
}

/** A term row with its invoice's number and what was paid on it, as a statement reads them. */
export interface TermRow {
  id: string;
  agreementId: string;
  startsOn: string;
  endsOn: string;
  planVersionId: string;
  priceCents: number;
  invoiceId: string | null;
  number: number | string | null;
  paidCents: number | null;
  source: string;
}

/**
 * The term rows that `where` picks (on \`t\`, the agreement_terms row), with their invoice's number
 * and what was paid, as one JSON array of TermRow oldest first: a subquery for statements that
 * bring an agreement's terms beside other things.
 */
export function termRowsJson(where: SQL): SQL {
  return sql`(select coalesce(json_agg(json_build_object(
      'id', t.id, 'agreementId', t.agreement_id, 'startsOn', t.starts_on, 'endsOn', t.ends_on, 'planVersionId', t.plan_version_id,
      'priceCents', t.price_cents, 'invoiceId', t.invoice_id, 'number', i.number, 'paidCents', i.paid_cents, 'source', t.source) order by t.starts_on), '[]')
    from agreement_terms t left join invoices i on i.id = t.invoice_id where ${where})`;
}

/** Every term of each agreement from its term rows (oldest first), as termsOf explains. */
export function assembleTerms(rows: readonly AgreementDates[], found: readonly TermRow[]): Map<string, AgreementTerm[]> {
  const out = new Map<string, AgreementTerm[]>(rows.map((r) => [r.id, []]));
  for (const t of found) {
    out.get(t.agreementId)?.push({
      id: t.id,
      startsOn: t.startsOn,
      endsOn: t.endsOn,
      planVersionId: t.planVersionId,
      priceCents: t.priceCents,
      invoiceId: t.invoiceId,
      invoiceNumber: t.number === null ? null : String(t.number),
      paidCents: t.paidCents,
      source: t.source,
    });
  }
  for (const r of rows) {
    const list = out.get(r.id)!;
    if (r.status === 'pending' || list.some((t) => t.startsOn === r.startsOn)) continue;
    list.push({
      id: null,
      startsOn: r.startsOn,
      endsOn: r.endsOn,
      planVersionId: r.planVersionId,
      priceCents: r.priceCents,
      invoiceId: null,
      invoiceNumber: null,
      paidCents: null,
      source: 'agreement',
    });
    list.sort((a, b) => (a.startsOn < b.startsOn ? -1 : 1));
  }
  return out;
}

/** The term of one agreement in force on `date` (see `termOn` in shared/agreement-terms.ts). */
export async function termInForce(db: Db | Tx, agreement: AgreementDates, date: string): Promise<AgreementTerm | null> {
  const terms = (await termsOf(db, [agreement])).get(agreement.id)!;
  return termOn(terms, date);
}

/** Every term of one agreement, as the office and the portal show them. */
export async function agreementTermViews(db: Db | Tx, a: AgreementDates, todayIso: string): Promise<AgreementTermView[]> {
  return (await agreementTermViewsFor(db, [a], todayIso)).get(a.id)!;
}

/** The terms of several agreements in two queries, whatever their number (the household page shows them all). */
export async function agreementTermViewsFor(db: Db | Tx, rows: readonly AgreementDates[], todayIso: string): Promise<Map<string, AgreementTermView[]>> {
  const byAgreement = await termsOf(db, rows);
  const versionIds = [...new Set([...byAgreement.values()].flat().map((t) => t.planVersionId))];
  const named = versionIds.length
    ? await db.select({ id: planVersions.id, name: plans.name }).from(planVersions).innerJoin(plans, eq(plans.id, planVersions.planId)).where(inArray(planVersions.id, versionIds))
    : [];
  return termViewsFrom(byAgreement, new Map(named.map((r) => [r.id, r.name])), todayIso);
}

/** Each agreement's terms as the office and the portal show them, given the plans' names by version. */
export function termViewsFrom(byAgreement: Map<string, AgreementTerm[]>, names: Map<string, string>, todayIso: string): Map<string, AgreementTermView[]> {
  const out = new Map<string, AgreementTermView[]>();
  for (const [id, terms] of byAgreement) {
    const inForce = termOn(terms, todayIso);
    out.set(
      id,
      terms.map((t) => ({
        startsOn: t.startsOn,
        endsOn: t.endsOn,
        lastDay: termLastDay(t),
        label: termRangeLabel(t),
        lastDayLabel: coveredThroughLabel(t),
        priceCents: t.priceCents,
        planName: names.get(t.planVersionId) ?? '',
        invoiceNumber: t.invoiceNumber,
        paidCents: t.paidCents,
        source: t.source,
        inForce: t === inForce,
        upcoming: t.startsOn > todayIso,
      })),
    );
  }
  return out;
}
