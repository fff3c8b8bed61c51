import { and, asc, desc, eq, ilike, inArray, lt, or, sql, type SQL } from 'drizzle-orm';
import {
  STOCK_MAX,
  type Restock,
  type StockListQuery,
  type StockLocation,
  type StockLocationInput,
  type StockRow,
  type StockRowInput,
  type Transfer,
} from '../../shared/schemas/pricebook';
import type { PartsUsed, StockMovement, StockMovementKind } from '../../shared/schemas/quotes';
import type { SessionUser } from '../../shared/schemas/session';
import type { AppDeps } from '../deps';
import type { Db, Tx } from '../db/client';
import { priceBookItems, stockLevels, stockLocations, stockMovements, technicians, users } from '../db/schema';
import { isStaffOffice } from '../auth/access';
import { AppError, notFound } from '../http/errors';
import { reachableVisit, technicianOf } from '../quotes/visit-access';

// Truck and shop stock. A take is one conditional UPDATE … WHERE quantity >= n: two devices
// taking the last part at once cannot both succeed, and the loser gets a 409 naming the part.

type Deps = Pick<AppDeps, 'database' | 'clock'>;

export class OutOfStock extends AppError {
  constructor(sku: string, name: string, location: string, left: number, wanted: number) {
    super(409, 'out_of_stock', `${location} has ${left} of ${sku} ${name}; ${wanted} ${wanted === 1 ? 'is' : 'are'} needed.`);
  }
}

export async function locationViews(db: Db | Tx, where?: SQL): Promise<StockLocation[]> {
  const rows = await db
    .select({ l: stockLocations, technicianName: users.name })
    .from(stockLocations)
    .leftJoin(technicians, eq(stockLocations.technicianId, technicians.id))
    .leftJoin(users, eq(technicians.userId, users.id))
    .where(where)
    .orderBy(desc(stockLocations.kind), asc(stockLocations.name));
  return rows.map(({ l, technicianName }) => ({ id: l.id, kind: l.kind, name: l.name, technicianId: l.technicianId, technicianName }));
}

/** The technician's own truck, or null. */
export async function truckOf(db: Db | Tx, technicianId: string | null): Promise<StockLocation | null> {
  if (!technicianId) return null;
  return (await locationViews(db, eq(stockLocations.technicianId, technicianId)))[0] ?? null;
}

/** The locations a user may see: a technician only their own truck. */
async function visibleLocationIds(db: Db | Tx, user: SessionUser): Promise<string[] | null> {
  if (isStaffOffice(user)) return null;
  const t = await technicianOf(db, user);
  const truck = await truckOf(db, t?.id ?? null);
  return truck ? [truck.id] : [];
}

export async function listLocations(deps: Pick<AppDeps, 'database'>, user: SessionUser): Promise<StockLocation[]> {
  const { db } = deps.database;
  const ids = await visibleLocationIds(db, user);
  if (ids && !ids.length) return [];
  return locationViews(db, ids ? inArray(stockLocations.id, ids) : undefined);
}

export async function createLocation(deps: Pick<AppDeps, 'database'>, input: StockLocationInput): Promise<StockLocation> {
  const { db } = deps.database;
  if (input.technicianId) {
    const [t] = await db.select({ id: technicians.id }).from(technicians).where(eq(technicians.id, input.technicianId));
    if (!t) throw new AppError(422, 'validation_failed', 'Please check technicianId.', { technicianId: 'That technician was not found.' });
  }
  const [clash] = await db
    .select({ id: stockLocations.id })
    .from(stockLocations)
    .where(or(eq(stockLocations.name, input.name), input.technicianId ? eq(stockLocations.technicianId, input.technicianId) : sql`false`));
  if (clash) throw new AppError(409, 'location_taken', 'That name or technician already has a stock location.');
  const [row] = await db.insert(stockLocations).values(input).returning({ id: stockLocations.id });
  return (await locationViews(db, eq(stockLocations.id, row!.id)))[0]!;
}

