import { and, asc, desc, eq, gte, isNull, lt, ne, type SQL } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { EQUIPMENT_KIND_LABELS, type EquipmentKind } from '../../shared/equipment';
import { AGREEMENT_STATUS_LABELS } from '../../shared/agreements';
import { COVERING_STATUSES, coverageFor, type Coverage, type CoverageVisit } from '../../shared/coverage';
import type { ItemCategory } from '../../shared/pricebook';
import type { SeasonSettings } from '../../shared/seasons';
import type { FieldEquipment, TodayVisit } from '../../shared/schemas/field';
import type { SessionUser } from '../../shared/schemas/session';
import { timeRangeLabel, VISIT_REASON_LABELS, VISIT_STATUS_LABELS, visitTimeLabels } from '../../shared/visits';
import type { Db, Tx } from '../db/client';
import { lastPaidTerm, termOn } from '../../shared/agreement-terms';
import { termsOf } from '../agreements/term-in-force';
import { agreements, customers, equipment, planVersions, plans, properties, technicians, users, visits } from '../db/schema';
import { companyRow, localDate } from '../company/company';
import { notFound } from '../http/errors';

export type VisitRow = typeof visits.$inferSelect;
export type PropertyRow = typeof properties.$inferSelect;
export type EquipmentRow = typeof equipment.$inferSelect;

export interface CompanyInfo {
  name: string;
  timeZone: string;
  diagnosticFeeCents: number;
  phone: string;
  /** The owner's season months: coverage and the checklist count seasons by them. */
  seasons: SeasonSettings;
}

export async function companyInfo(db: Db | Tx): Promise<CompanyInfo> {
  const { name, timeZone, diagnosticFeeCents, phone, coolingStartMonth, heatingStartMonth } = await companyRow(db);
  return { name, timeZone, diagnosticFeeCents, phone, seasons: { coolingStartMonth, heatingStartMonth } };
}

/** "9–11 am" in the company's zone: the one range style (timeRangeLabel). */
export function windowLabel(start: Date, end: Date, zone: string): string {
  return timeRangeLabel(start, end, zone);
}

export function addressOf(p: Pick<PropertyRow, 'street' | 'unit' | 'city' | 'state' | 'zip'>): string {
  return `${p.street}${p.unit ? `, ${p.unit}` : ''}, ${p.city}, ${p.state} ${p.zip}`;
}

export function equipmentLabel(e: Pick<EquipmentRow, 'kind' | 'make' | 'model'>): string {
  const name = [e.make, e.model].filter(Boolean).join(' ');
  return `${EQUIPMENT_KIND_LABELS[e.kind as EquipmentKind] ?? e.kind}${name ? ` · ${name}` : ''}`;
}

export function fieldEquipment(e: EquipmentRow, today: string): FieldEquipment {
  const age = e.installedOn ? Math.max(0, Math.floor(DateTime.fromISO(today).diff(DateTime.fromISO(e.installedOn), 'years').years)) : null;
  return {
    id: e.id,
    kind: e.kind,
    kindLabel: EQUIPMENT_KIND_LABELS[e.kind as EquipmentKind] ?? e.kind,
    make: e.make,
    model: e.model,
    serial: e.serial,
    installedOn: e.installedOn,
    ageYears: age,
    refrigerant: e.refrigerant,
    meteringDevice: e.meteringDevice,
    capacityBtuh: e.capacityBtuh,
    nominalTons: e.capacityBtuh ? Math.round((e.capacityBtuh / 12000) * 10) / 10 : null,
    volts: e.volts,
    ratedAmps: e.ratedAmps,
    warrantyEndsOn: e.warrantyEndsOn,
    underWarranty: e.warrantyEndsOn ? e.warrantyEndsOn >= today : null,
    filterSize: e.filterSize,
    location: e.location,
    compressorType: e.compressorType,
    maxCompressorHz: e.maxCompressorHz,
    maxExternalStaticInWc: e.maxExternalStaticInWc,
  };
}

/**
 * The visit, if this user may work on it: a technician only their own assigned visits, the owner
 * any. Anything else is 404 so visit ids are not confirmed to outsiders.
 */
