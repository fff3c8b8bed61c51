import { sql } from 'drizzle-orm';
import { boolean, check, date, index, integer, jsonb, numeric, pgTable, smallint, text, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { ITEM_CATEGORIES, ITEM_KINDS } from '../../../shared/pricebook';
import { QUOTE_STATUSES } from '../../../shared/schemas/pricebook';
import { createdAt, id, inList, tstz, updatedAt } from './columns';
import { invoices } from './billing';
import { customers, properties } from './customers';
import { equipment } from './equipment';
import { flatRateTasks, priceBookItems, priceBookItemVersions } from './pricebook';
import { stockLocations } from './stock';
import { users } from './users';
import { visits } from './visits';

// A quote on a visit. The row carries the current revision and status; each revision's content
// (options and lines with their coverage) is kept, so an approved revision never changes.
export const quotes = pgTable(
  'quotes',
  {
    id: id(),
    number: integer().generatedAlwaysAsIdentity({ startWith: 5001 }),
    visitId: uuid()
      .notNull()
      .references(() => visits.id, { onDelete: 'restrict' }),
    customerId: uuid()
      .notNull()
      .references(() => customers.id, { onDelete: 'restrict' }),
    propertyId: uuid()
      .notNull()
      .references(() => properties.id, { onDelete: 'restrict' }),
    status: text({ enum: QUOTE_STATUSES }).notNull().default('draft'),
    revision: integer().notNull().default(1),
    /** The last day the sent prices hold (local date). */
    validUntil: date({ mode: 'string' }),
    sentAt: tstz(),
    sentTo: text(),
    invoiceId: uuid().references(() => invoices.id, { onDelete: 'set null' }),
    followUpVisitId: uuid().references(() => visits.id, { onDelete: 'set null' }),
    createdBy: uuid().references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex('quotes_number_key').on(t.number),
    index('quotes_visit_idx').on(t.visitId),
    index('quotes_customer_idx').on(t.customerId),
    index('quotes_status_idx').on(t.status, t.createdAt),
    check('quotes_status', sql.raw(`status in (${inList(QUOTE_STATUSES)})`)),
    check('quotes_revision', sql`${t.revision} >= 1`),
  ],
);

export const quoteRevisions = pgTable(
  'quote_revisions',
  {
    id: id(),
    quoteId: uuid()
      .notNull()
      .references(() => quotes.id, { onDelete: 'cascade' }),
    revision: integer().notNull(),
    status: text({ enum: QUOTE_STATUSES }).notNull().default('draft'),
    equipmentId: uuid().references(() => equipment.id, { onDelete: 'set null' }),
    note: text().notNull().default(''),
    photoIds: text().array().notNull().default([]),
    validDays: smallint().notNull().default(30),
    taxRateBps: integer().notNull(),
    coverageNotes: jsonb().$type<string[]>().notNull().default([]),
    createdBy: uuid().references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('quote_revisions_key').on(t.quoteId, t.revision), check('quote_revisions_status', sql.raw(`status in (${inList(QUOTE_STATUSES)})`))],
);

export const quoteOptions = pgTable(
  'quote_options',
  {
    id: id(),
    revisionId: uuid()
      .notNull()
      .references(() => quoteRevisions.id, { onDelete: 'cascade' }),
    position: smallint().notNull(),
    title: text().notNull(),
    description: text().notNull().default(''),
    subtotalCents: integer().notNull(),
    savingsCents: integer().notNull(),
    taxableCents: integer().notNull(),
    taxCents: integer().notNull(),
    totalCents: integer().notNull(),
  },
  (t) => [
    uniqueIndex('quote_options_position_key').on(t.revisionId, t.position),
    check('quote_options_amounts', sql`${t.subtotalCents} >= 0 and ${t.savingsCents} >= 0 and ${t.taxCents} >= 0 and ${t.totalCents} >= 0`),
  ],
);

/** A line as quoted: its price copied from the item version, with the coverage outcome and reason. */
export const quoteLines = pgTable(
  'quote_lines',
  {
    id: id(),
    optionId: uuid()
      .notNull()
      .references(() => quoteOptions.id, { onDelete: 'cascade' }),
    position: smallint().notNull(),
    itemId: uuid().references(() => priceBookItems.id, { onDelete: 'restrict' }),
    itemVersionId: uuid().references(() => priceBookItemVersions.id, { onDelete: 'restrict' }),
    taskId: uuid().references(() => flatRateTasks.id, { onDelete: 'restrict' }),
    groupKey: text(),
    sku: text(),
    description: text().notNull(),
    kind: text({ enum: ITEM_KINDS }).notNull(),
    category: text({ enum: ITEM_CATEGORIES }).notNull(),
    quantity: numeric({ precision: 12, scale: 3, mode: 'number' }).notNull(),
    unitCents: integer().notNull(),
    taxable: boolean().notNull(),
    grossCents: integer().notNull(),
    savingsCents: integer().notNull(),
    chargedCents: integer().notNull(),
    rules: text().array().notNull().default([]),
    reason: text().notNull().default(''),
    stockLocationId: uuid().references(() => stockLocations.id, { onDelete: 'set null' }),
    equipmentId: uuid().references(() => equipment.id, { onDelete: 'set null' }),
  },
  (t) => [
    uniqueIndex('quote_lines_position_key').on(t.optionId, t.position),
    check(
      'quote_lines_amounts',
      sql`${t.quantity} > 0 and ${t.unitCents} >= 0 and ${t.savingsCents} >= 0 and ${t.chargedCents} >= 0 and ${t.grossCents} = ${t.savingsCents} + ${t.chargedCents}`,
    ),
  ],
);

/** The homeowner's answer to one revision: approved with a typed name, or declined with a reason. */
export const quoteApprovals = pgTable(
  'quote_approvals',
  {
    id: id(),
    quoteId: uuid()
      .notNull()
      .references(() => quotes.id, { onDelete: 'cascade' }),
    revision: integer().notNull(),
    outcome: text({ enum: ['approved', 'declined'] }).notNull(),
    optionId: uuid().references(() => quoteOptions.id, { onDelete: 'restrict' }),
    typedName: text(),
    declineReason: text(),
    ip: text().notNull(),
    onDevice: text({ enum: ['portal', 'technician'] }).notNull(),
    userId: uuid().references(() => users.id, { onDelete: 'set null' }),
    at: tstz().notNull(),
  },
  (t) => [
    uniqueIndex('quote_approvals_revision_key').on(t.quoteId, t.revision),
    check(
      'quote_approvals_outcome',
      sql`(${t.outcome} = 'approved' and ${t.optionId} is not null and ${t.typedName} is not null) or (${t.outcome} = 'declined' and ${t.declineReason} is not null)`,
    ),
  ],
);