export async function stockRows(db: Db | Tx, where?: SQL): Promise<StockRow[]> {
  const rows = await db
    .select({ s: stockLevels, locationName: stockLocations.name, sku: priceBookItems.sku, name: priceBookItems.name, category: priceBookItems.category })
    .from(stockLevels)
    .innerJoin(stockLocations, eq(stockLevels.locationId, stockLocations.id))
    .innerJoin(priceBookItems, eq(stockLevels.itemId, priceBookItems.id))
    .where(where)
    .orderBy(asc(stockLocations.name), asc(priceBookItems.sku));
  return rows.map(({ s, ...r }) => ({
    locationId: s.locationId,
    locationName: r.locationName,
    itemId: s.itemId,
    sku: r.sku,
    name: r.name,
    category: r.category,
    quantity: s.quantity,
    minimum: s.minimum,
    belowMinimum: s.quantity < s.minimum,
    shortBy: Math.max(s.minimum - s.quantity, 0),
  }));
}

export async function listLevels(deps: Pick<AppDeps, 'database'>, user: SessionUser, q: StockListQuery): Promise<StockRow[]> {
  const { db } = deps.database;
  const ids = await visibleLocationIds(db, user);
  if (ids && !ids.length) return [];
  if (q.locationId && ids && !ids.includes(q.locationId)) throw notFound('That stock location');
  const where: SQL[] = [];
  if (ids) where.push(inArray(stockLevels.locationId, ids));
  if (q.locationId) where.push(eq(stockLevels.locationId, q.locationId));
  if (q.belowMinimum) where.push(lt(stockLevels.quantity, stockLevels.minimum));
  if (q.q) {
    const like = `%${q.q.replace(/[%_\\]/g, (c) => `\\${c}`)}%`;
    where.push(or(ilike(priceBookItems.sku, like), ilike(priceBookItems.name, like))!);
  }
  return stockRows(db, and(...where));
}

async function mustLocation(db: Db | Tx, id: string, field: string): Promise<{ id: string; name: string }> {
  const [l] = await db.select({ id: stockLocations.id, name: stockLocations.name }).from(stockLocations).where(eq(stockLocations.id, id));
  if (!l) throw new AppError(422, 'validation_failed', `Please check ${field}.`, { [field]: 'That truck or shop was not found.' });
  return l;
}

async function mustParts(db: Db | Tx, ids: string[]): Promise<Map<string, { sku: string; name: string; kind: string }>> {
  const rows = await db
    .select({ id: priceBookItems.id, sku: priceBookItems.sku, name: priceBookItems.name, kind: priceBookItems.kind })
    .from(priceBookItems)
    .where(inArray(priceBookItems.id, ids));
  const map = new Map(rows.map((r) => [r.id, r]));
  ids.forEach((id, i) => {
    const r = map.get(id);
    if (!r || r.kind !== 'part')
      throw new AppError(422, 'validation_failed', `Please check lines.${i}.itemId.`, {
        [`lines.${i}.itemId`]: r ? 'Only parts are stocked.' : 'That price-book item was not found.',
      });
  });
  return map;
}

export async function setLevel(deps: Deps, locationId: string, input: StockRowInput, user: SessionUser): Promise<StockRow> {
  const { db } = deps.database;
  await db.transaction(async (tx) => {
    const [l] = await tx.select({ id: stockLocations.id }).from(stockLocations).where(eq(stockLocations.id, locationId));
    if (!l) throw notFound('That stock location');
    await mustParts(tx, [input.itemId]);
    const [before] = await tx
      .select()
      .from(stockLevels)
      .where(and(eq(stockLevels.locationId, locationId), eq(stockLevels.itemId, input.itemId)))
      .for('update');
    const quantity = input.quantity ?? before?.quantity ?? 0;
    await tx
      .insert(stockLevels)
      .values({ locationId, itemId: input.itemId, quantity, minimum: input.minimum })
      .onConflictDoUpdate({ target: [stockLevels.locationId, stockLevels.itemId], set: { quantity, minimum: input.minimum, updatedAt: deps.clock() } });
    const delta = quantity - (before?.quantity ?? 0);
    if (delta !== 0) await tx.insert(stockMovements).values({ kind: 'count', locationId, itemId: input.itemId, quantity: delta, userId: user.id, note: 'Counted on hand' });
  });
  return (await stockRows(db, and(eq(stockLevels.locationId, locationId), eq(stockLevels.itemId, input.itemId))))[0]!;
}