export async function visitForStaff(db: Db | Tx, user: SessionUser, visitId: string): Promise<VisitRow> {
  const [row] = await db.select().from(visits).where(eq(visits.id, visitId)).limit(1);
  if (!row) throw notFound('That visit');
  if (user.role === 'owner') return row;
  if (user.role === 'technician' && row.technicianId) {
    const [tech] = await db.select({ userId: technicians.userId }).from(technicians).where(eq(technicians.id, row.technicianId)).limit(1);
    if (tech?.userId === user.id) return row;
  }
  throw notFound('That visit');
}

export async function propertyEquipment(db: Db | Tx, propertyId: string): Promise<EquipmentRow[]> {
  return db
    .select()
    .from(equipment)
    .where(and(eq(equipment.propertyId, propertyId), isNull(equipment.archivedAt)))
    .orderBy(asc(equipment.createdAt), asc(equipment.id));
}

/**
 * Coverage of one visit under the agreement it was booked on (or the property's), judged by the
 * term in force on the visit's date: a renewal paid early leaves the current term's benefits in
 * place until its last day.
 */
export async function visitCoverage(db: Db | Tx, visit: VisitRow, info: CompanyInfo): Promise<Coverage> {
  return (await visitCoverageAndPlan(db, visit, info)).coverage;
}

/** The plan's choices that quotes price with: which categories take the repair discount, and labor on warranty parts. */
export interface QuotePlanChoices {
  discountCategories: ItemCategory[];
  warrantyLaborCovered: boolean;
}

/** visitCoverage, with the quote choices of the plan version in force (null without an agreement). */
export async function visitCoverageAndPlan(db: Db | Tx, visit: VisitRow, info: CompanyInfo): Promise<{ coverage: Coverage; plan: QuotePlanChoices | null }> {
  const onDate = localDate(visit.startsAt, info.timeZone);
  const current: CoverageVisit = { id: visit.id, kind: visit.kind, status: visit.status, onDate };
  const none = () => ({
    coverage: coverageFor({ agreement: null, visit: current, termVisits: [], diagnosticFeeCents: info.diagnosticFeeCents, seasons: info.seasons }),
    plan: null,
  });
  const booked = visit.agreementId ? await db.select().from(agreements).where(eq(agreements.id, visit.agreementId)).limit(1) : [];
  // A visit booked without the agreement still counts under the one whose term holds its date.
  const candidates = booked.length
    ? booked
    : await db
        .select()
        .from(agreements)
        .where(and(eq(agreements.propertyId, visit.propertyId), ne(agreements.status, 'canceled')))
        .orderBy(desc(agreements.endsOn));
  const terms = await termsOf(db, candidates);
  const pick = candidates.map((a) => ({ a, term: termOn(terms.get(a.id)!, onDate) })).find((x) => x.term) ?? (booked[0] ? { a: booked[0], term: null } : null);
  if (!pick) return none();
  const { a } = pick;
  // Outside every term, the nearest one tells the technician why: the latest that began by then, else the first.
  const list = terms.get(a.id)!;
  const term = pick.term ?? [...list].reverse().find((t) => t.startsOn <= onDate) ?? list[0] ?? { startsOn: a.startsOn, endsOn: a.endsOn, planVersionId: a.planVersionId };
  const [p] = await db
    .select({
      planName: plans.name,
      coolingVisits: planVersions.coolingVisits,
      heatingVisits: planVersions.heatingVisits,
      repairDiscountBps: planVersions.repairDiscountBps,
      diagnosticFeeWaived: planVersions.diagnosticFeeWaived,
      priorityWindowHours: planVersions.priorityWindowHours,
      discountCategories: planVersions.discountCategories,
      warrantyLaborCovered: planVersions.warrantyLaborCovered,
    })
    .from(planVersions)
    .innerJoin(plans, eq(planVersions.planId, plans.id))
    .where(eq(planVersions.id, term.planVersionId))
    .limit(1);
  if (!p) return none();

  const zoneStart = DateTime.fromISO(term.startsOn, { zone: info.timeZone }).toJSDate();
  const zoneEnd = DateTime.fromISO(term.endsOn, { zone: info.timeZone }).toJSDate();
  const termVisits = await db
    .select({ id: visits.id, kind: visits.kind, status: visits.status, startsAt: visits.startsAt })
    .from(visits)
    .where(and(eq(visits.propertyId, visit.propertyId), gte(visits.startsAt, zoneStart), lt(visits.startsAt, zoneEnd)));
  const coverage = coverageFor({
    agreement: {
      status: a.status,
      startsOn: term.startsOn,
      endsOn: term.endsOn,
      paidUntil: (lastPaidTerm(list) ?? a).endsOn,
      plan: {
        name: p.planName,
        coolingVisits: p.coolingVisits,
        heatingVisits: p.heatingVisits,
        repairDiscountBps: p.repairDiscountBps,
        diagnosticFeeWaived: p.diagnosticFeeWaived,
        priorityWindowHours: p.priorityWindowHours,
      },
    },
    visit: current,
    termVisits: termVisits.map((v) => ({ id: v.id, kind: v.kind, status: v.status, onDate: localDate(v.startsAt, info.timeZone) })),
    diagnosticFeeCents: info.diagnosticFeeCents,
    seasons: info.seasons,
  });
  return { coverage, plan: { discountCategories: p.discountCategories as ItemCategory[], warrantyLaborCovered: p.warrantyLaborCovered } };
}

