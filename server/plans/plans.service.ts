import { and, asc, desc, eq, inArray, sql } from 'drizzle-orm';
import type { ItemCategory } from '../../shared/pricebook';
import type { PlanTerms, PlanView } from '../../shared/schemas/plans';
import type { Db, Tx } from '../db/client';
import { agreements, plans, planVersions } from '../db/schema';
import { AppError, notFound } from '../http/errors';
import type { AppDeps } from '../deps';

type PlanRow = typeof plans.$inferSelect;
type VersionRow = typeof planVersions.$inferSelect;

export async function currentVersion(db: Db | Tx, planId: string): Promise<VersionRow | undefined> {
  const [v] = await db.select().from(planVersions).where(eq(planVersions.planId, planId)).orderBy(desc(planVersions.version)).limit(1);
  return v;
}

export function planViewOf(p: PlanRow, v: VersionRow): PlanView {
  return {
    id: p.id,
    code: p.code,
    name: p.name,
    description: p.description,
    active: p.active,
    sortOrder: p.sortOrder,
    versionId: v.id,
    version: v.version,
    yearlyPriceCents: v.yearlyPriceCents,
    additionalSystemCents: v.additionalSystemCents,
    coolingVisits: v.coolingVisits,
    heatingVisits: v.heatingVisits,
    repairDiscountBps: v.repairDiscountBps,
    diagnosticFeeWaived: v.diagnosticFeeWaived,
    priorityWindowHours: v.priorityWindowHours,
    extras: v.extras,
    discountCategories: v.discountCategories as ItemCategory[],
    warrantyLaborCovered: v.warrantyLaborCovered,
  };
}

/** Plans with their current terms; homeowners see only the ones on offer. */
export async function listPlans(deps: Pick<AppDeps, 'database'>, opts: { includeInactive: boolean }): Promise<PlanView[]> {
  const { db } = deps.database;
  const rows = await db
    .select()
    .from(plans)
    .where(opts.includeInactive ? undefined : eq(plans.active, true))
    .orderBy(asc(plans.sortOrder), asc(plans.name));
  const out: PlanView[] = [];
  const counts = opts.includeInactive
    ? await db
        .select({ planId: planVersions.planId, n: sql<number>`count(*)::int` })
        .from(agreements)
        .innerJoin(planVersions, eq(agreements.planVersionId, planVersions.id))
        .where(inArray(agreements.status, ['active', 'renewal_due', 'past_due']))
        .groupBy(planVersions.planId)
    : [];
  for (const p of rows) {
    const v = await currentVersion(db, p.id);
    if (!v) continue;
    out.push({ ...planViewOf(p, v), ...(opts.includeInactive ? { agreementsCount: counts.find((c) => c.planId === p.id)?.n ?? 0 } : {}) });
  }
  return out;
}

function versionValues(planId: string, version: number, t: PlanTerms) {
  return {
    planId,
    version,
    yearlyPriceCents: t.yearlyPriceCents,
    additionalSystemCents: t.additionalSystemCents,
    coolingVisits: t.coolingVisits,
    heatingVisits: t.heatingVisits,
    repairDiscountBps: t.repairDiscountBps,
    diagnosticFeeWaived: t.diagnosticFeeWaived,
    priorityWindowHours: t.priorityWindowHours,
    extras: t.extras,
    discountCategories: t.discountCategories,
    warrantyLaborCovered: t.warrantyLaborCovered,
  };
}

export async function createPlan(deps: Pick<AppDeps, 'database'>, input: PlanTerms & { code: string }): Promise<PlanView> {
  const { db } = deps.database;
  return db.transaction(async (tx) => {
    const [{ max }] = (await tx.select({ max: sql<number>`coalesce(max(${plans.sortOrder}), -1)::int` }).from(plans)) as [{ max: number }];
    const [p] = await tx
      .insert(plans)
      .values({ code: input.code, name: input.name, description: input.description, sortOrder: max + 1 })
      .returning();
    const [v] = await tx
      .insert(planVersions)
      .values(versionValues(p!.id, 1, input))
      .returning();
    return planViewOf(p!, v!);
  });
}

const sameTerms = (v: VersionRow, t: PlanTerms) =>
  v.yearlyPriceCents === t.yearlyPriceCents &&
  v.additionalSystemCents === t.additionalSystemCents &&
  v.coolingVisits === t.coolingVisits &&
  v.heatingVisits === t.heatingVisits &&
  v.repairDiscountBps === t.repairDiscountBps &&
  v.diagnosticFeeWaived === t.diagnosticFeeWaived &&
  v.priorityWindowHours === t.priorityWindowHours &&
  JSON.stringify(v.extras) === JSON.stringify(t.extras) &&
  JSON.stringify([...v.discountCategories].sort()) === JSON.stringify([...t.discountCategories].sort()) &&
  v.warrantyLaborCovered === t.warrantyLaborCovered;

/** Saving terms writes a new version; agreements already sold keep pointing at theirs. */
export async function updatePlan(deps: Pick<AppDeps, 'database'>, id: string, input: PlanTerms): Promise<PlanView> {
  const { db } = deps.database;
  return db.transaction(async (tx) => {
    const [p] = await tx.select().from(plans).where(eq(plans.id, id)).for('update');
    if (!p) throw notFound('That plan');
    const latest = await currentVersion(tx, id);
    const [updated] = await tx.update(plans).set({ name: input.name, description: input.description }).where(eq(plans.id, id)).returning();
    if (latest && sameTerms(latest, input)) return planViewOf(updated!, latest);
    const [v] = await tx
      .insert(planVersions)
      .values(versionValues(id, (latest?.version ?? 0) + 1, input))
      .returning();
    return planViewOf(updated!, v!);
  });
}

export async function setPlanActive(deps: Pick<AppDeps, 'database'>, id: string, active: boolean): Promise<PlanView> {
  const { db } = deps.database;
  const [p] = await db.update(plans).set({ active }).where(eq(plans.id, id)).returning();
  if (!p) throw notFound('That plan');
  const v = await currentVersion(db, id);
  if (!v) throw new AppError(409, 'conflict', 'That plan has no terms yet.');
  return planViewOf(p, v);
}

export async function planVersionsOf(deps: Pick<AppDeps, 'database'>, id: string): Promise<PlanView[]> {
  const { db } = deps.database;
  const [p] = await db.select().from(plans).where(eq(plans.id, id));
  if (!p) throw notFound('That plan');
  const vs = await db
    .select()
    .from(planVersions)
    .where(and(eq(planVersions.planId, id)))
    .orderBy(desc(planVersions.version));
  return vs.map((v) => planViewOf(p, v));
}