interface Move {
  kind: StockMovementKind;
  locationId: string;
  itemId: string;
  quantity: number;
  visitId?: string | null;
  quoteId?: string | null;
  transferId?: string | null;
  userId: string | null;
  note?: string;
}

/** Takes parts out of a location, or throws OutOfStock; never leaves a quantity below zero. */
export async function takeStock(tx: Tx, move: Move): Promise<void> {
  const [row] = await tx
    .update(stockLevels)
    .set({ quantity: sql`${stockLevels.quantity} - ${move.quantity}`, updatedAt: sql`now()` })
    .where(and(eq(stockLevels.locationId, move.locationId), eq(stockLevels.itemId, move.itemId), sql`${stockLevels.quantity} >= ${move.quantity}`))
    .returning({ q: stockLevels.quantity });
  if (!row) {
    const [info] = await tx
      .select({ sku: priceBookItems.sku, name: priceBookItems.name, location: stockLocations.name, left: sql<number>`coalesce(${stockLevels.quantity}, 0)::int` })
      .from(priceBookItems)
      .innerJoin(stockLocations, eq(stockLocations.id, move.locationId))
      .leftJoin(stockLevels, and(eq(stockLevels.itemId, priceBookItems.id), eq(stockLevels.locationId, move.locationId)))
      .where(eq(priceBookItems.id, move.itemId));
    throw new OutOfStock(info?.sku ?? '', info?.name ?? 'that part', info?.location ?? 'That location', Number(info?.left ?? 0), move.quantity);
  }
  await tx.insert(stockMovements).values({ ...move, quantity: -move.quantity, note: move.note ?? '' });
}

/**
 * Puts parts into a location. Past STOCK_MAX of one part the whole write is refused with a 422 on
 * `field` (the line's quantity), before anything is kept: the caller's transaction rolls back.
 */
export async function putStock(tx: Tx, move: Move, field = 'quantity'): Promise<void> {
  const [row] = await tx
    .insert(stockLevels)
    .values({ locationId: move.locationId, itemId: move.itemId, quantity: move.quantity })
    .onConflictDoUpdate({ target: [stockLevels.locationId, stockLevels.itemId], set: { quantity: sql`${stockLevels.quantity} + ${move.quantity}`, updatedAt: sql`now()` } })
    .returning({ q: stockLevels.quantity });
  if (row && row.q > STOCK_MAX) {
    const had = row.q - move.quantity;
    throw new AppError(422, 'validation_failed', `Please check ${field}.`, {
      [field]: `A location holds at most ${STOCK_MAX.toLocaleString('en-US')} of one part; it has ${had.toLocaleString('en-US')}, so at most ${Math.max(0, STOCK_MAX - had).toLocaleString('en-US')} more fit.`,
    });
  }
  await tx.insert(stockMovements).values({ ...move, note: move.note ?? '' });
}

const rowsFor = (db: Db | Tx, locationIds: string[], itemIds: string[]) => stockRows(db, and(inArray(stockLevels.locationId, locationIds), inArray(stockLevels.itemId, itemIds)));

export async function restock(deps: Deps, user: SessionUser, input: Restock): Promise<StockRow[]> {
  const { db } = deps.database;
  await db.transaction(async (tx) => {
    await mustLocation(tx, input.locationId, 'locationId');
    await mustParts(
      tx,
      input.lines.map((l) => l.itemId),
    );
    for (const [i, l] of input.lines.entries())
      await putStock(tx, { kind: 'restock', locationId: input.locationId, itemId: l.itemId, quantity: l.quantity, userId: user.id, note: input.note }, `lines.${i}.quantity`);
  });
  return rowsFor(
    db,
    [input.locationId],
    input.lines.map((l) => l.itemId),
  );
}

