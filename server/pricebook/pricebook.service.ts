import { and, asc, desc, eq, ilike, inArray, or, sql, type SQL } from 'drizzle-orm';
import {
  priceBookItemInputSchema,
  type FlatRateTask,
  type FlatRateTaskInput,
  type FlatRateTaskUpdate,
  type PriceBookItem,
  type PriceBookItemInput,
  type PriceBookItemUpdate,
  type PriceBookListQuery,
  type PriceBookPage,
} from '../../shared/schemas/pricebook';
import type { AppDeps } from '../deps';
import type { Db, Tx } from '../db/client';
import { flatRateTaskLines, flatRateTasks, priceBookItems, priceBookItemVersions } from '../db/schema';
import { AppError, notFound, parse } from '../http/errors';

// The price book: items with immutable price versions, and flat-rate tasks built from items.

type ItemRow = typeof priceBookItems.$inferSelect;
type Deps = Pick<AppDeps, 'database' | 'clock'>;

export function itemView(r: ItemRow): PriceBookItem {
  return {
    id: r.id,
    versionId: r.currentVersionId!,
    version: r.version,
    sku: r.sku,
    name: r.name,
    kind: r.kind,
    category: r.category,
    unit: r.unit,
    unitCents: r.unitCents,
    costCents: r.costCents,
    taxable: r.taxable,
    partsWarrantyMonths: r.partsWarrantyMonths,
    spec: r.spec ?? null,
    active: r.active,
    updatedAt: r.updatedAt.toISOString(),
  };
}

const like = (q: string) => `%${q.replace(/[%_\\]/g, (c) => `\\${c}`)}%`;
const SORT = { sku: priceBookItems.sku, name: priceBookItems.name, category: priceBookItems.category, unitCents: priceBookItems.unitCents } as const;

export async function listItems(deps: Pick<AppDeps, 'database'>, q: PriceBookListQuery): Promise<PriceBookPage> {
  const { db } = deps.database;
  const where: SQL[] = [];
  if (q.q) where.push(or(ilike(priceBookItems.sku, like(q.q)), ilike(priceBookItems.name, like(q.q)))!);
  if (q.kind) where.push(eq(priceBookItems.kind, q.kind));
  if (q.category) where.push(eq(priceBookItems.category, q.category));
  if (q.status !== 'all') where.push(eq(priceBookItems.active, q.status === 'active'));
  const cond = where.length ? and(...where) : undefined;
  const [{ total }] = (await db
    .select({ total: sql<number>`count(*)::int` })
    .from(priceBookItems)
    .where(cond)) as [{ total: number }];
  const col = SORT[q.sort];
  const rows = await db
    .select()
    .from(priceBookItems)
    .where(cond)
    .orderBy(q.dir === 'asc' ? asc(col) : desc(col), asc(priceBookItems.sku))
    .limit(q.pageSize)
    .offset(q.page * q.pageSize);
  return { items: rows.map(itemView), total, page: q.page, pageSize: q.pageSize };
}

export async function itemRow(db: Db | Tx, id: string): Promise<ItemRow> {
  const [row] = await db.select().from(priceBookItems).where(eq(priceBookItems.id, id));
  if (!row) throw notFound('That price-book item');
  return row;
}

export async function readItem(deps: Pick<AppDeps, 'database'>, id: string): Promise<PriceBookItem> {
  return itemView(await itemRow(deps.database.db, id));
}

const skuTaken = (sku: string) => new AppError(409, 'sku_taken', `SKU ${sku} is already in the price book.`, { sku: `SKU ${sku} is already in the price book.` });

