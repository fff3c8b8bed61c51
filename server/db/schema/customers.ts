import { sql } from 'drizzle-orm';
import { check, index, integer, pgTable, text, uuid, type AnyPgColumn } from 'drizzle-orm/pg-core';
import { createdAt, id, tstz, updatedAt } from './columns';

// A household: the party that holds agreements and pays invoices.
export const customers = pgTable(
  'customers',
  {
    id: id(),
    name: text().notNull(),
    email: text(),
    phone: text(),
    notes: text().notNull().default(''),
    archivedAt: tstz(),
    mergedIntoId: uuid().references((): AnyPgColumn => customers.id),
    // Name, e-mail, phone (with and without +1) and every street of the household, lower-cased;
    // kept current by triggers (custom migration) so search is one trigram-indexed column.
    searchText: text().notNull().default(''),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    index('customers_email_idx').on(sql`lower(${t.email})`),
    index('customers_name_idx').on(t.name),
    index('customers_search_trgm_idx').using('gin', sql`${t.searchText} gin_trgm_ops`),
    index('customers_created_idx').on(t.createdAt),
    check('customers_phone_e164', sql`${t.phone} is null or ${t.phone} ~ '^\\+[1-9][0-9]{6,14}$'`),
  ],
);

export const properties = pgTable(
  'properties',
  {
    id: id(),
    customerId: uuid()
      .notNull()
      .references(() => customers.id, { onDelete: 'restrict' }),
    label: text().notNull().default('Home'),
    street: text().notNull(),
    unit: text(),
    city: text().notNull(),
    state: text().notNull(),
    zip: text().notNull(),
    // Service area used by dispatch to group visits.
    area: text().notNull().default(''),
    elevationFt: integer(),
    accessNotes: text().notNull().default(''),
    // What the technician needs at the door; kept apart from free notes so the visit screen can show them.
    gateCode: text().notNull().default(''),
    pets: text().notNull().default(''),
    archivedAt: tstz(),
    createdAt: createdAt(),
  },
  (t) => [
    index('properties_customer_idx').on(t.customerId),
    // The board's area filter lists the distinct areas by walking this index.
    index('properties_area_idx').on(t.area),
    check('properties_state', sql`${t.state} ~ '^[A-Z]{2}$'`),
    check('properties_zip', sql`${t.zip} ~ '^[0-9]{5}(-[0-9]{4})?$'`),
    check('properties_elevation', sql`${t.elevationFt} is null or ${t.elevationFt} between -1000 and 15000`),
  ],
);