/** Rows for the today list (and the visit header), joined the way the list shows them. */
export async function visitListRows(db: Db | Tx, where: SQL | undefined, info: CompanyInfo): Promise<TodayVisit[]> {
  const rows = await db
    .select({
      id: visits.id,
      kind: visits.kind,
      reason: visits.reason,
      status: visits.status,
      windowStart: visits.windowStart,
      windowEnd: visits.windowEnd,
      startsAt: visits.startsAt,
      endsAt: visits.endsAt,
      customerName: customers.name,
      street: properties.street,
      unit: properties.unit,
      city: properties.city,
      state: properties.state,
      zip: properties.zip,
      agreementId: agreements.id,
      agreementStatus: agreements.status,
      agreementStartsOn: agreements.startsOn,
      agreementEndsOn: agreements.endsOn,
      agreementPlanVersionId: agreements.planVersionId,
      agreementPriceCents: agreements.priceCents,
      planName: plans.name,
      technicianName: users.name,
    })
    .from(visits)
    .innerJoin(customers, eq(visits.customerId, customers.id))
    .innerJoin(properties, eq(visits.propertyId, properties.id))
    .leftJoin(agreements, eq(visits.agreementId, agreements.id))
    .leftJoin(planVersions, eq(agreements.planVersionId, planVersions.id))
    .leftJoin(plans, eq(planVersions.planId, plans.id))
    .leftJoin(technicians, eq(visits.technicianId, technicians.id))
    .leftJoin(users, eq(technicians.userId, users.id))
    .where(where)
    .orderBy(asc(visits.windowStart), asc(visits.startsAt), asc(visits.id));
  const held = new Map<string, Parameters<typeof termsOf>[1][number]>();
  for (const r of rows) {
    if (r.agreementId && r.agreementStatus && r.agreementStartsOn && r.agreementEndsOn && r.agreementPlanVersionId && r.agreementPriceCents !== null) {
      held.set(r.agreementId, {
        id: r.agreementId,
        status: r.agreementStatus,
        startsOn: r.agreementStartsOn,
        endsOn: r.agreementEndsOn,
        planVersionId: r.agreementPlanVersionId,
        priceCents: r.agreementPriceCents,
      });
    }
  }
  const terms = await termsOf(db, [...held.values()]);
  return rows.map((r) => {
    const onDate = localDate(r.startsAt, info.timeZone);
    // The term in force on the visit's day, not the latest one paid.
    const inTerm = r.agreementId !== null && termOn(terms.get(r.agreementId) ?? [], onDate) !== null;
    const covered = inTerm && r.agreementStatus !== null && COVERING_STATUSES.includes(r.agreementStatus);
    const label = r.agreementStatus ? `${r.planName ?? 'Plan'} · ${inTerm ? AGREEMENT_STATUS_LABELS[r.agreementStatus] : 'Term ended'}` : 'No plan';
    const times = visitTimeLabels(r, info.timeZone);
    return {
      id: r.id,
      kind: r.kind,
      reason: r.reason,
      reasonLabel: VISIT_REASON_LABELS[r.reason],
      status: r.status,
      statusLabel: VISIT_STATUS_LABELS[r.status],
      windowStart: r.windowStart.toISOString(),
      windowEnd: r.windowEnd.toISOString(),
      windowLabel: windowLabel(r.windowStart, r.windowEnd, info.timeZone),
      arrivalLabel: times.arrival,
      workLabel: times.work,
      customerName: r.customerName,
      address: addressOf(r),
      planStatus: { covered, label },
      technicianName: r.technicianName,
    };
  });
}