export async function transfer(deps: Deps, user: SessionUser, input: Transfer): Promise<StockRow[]> {
  const { db } = deps.database;
  await db.transaction(async (tx) => {
    await mustLocation(tx, input.fromLocationId, 'fromLocationId');
    await mustLocation(tx, input.toLocationId, 'toLocationId');
    await mustParts(
      tx,
      input.lines.map((l) => l.itemId),
    );
    const transferId = crypto.randomUUID();
    for (const [i, l] of input.lines.entries()) {
      await takeStock(tx, { kind: 'transfer_out', locationId: input.fromLocationId, itemId: l.itemId, quantity: l.quantity, transferId, userId: user.id, note: input.note });
      await putStock(
        tx,
        { kind: 'transfer_in', locationId: input.toLocationId, itemId: l.itemId, quantity: l.quantity, transferId, userId: user.id, note: input.note },
        `lines.${i}.quantity`,
      );
    }
  });
  return rowsFor(
    db,
    [input.fromLocationId, input.toLocationId],
    input.lines.map((l) => l.itemId),
  );
}

/** Parts used on a visit leave the truck in the transaction that records them. */
export async function recordPartsUsed(deps: Deps, user: SessionUser, visitId: string, input: PartsUsed): Promise<StockRow[]> {
  const { db } = deps.database;
  const locationId = await db.transaction(async (tx) => {
    const visit = await reachableVisit(tx, user, visitId);
    const truck = await truckOf(tx, visit.technicianId);
    const from = input.locationId ?? truck?.id;
    if (!from) throw new AppError(422, 'validation_failed', 'Please check locationId.', { locationId: 'This visit has no technician truck; choose where the parts come from.' });
    if (user.role === 'technician' && from !== truck?.id)
      throw new AppError(422, 'validation_failed', 'Please check locationId.', { locationId: 'Record parts from your own truck; the office moves stock between trucks.' });
    await mustLocation(tx, from, 'locationId');
    await mustParts(
      tx,
      input.lines.map((l) => l.itemId),
    );
    for (const l of input.lines)
      await takeStock(tx, { kind: 'use', locationId: from, itemId: l.itemId, quantity: l.quantity, visitId, userId: user.id, note: 'Used on the visit' });
    return from;
  });
  return rowsFor(
    db,
    [locationId],
    input.lines.map((l) => l.itemId),
  );
}

export async function listMovements(deps: Pick<AppDeps, 'database'>, user: SessionUser, q: { locationId?: string; visitId?: string }): Promise<StockMovement[]> {
  const { db } = deps.database;
  const ids = await visibleLocationIds(db, user);
  if (ids && !ids.length) return [];
  if (q.locationId && ids && !ids.includes(q.locationId)) throw notFound('That stock location');
  if (q.visitId) await reachableVisit(db, user, q.visitId);
  const where: SQL[] = [];
  if (ids && !q.visitId) where.push(inArray(stockMovements.locationId, ids));
  if (q.locationId) where.push(eq(stockMovements.locationId, q.locationId));
  if (q.visitId) where.push(eq(stockMovements.visitId, q.visitId));
  const rows = await db
    .select({ m: stockMovements, locationName: stockLocations.name, sku: priceBookItems.sku, name: priceBookItems.name, category: priceBookItems.category, byName: users.name })
    .from(stockMovements)
    .innerJoin(stockLocations, eq(stockMovements.locationId, stockLocations.id))
    .innerJoin(priceBookItems, eq(stockMovements.itemId, priceBookItems.id))
    .leftJoin(users, eq(stockMovements.userId, users.id))
    .where(and(...where))
    .orderBy(desc(stockMovements.createdAt))
    .limit(200);
  return rows.map(({ m, ...r }) => ({
    id: m.id,
    kind: m.kind,
    locationId: m.locationId,
    locationName: r.locationName,
    itemId: m.itemId,
    sku: r.sku,
    name: r.name,
    category: r.category,
    quantity: m.quantity,
    visitId: m.visitId,
    quoteId: m.quoteId,
    byName: r.byName,
    note: m.note,
    at: m.createdAt.toISOString(),
  }));
}
