import { sql } from 'drizzle-orm';
import { boolean, check, index, integer, pgTable, text, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { FILE_CATEGORIES, NOTE_AUDIENCES } from '../../../shared/schemas/customers';
import { createdAt, id, inList, tstz } from './columns';
import { customers, properties } from './customers';
import { equipment } from './equipment';
import { users } from './users';
import { visits } from './visits';

// People in a household besides the main record: a spouse, a tenant, a property manager.
export const contacts = pgTable(
  'contacts',
  {
    id: id(),
    customerId: uuid()
      .notNull()
      .references(() => customers.id, { onDelete: 'restrict' }),
    name: text().notNull(),
    relationship: text().notNull().default(''),
    email: text(),
    phone: text(),
    isPrimary: boolean().notNull().default(false),
    createdAt: createdAt(),
  },
  (t) => [index('contacts_customer_idx').on(t.customerId), check('contacts_phone_e164', sql`${t.phone} is null or ${t.phone} ~ '^\\+[1-9][0-9]{6,14}$'`)],
);

// Office notes and the homeowner's notes for the technician, on the household's timeline.
export const customerNotes = pgTable(
  'customer_notes',
  {
    id: id(),
    customerId: uuid()
      .notNull()
      .references(() => customers.id, { onDelete: 'restrict' }),
    propertyId: uuid().references(() => properties.id, { onDelete: 'restrict' }),
    authorUserId: uuid().references(() => users.id, { onDelete: 'set null' }),
    audience: text({ enum: NOTE_AUDIENCES }).notNull().default('office'),
    body: text().notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    index('customer_notes_customer_idx').on(t.customerId, t.createdAt),
    check('customer_notes_audience', sql.raw(`audience in (${inList(NOTE_AUDIENCES)})`)),
    check('customer_notes_body', sql`length(${t.body}) between 1 and 4000`),
  ],
);

// Nameplate and problem photos, and PDF documents. The bytes live in storage under a generated key.
export const files = pgTable(
  'files',
  {
    id: id(),
    storageKey: text().notNull(),
    thumbKey: text(),
    customerId: uuid()
      .notNull()
      .references(() => customers.id, { onDelete: 'restrict' }),
    propertyId: uuid().references(() => properties.id, { onDelete: 'restrict' }),
    equipmentId: uuid().references(() => equipment.id, { onDelete: 'restrict' }),
    visitId: uuid().references(() => visits.id, { onDelete: 'restrict' }),
    category: text({ enum: FILE_CATEGORIES }).notNull(),
    contentType: text().notNull(),
    originalName: text().notNull(),
    sizeBytes: integer().notNull(),
    width: integer(),
    height: integer(),
    caption: text().notNull().default(''),
    uploadedByUserId: uuid().references(() => users.id, { onDelete: 'set null' }),
    archivedAt: tstz(),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('files_storage_key').on(t.storageKey),
    index('files_customer_idx').on(t.customerId, t.createdAt),
    index('files_equipment_idx').on(t.equipmentId),
    check('files_category', sql.raw(`category in (${inList(FILE_CATEGORIES)})`)),
    check('files_content_type', sql`${t.contentType} in ('image/jpeg', 'image/png', 'image/webp', 'application/pdf')`),
    check('files_size', sql`${t.sizeBytes} > 0`),
  ],
);
