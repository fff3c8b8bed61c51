import { and, asc, eq } from 'drizzle-orm';
import { CHECK_LABELS, type PropertyReadings, type ReadingSeries, type SystemReadings, type VisitSummary } from '../../shared/schemas/field';
import type { SessionUser } from '../../shared/schemas/session';
import { assertCustomerAccess } from '../auth/access';
import { equipment, properties, visitReadings, visits } from '../db/schema';
import { notFound } from '../http/errors';
import { visitSummary } from '../field/summary';
import { companyInfo, equipmentLabel } from '../field/visit-data';
import type { AppDeps } from '../deps';

/**
 * A home's readings over time, per system and per check, from completed visits only. Each point
 * keeps the band it was judged against, so the chart can shade it.
 */
export async function propertyReadings(deps: Pick<AppDeps, 'database'>, user: SessionUser, propertyId: string): Promise<PropertyReadings> {
  const { db } = deps.database;
  const [property] = await db.select({ customerId: properties.customerId }).from(properties).where(eq(properties.id, propertyId));
  if (!property) throw notFound('That home');
  await assertCustomerAccess(db, user, property.customerId);
  const rows = await db
    .select({
      visitId: visitReadings.visitId,
      equipmentId: visitReadings.equipmentId,
      checks: visitReadings.checks,
      at: visits.startsAt,
      kind: equipment.kind,
      make: equipment.make,
      model: equipment.model,
    })
    .from(visitReadings)
    .innerJoin(visits, eq(visitReadings.visitId, visits.id))
    .innerJoin(equipment, eq(visitReadings.equipmentId, equipment.id))
    .where(and(eq(visitReadings.propertyId, propertyId), eq(visits.status, 'done')))
    .orderBy(asc(visits.startsAt), asc(visitReadings.id));

  const systems = new Map<string, SystemReadings & { byCheck: Map<string, ReadingSeries> }>();
  for (const r of rows) {
    let s = systems.get(r.equipmentId);
    if (!s) {
      s = { equipmentId: r.equipmentId, label: equipmentLabel(r), series: [], byCheck: new Map() };
      systems.set(r.equipmentId, s);
    }
    for (const c of r.checks) {
      let series = s.byCheck.get(c.check);
      if (!series) {
        series = { check: c.check, label: CHECK_LABELS[c.check] ?? c.check, unit: c.unit, points: [] };
        s.byCheck.set(c.check, series);
        s.series.push(series);
      }
      series.points.push({ visitId: r.visitId, recordedAt: r.at.toISOString(), value: c.value, status: c.status, expected: c.expected });
    }
  }
  return { propertyId, systems: [...systems.values()].map(({ byCheck: _b, ...s }) => s) };
}

/** One completed visit in plain words, for the household it belongs to (and staff who may see it). */
export async function homeownerVisitSummary(deps: Pick<AppDeps, 'database'>, user: SessionUser, visitId: string): Promise<VisitSummary> {
  const { db } = deps.database;
  const [visit] = await db.select().from(visits).where(eq(visits.id, visitId));
  if (!visit) throw notFound('That visit');
  await assertCustomerAccess(db, user, visit.customerId);
  // Homeowners see a summary once the visit is done; until then there is nothing to summarise.
  if (user.role === 'homeowner' && visit.status !== 'done') throw notFound('That visit summary');
  return visitSummary(db, visit, await companyInfo(db));
}
