import { sql } from 'drizzle-orm';
import { boolean, check, index, integer, jsonb, numeric, pgTable, smallint, text, uniqueIndex, uuid, type AnyPgColumn } from 'drizzle-orm/pg-core';
import { ITEM_CATEGORIES, ITEM_KINDS, ITEM_UNITS } from '../../../shared/pricebook';
import type { PartSpec } from '../../../shared/schemas/pricebook';
import { createdAt, id, inList, updatedAt } from './columns';

// The price book: parts, labor and fees. The item row is what the owner edits; every change of
// a priced value writes a new immutable version, and quote lines point at the version they used.
export const priceBookItems = pgTable(
  'price_book_items',
  {
    id: id(),
    sku: text().notNull(),
    name: text().notNull(),
    kind: text({ enum: ITEM_KINDS }).notNull(),
    category: text({ enum: ITEM_CATEGORIES }).notNull(),
    unit: text({ enum: ITEM_UNITS }).notNull().default('each'),
    unitCents: integer().notNull(),
    costCents: integer().notNull().default(0),
    taxable: boolean().notNull(),
    partsWarrantyMonths: smallint().notNull().default(0),
    spec: jsonb().$type<PartSpec>(),
    active: boolean().notNull().default(true),
    version: integer().notNull().default(1),
    currentVersionId: uuid().references((): AnyPgColumn => priceBookItemVersions.id),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex('price_book_items_sku_key').on(t.sku),
    index('price_book_items_category_idx').on(t.category),
    check('price_book_items_kind', sql.raw(`kind in (${inList(ITEM_KINDS)})`)),
    check('price_book_items_category', sql.raw(`category in (${inList(ITEM_CATEGORIES)})`)),
    check('price_book_items_unit', sql.raw(`unit in (${inList(ITEM_UNITS)})`)),
    check('price_book_items_cents', sql`${t.unitCents} >= 0 and ${t.unitCents} <= 99999999 and ${t.costCents} >= 0 and ${t.costCents} <= 99999999`),
    check('price_book_items_warranty', sql`${t.partsWarrantyMonths} >= 0 and ${t.partsWarrantyMonths} <= 240`),
  ],
);

/** An item as it was priced: never updated, so a quote line keeps the price it was made with. */
export const priceBookItemVersions = pgTable(
  'price_book_item_versions',
  {
    id: id(),
    itemId: uuid()
      .notNull()
      .references((): AnyPgColumn => priceBookItems.id, { onDelete: 'cascade' }),
    version: integer().notNull(),
    sku: text().notNull(),
    name: text().notNull(),
    kind: text({ enum: ITEM_KINDS }).notNull(),
    category: text({ enum: ITEM_CATEGORIES }).notNull(),
    unit: text({ enum: ITEM_UNITS }).notNull(),
    unitCents: integer().notNull(),
    costCents: integer().notNull(),
    taxable: boolean().notNull(),
    partsWarrantyMonths: smallint().notNull(),
    spec: jsonb().$type<PartSpec>(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('price_book_item_versions_key').on(t.itemId, t.version)],
);

export const flatRateTasks = pgTable(
  'flat_rate_tasks',
  {
    id: id(),
    sku: text().notNull(),
    name: text().notNull(),
    description: text().notNull().default(''),
    active: boolean().notNull().default(true),
    version: integer().notNull().default(1),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [uniqueIndex('flat_rate_tasks_sku_key').on(t.sku)],
);

export const flatRateTaskLines = pgTable(
  'flat_rate_task_lines',
  {
    id: id(),
    taskId: uuid()
      .notNull()
      .references(() => flatRateTasks.id, { onDelete: 'cascade' }),
    itemId: uuid()
      .notNull()
      .references(() => priceBookItems.id, { onDelete: 'restrict' }),
    position: smallint().notNull(),
    quantity: numeric({ precision: 12, scale: 3, mode: 'number' }).notNull(),
  },
  (t) => [uniqueIndex('flat_rate_task_lines_item_key').on(t.taskId, t.itemId), check('flat_rate_task_lines_quantity', sql`${t.quantity} > 0`)],
);
