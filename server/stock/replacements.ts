import { and, eq, inArray } from 'drizzle-orm';
import { findReplacements, type PartCandidate, type ReplacementResult } from '../../shared/part-matching';
import type { ReplacementSearch } from '../../shared/schemas/pricebook';
import type { SessionUser } from '../../shared/schemas/session';
import type { AppDeps } from '../deps';
import { priceBookItems, stockLevels, stockLocations } from '../db/schema';
import { reachableVisit, technicianOf } from '../quotes/visit-access';
import { truckOf } from './stock.service';

/**
 * The parts that can replace a failed motor or capacitor, from the price book and where each is
 * stocked: this truck (the visit's technician, else the caller's), other trucks, the shop, then
 * parts to order. The matching itself is shared/part-matching.ts.
 */
export async function searchReplacements(deps: Pick<AppDeps, 'database'>, user: SessionUser, input: ReplacementSearch): Promise<ReplacementResult> {
  const { db } = deps.database;
  const visit = input.visitId ? await reachableVisit(db, user, input.visitId) : null;
  const technicianId = visit?.technicianId ?? (await technicianOf(db, user))?.id ?? null;
  const truck = await truckOf(db, technicianId);
  const categories = input.failed.category === 'motor' ? ['motor', 'capacitor'] : ['capacitor'];
  const items = await db
    .select()
    .from(priceBookItems)
    .where(and(eq(priceBookItems.active, true), inArray(priceBookItems.category, categories as ('motor' | 'capacitor')[])));
  if (!items.length) return { fits: [], refused: [] };
  const levels = await db
    .select({ itemId: stockLevels.itemId, quantity: stockLevels.quantity, location: { id: stockLocations.id, kind: stockLocations.kind, name: stockLocations.name } })
    .from(stockLevels)
    .innerJoin(stockLocations, eq(stockLevels.locationId, stockLocations.id))
    .where(
      inArray(
        stockLevels.itemId,
        items.map((i) => i.id),
      ),
    );
  const candidates: PartCandidate[] = [];
  for (const item of items) {
    const base = { itemId: item.id, sku: item.sku, name: item.name, spec: item.spec ?? null };
    const at = levels.filter((l) => l.itemId === item.id && l.quantity > 0);
    if (!at.length) candidates.push({ ...base, location: null, quantity: 0 });
    for (const l of at) candidates.push({ ...base, location: l.location, quantity: l.quantity });
  }
  return findReplacements({ failed: input.failed, candidates, thisTruckId: truck?.id ?? null });
}
