import { sql } from 'drizzle-orm';
import { boolean, check, date, index, integer, pgTable, smallint, text, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { AGREEMENT_STATUSES } from '../../../shared/agreements';
import { createdAt, id, inList, tstz } from './columns';
import { customers, properties } from './customers';

export const plans = pgTable(
  'plans',
  {
    id: id(),
    code: text().notNull(),
    name: text().notNull(),
    description: text().notNull().default(''),
    sortOrder: smallint().notNull().default(0),
    active: boolean().notNull().default(true),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('plans_code_key').on(t.code)],
);

// Editing a tier writes a new version; agreements point at the version they were sold under.
export const planVersions = pgTable(
  'plan_versions',
  {
    id: id(),
    planId: uuid()
      .notNull()
      .references(() => plans.id, { onDelete: 'restrict' }),
    version: integer().notNull(),
    yearlyPriceCents: integer().notNull(),
    additionalSystemCents: integer().notNull(),
    coolingVisits: smallint().notNull(),
    heatingVisits: smallint().notNull(),
    repairDiscountBps: integer().notNull(),
    diagnosticFeeWaived: boolean().notNull(),
    priorityWindowHours: integer().notNull(),
    extras: text().array().notNull().default([]),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('plan_versions_plan_version_key').on(t.planId, t.version),
    check('plan_versions_price', sql`${t.yearlyPriceCents} >= 0 and ${t.additionalSystemCents} >= 0`),
    check('plan_versions_visits', sql`${t.coolingVisits} between 0 and 12 and ${t.heatingVisits} between 0 and 12`),
    check('plan_versions_discount', sql`${t.repairDiscountBps} between 0 and 10000`),
    check('plan_versions_priority', sql`${t.priorityWindowHours} between 1 and 720`),
  ],
);

export const agreements = pgTable(
  'agreements',
  {
    id: id(),
    customerId: uuid()
      .notNull()
      .references(() => customers.id, { onDelete: 'restrict' }),
    propertyId: uuid()
      .notNull()
      .references(() => properties.id, { onDelete: 'restrict' }),
    planVersionId: uuid()
      .notNull()
      .references(() => planVersions.id, { onDelete: 'restrict' }),
    status: text({ enum: AGREEMENT_STATUSES }).notNull(),
    startsOn: date({ mode: 'string' }).notNull(),
    endsOn: date({ mode: 'string' }).notNull(),
    systemsCount: smallint().notNull().default(1),
    priceCents: integer().notNull(),
    autoRenew: boolean().notNull().default(false),
    // Saved card for off-session renewal charges (ids only; card data stays with the processor).
    stripePaymentMethodId: text(),
    cardBrand: text(),
    cardLast4: text(),
    // Dunning: the day the renewal charge first failed and how many retries have run since.
    chargeFailedOn: date({ mode: 'string' }),
    dunningRetries: smallint().notNull().default(0),
    lastChargeError: text(),
    // Credit from a move to a cheaper tier, taken off the next renewal.
    creditCents: integer().notNull().default(0),
    canceledAt: tstz(),
    createdAt: createdAt(),
  },
  (t) => [
    index('agreements_customer_idx').on(t.customerId),
    index('agreements_property_idx').on(t.propertyId),
    index('agreements_ends_on_idx').on(t.endsOn, t.status),
    check('agreements_status', sql.raw(`status in (${inList(AGREEMENT_STATUSES)})`)),
    check('agreements_term', sql`${t.endsOn} > ${t.startsOn}`),
    check('agreements_systems', sql`${t.systemsCount} between 1 and 20`),
    check('agreements_price', sql`${t.priceCents} >= 0`),
    check('agreements_credit', sql`${t.creditCents} >= 0`),
    check('agreements_dunning', sql`${t.dunningRetries} between 0 and 10`),
  ],
);