async function writeVersion(tx: Tx, item: ItemRow): Promise<ItemRow> {
  const [v] = await tx
    .insert(priceBookItemVersions)
    .values({
      itemId: item.id,
      version: item.version,
      sku: item.sku,
      name: item.name,
      kind: item.kind,
      category: item.category,
      unit: item.unit,
      unitCents: item.unitCents,
      costCents: item.costCents,
      taxable: item.taxable,
      partsWarrantyMonths: item.partsWarrantyMonths,
      spec: item.spec,
    })
    .returning({ id: priceBookItemVersions.id });
  const [row] = await tx.update(priceBookItems).set({ currentVersionId: v!.id }).where(eq(priceBookItems.id, item.id)).returning();
  return row!;
}

/** Inserts an item and its first version, inside the caller's transaction. */
export async function insertItem(tx: Tx, input: PriceBookItemInput): Promise<ItemRow> {
  const [clash] = await tx.select({ id: priceBookItems.id }).from(priceBookItems).where(eq(priceBookItems.sku, input.sku));
  if (clash) throw skuTaken(input.sku);
  const [row] = await tx
    .insert(priceBookItems)
    .values({ ...input, spec: input.spec ?? null, version: 1 })
    .returning();
  return writeVersion(tx, row!);
}

export async function createItem(deps: Deps, input: PriceBookItemInput): Promise<PriceBookItem> {
  return itemView(await deps.database.db.transaction((tx) => insertItem(tx, input)));
}

const PRICED = ['sku', 'name', 'kind', 'category', 'unit', 'unitCents', 'costCents', 'taxable', 'partsWarrantyMonths', 'spec'] as const;

/** Applies a change; a change to anything a quote line copies writes a new version. */
export async function applyItemChange(tx: Tx, before: ItemRow, change: PriceBookItemUpdate, now: Date): Promise<{ row: ItemRow; changed: boolean }> {
  const merged = parse(priceBookItemInputSchema, {
    sku: before.sku,
    name: before.name,
    kind: before.kind,
    category: before.category,
    unit: before.unit,
    unitCents: before.unitCents,
    costCents: before.costCents,
    taxable: before.taxable,
    partsWarrantyMonths: before.partsWarrantyMonths,
    spec: before.spec ?? null,
    active: before.active,
    ...change,
  });
  if (merged.sku !== before.sku) {
    const [clash] = await tx.select({ id: priceBookItems.id }).from(priceBookItems).where(eq(priceBookItems.sku, merged.sku));
    if (clash) throw skuTaken(merged.sku);
  }
  const same = (k: (typeof PRICED)[number]) => JSON.stringify(merged[k] ?? null) === JSON.stringify(before[k] ?? null);
  const priced = !PRICED.every(same);
  if (!priced && merged.active === before.active) return { row: before, changed: false };
  const [row] = await tx
    .update(priceBookItems)
    .set({ ...merged, spec: merged.spec ?? null, version: priced ? before.version + 1 : before.version, updatedAt: now })
    .where(eq(priceBookItems.id, before.id))
    .returning();
  return { row: priced ? await writeVersion(tx, row!) : row!, changed: true };
}

export async function updateItem(deps: Deps, id: string, change: PriceBookItemUpdate): Promise<PriceBookItem> {
  const row = await deps.database.db.transaction(async (tx) => {
    const [before] = await tx.select().from(priceBookItems).where(eq(priceBookItems.id, id)).for('update');
    if (!before) throw notFound('That price-book item');
    return (await applyItemChange(tx, before, change, deps.clock())).row;
  });
  return itemView(row);
}

// ---- Flat-rate tasks ----

