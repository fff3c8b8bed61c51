import { and, asc, eq, isNull } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { tuneUpSeasonOf } from '../../../shared/coverage';
import { evaluateReadings, type VisitReadings } from '../../../shared/hvac';
import { worstStatus } from '../../../shared/schemas/field';
import type { Tx } from '../client';
import * as t from '../schema';
import { seededRandom, type Random } from './random';

const OUTDOOR = new Set(['condensing_unit', 'heat_pump']);
const tenth = (x: number) => Math.round(x * 10) / 10;

// Invented demo readings around typical healthy values, with the odd weak part so the charts have
// something to show. Values recalled from common practice, not measured.
function coolingReadings(rnd: Random, e: typeof t.equipment.$inferSelect, elevationFt: number | null): VisitReadings {
  const ret = 74 + rnd.int(0, 30) / 10;
  const split = 17 + rnd.int(0, 40) / 10;
  const outdoor = 84 + rnd.int(0, 10);
  const refrigerant = e.refrigerant ?? 'R-410A';
  const weakCap = rnd.chance(0.12);
  return {
    mode: 'cooling',
    ...(elevationFt !== null ? { altitudeFt: elevationFt } : {}),
    returnDryBulbF: tenth(ret),
    supplyDryBulbF: tenth(ret - split),
    returnRelativeHumidityPct: 45 + rnd.int(0, 10),
    outdoorDryBulbF: outdoor,
    refrigerant,
    meteringDevice: e.meteringDevice ?? 'txv',
    suctionPressurePsig: 118 + rnd.int(0, 12),
    suctionLineTempF: 50 + rnd.int(0, 6),
    liquidPressurePsig: 330 + rnd.int(0, 40),
    liquidLineTempF: 96 + rnd.int(0, 6),
    subcoolingTargetF: 10,
    capacitors: { compressor: { ratedUf: 45, measuredUf: weakCap ? 40.5 : 43.5 + rnd.int(0, 20) / 10 } },
    ...(e.ratedAmps ? { compressorAmps: tenth(e.ratedAmps * (0.7 + rnd.int(0, 15) / 100)), compressorRatedLoadAmps: e.ratedAmps } : {}),
    controlVoltageVac: 24 + rnd.int(0, 20) / 10,
  };
}

function heatingReadings(rnd: Random): VisitReadings {
  const ret = 67 + rnd.int(0, 3);
  return {
    mode: 'heating',
    returnDryBulbF: ret,
    supplyDryBulbF: ret + 40 + rnd.int(0, 15),
    riseRangeF: { min: 35, max: 65 },
    controlVoltageVac: 24 + rnd.int(0, 20) / 10,
  };
}

/**
 * Readings for the demo's completed tune-ups: the outdoor unit in the cooling season, the furnace
 * in the heating season, so "My home" shows a history from the first run.
 */
export async function seedFieldReadings(tx: Tx, zone: string): Promise<number> {
  const rnd = seededRandom(20260415);
  const done = await tx
    .select({ id: t.visits.id, propertyId: t.visits.propertyId, startsAt: t.visits.startsAt, completedAt: t.visits.completedAt, elevationFt: t.properties.elevationFt })
    .from(t.visits)
    .innerJoin(t.properties, eq(t.visits.propertyId, t.properties.id))
    .where(and(eq(t.visits.kind, 'tune_up'), eq(t.visits.status, 'done')))
    .orderBy(asc(t.visits.startsAt), asc(t.visits.id));
  const equipmentRows = await tx.select().from(t.equipment).where(isNull(t.equipment.archivedAt)).orderBy(asc(t.equipment.createdAt), asc(t.equipment.id));
  const byProperty = new Map<string, (typeof t.equipment.$inferSelect)[]>();
  for (const e of equipmentRows) byProperty.set(e.propertyId, [...(byProperty.get(e.propertyId) ?? []), e]);

  const [company] = await tx.select({ coolingStartMonth: t.company.coolingStartMonth, heatingStartMonth: t.company.heatingStartMonth }).from(t.company).limit(1);
  const rows: (typeof t.visitReadings.$inferInsert)[] = [];
  for (const v of done) {
    const season = tuneUpSeasonOf(DateTime.fromJSDate(v.startsAt, { zone }).toISODate()!, company);
    const items = byProperty.get(v.propertyId) ?? [];
    const system = season === 'cooling' ? items.find((e) => OUTDOOR.has(e.kind)) : items.find((e) => e.kind === 'gas_furnace');
    if (!system) continue;
    const readings = season === 'cooling' ? coolingReadings(rnd, system, v.elevationFt) : heatingReadings(rnd);
    const checks = evaluateReadings(readings);
    rows.push({ visitId: v.id, propertyId: v.propertyId, equipmentId: system.id, readings, checks, worstStatus: worstStatus(checks), recordedAt: v.completedAt ?? v.startsAt });
  }
  for (let i = 0; i < rows.length; i += 200) await tx.insert(t.visitReadings).values(rows.slice(i, i + 200));
  return rows.length;
}
