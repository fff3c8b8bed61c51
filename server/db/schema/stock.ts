import { sql } from 'drizzle-orm';
import { check, index, integer, pgTable, primaryKey, text, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { STOCK_LOCATION_KINDS } from '../../../shared/schemas/pricebook';
import { STOCK_MOVEMENT_KINDS } from '../../../shared/schemas/quotes';
import { createdAt, id, inList, updatedAt } from './columns';
import { priceBookItems } from './pricebook';
import { technicians } from './technicians';
import { users } from './users';
import { visits } from './visits';

// Where parts are kept: each technician's truck, and the shop.
export const stockLocations = pgTable(
  'stock_locations',
  {
    id: id(),
    kind: text({ enum: STOCK_LOCATION_KINDS }).notNull(),
    name: text().notNull(),
    technicianId: uuid().references(() => technicians.id, { onDelete: 'restrict' }),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('stock_locations_technician_key').on(t.technicianId),
    uniqueIndex('stock_locations_name_key').on(t.name),
    check('stock_locations_kind', sql.raw(`kind in (${inList(STOCK_LOCATION_KINDS)})`)),
    check('stock_locations_truck_has_technician', sql`(${t.kind} = 'truck') = (${t.technicianId} is not null)`),
  ],
);

// What a location holds of one item. The CHECK is the last word on "never negative": takes are
// a conditional UPDATE … WHERE quantity >= n, so two devices at once cannot both take the last one.
export const stockLevels = pgTable(
  'stock_levels',
  {
    locationId: uuid()
      .notNull()
      .references(() => stockLocations.id, { onDelete: 'cascade' }),
    itemId: uuid()
      .notNull()
      .references(() => priceBookItems.id, { onDelete: 'restrict' }),
    quantity: integer().notNull().default(0),
    minimum: integer().notNull().default(0),
    updatedAt: updatedAt(),
  },
  (t) => [
    primaryKey({ columns: [t.locationId, t.itemId] }),
    index('stock_levels_item_idx').on(t.itemId),
    check('stock_levels_quantity', sql`${t.quantity} >= 0`),
    check('stock_levels_minimum', sql`${t.minimum} >= 0`),
  ],
);

export const stockMovements = pgTable(
  'stock_movements',
  {
    id: id(),
    kind: text({ enum: STOCK_MOVEMENT_KINDS }).notNull(),
    locationId: uuid()
      .notNull()
      .references(() => stockLocations.id, { onDelete: 'cascade' }),
    itemId: uuid()
      .notNull()
      .references(() => priceBookItems.id, { onDelete: 'restrict' }),
    /** Signed: negative when parts leave the location. */
    quantity: integer().notNull(),
    visitId: uuid().references(() => visits.id, { onDelete: 'set null' }),
    quoteId: uuid(),
    /** Both halves of one transfer share it. */
    transferId: uuid(),
    userId: uuid().references(() => users.id, { onDelete: 'set null' }),
    note: text().notNull().default(''),
    createdAt: createdAt(),
  },
  (t) => [
    index('stock_movements_location_idx').on(t.locationId, t.createdAt),
    index('stock_movements_visit_idx').on(t.visitId),
    check('stock_movements_kind', sql.raw(`kind in (${inList(STOCK_MOVEMENT_KINDS)})`)),
    check('stock_movements_quantity', sql`${t.quantity} <> 0`),
  ],
);