export async function taskViews(db: Db | Tx, ids?: string[]): Promise<FlatRateTask[]> {
  const tasks = await db
    .select()
    .from(flatRateTasks)
    .where(ids ? inArray(flatRateTasks.id, ids.length ? ids : ['00000000-0000-0000-0000-000000000000']) : undefined)
    .orderBy(asc(flatRateTasks.sku));
  if (!tasks.length) return [];
  const lines = await db
    .select({ line: flatRateTaskLines, item: priceBookItems })
    .from(flatRateTaskLines)
    .innerJoin(priceBookItems, eq(flatRateTaskLines.itemId, priceBookItems.id))
    .where(
      inArray(
        flatRateTaskLines.taskId,
        tasks.map((t) => t.id),
      ),
    )
    .orderBy(asc(flatRateTaskLines.position));
  return tasks.map((t) => {
    const components = lines
      .filter((l) => l.line.taskId === t.id)
      .map(({ line, item }) => ({
        itemId: item.id,
        itemVersionId: item.currentVersionId!,
        sku: item.sku,
        name: item.name,
        kind: item.kind,
        category: item.category,
        quantity: Number(line.quantity),
        unitCents: item.unitCents,
        taxable: item.taxable,
      }));
    const priceCents = components.reduce((s, c) => s + Math.round(c.quantity * c.unitCents), 0);
    return { id: t.id, versionId: t.id, version: t.version, sku: t.sku, name: t.name, description: t.description, components, priceCents, active: t.active };
  });
}

export async function listTasks(deps: Pick<AppDeps, 'database'>, status: 'active' | 'inactive' | 'all'): Promise<FlatRateTask[]> {
  const all = await taskViews(deps.database.db);
  return status === 'all' ? all : all.filter((t) => t.active === (status === 'active'));
}

async function writeComponents(tx: Tx, taskId: string, components: FlatRateTaskInput['components']): Promise<void> {
  const found = await tx
    .select({ id: priceBookItems.id })
    .from(priceBookItems)
    .where(
      inArray(
        priceBookItems.id,
        components.map((c) => c.itemId),
      ),
    );
  const known = new Set(found.map((f) => f.id));
  components.forEach((c, i) => {
    if (!known.has(c.itemId)) throw new AppError(422, 'validation_failed', 'Please check components.', { [`components.${i}.itemId`]: 'That price-book item was not found.' });
  });
  await tx.delete(flatRateTaskLines).where(eq(flatRateTaskLines.taskId, taskId));
  await tx.insert(flatRateTaskLines).values(components.map((c, i) => ({ taskId, itemId: c.itemId, quantity: c.quantity, position: i + 1 })));
}

export async function createTask(deps: Deps, input: FlatRateTaskInput): Promise<FlatRateTask> {
  const { db } = deps.database;
  const id = await db.transaction(async (tx) => {
    const [clash] = await tx.select({ id: flatRateTasks.id }).from(flatRateTasks).where(eq(flatRateTasks.sku, input.sku));
    if (clash) throw new AppError(409, 'sku_taken', `SKU ${input.sku} is already a task.`, { sku: `SKU ${input.sku} is already a task.` });
    const [t] = await tx
      .insert(flatRateTasks)
      .values({ sku: input.sku, name: input.name, description: input.description, active: input.active })
      .returning({ id: flatRateTasks.id });
    await writeComponents(tx, t!.id, input.components);
    return t!.id;
  });
  return (await taskViews(db, [id]))[0]!;
}

export async function updateTask(deps: Deps, id: string, change: FlatRateTaskUpdate): Promise<FlatRateTask> {
  const { db } = deps.database;
  await db.transaction(async (tx) => {
    const [before] = await tx.select().from(flatRateTasks).where(eq(flatRateTasks.id, id)).for('update');
    if (!before) throw notFound('That flat-rate task');
    if (change.sku && change.sku !== before.sku) {
      const [clash] = await tx.select({ id: flatRateTasks.id }).from(flatRateTasks).where(eq(flatRateTasks.sku, change.sku));
      if (clash) throw new AppError(409, 'sku_taken', `SKU ${change.sku} is already a task.`, { sku: `SKU ${change.sku} is already a task.` });
    }
    const { components, ...fields } = change;
    await tx
      .update(flatRateTasks)
      .set({ ...fields, version: before.version + 1, updatedAt: deps.clock() })
      .where(eq(flatRateTasks.id, id));
    if (components) await writeComponents(tx, id, components);
  });
  return (await taskViews(db, [id]))[0]!;
}
