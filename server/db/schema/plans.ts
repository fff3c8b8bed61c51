import { sql } from 'drizzle-orm';
import { boolean, check, integer, pgTable, smallint, text, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { DEFAULT_DISCOUNT_CATEGORIES } from '../../../shared/pricebook';
import { createdAt, id } from './columns';

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
    /** Price-book categories the repair discount applies to. */
    discountCategories: text()
      .array()
      .notNull()
      .default([...DEFAULT_DISCOUNT_CATEGORIES]),
    /** The plan pays the labor to fit a part the manufacturer's warranty replaces. */
    warrantyLaborCovered: boolean().notNull().default(false),
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
