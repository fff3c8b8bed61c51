import { sql } from 'drizzle-orm';
import { check, integer, jsonb, pgTable, smallint, text } from 'drizzle-orm/pg-core';
import { updatedAt } from './columns';

/** Business hours per ISO weekday (1 = Monday … 7 = Sunday), local clock times "HH:MM"; null = closed. */
export type BusinessHours = Record<'1' | '2' | '3' | '4' | '5' | '6' | '7', { open: string; close: string } | null>;

// One company per installation: a single settings row.
export const company = pgTable(
  'company',
  {
    id: smallint().primaryKey().default(1),
    name: text().notNull(),
    phone: text().notNull(),
    email: text().notNull(),
    street: text().notNull(),
    city: text().notNull(),
    state: text().notNull(),
    zip: text().notNull(),
    timeZone: text().notNull().default('America/Chicago'),
    taxRateBps: integer().notNull().default(0),
    businessHours: jsonb().$type<BusinessHours>().notNull(),
    arrivalWindowMinutes: integer().notNull().default(120),
    leadTimeMinutes: integer().notNull().default(120),
    heldBackPct: integer().notNull().default(25),
    cancelCutoffHours: integer().notNull().default(24),
    diagnosticFeeCents: integer().notNull().default(0),
    // The one season table (shared/seasons.ts): defaults March and September.
    coolingStartMonth: smallint().notNull().default(3),
    heatingStartMonth: smallint().notNull().default(9),
    updatedAt: updatedAt(),
  },
  (t) => [
    check('company_single_row', sql`${t.id} = 1`),
    check('company_tax_rate', sql`${t.taxRateBps} between 0 and 5000`),
    check('company_held_back', sql`${t.heldBackPct} between 0 and 100`),
    check('company_window', sql`${t.arrivalWindowMinutes} between 30 and 480`),
    check('company_fee', sql`${t.diagnosticFeeCents} >= 0`),
    check('company_season_months', sql`${t.coolingStartMonth} between 1 and 12 and ${t.heatingStartMonth} between 1 and 12 and ${t.coolingStartMonth} <> ${t.heatingStartMonth}`),
  ],
);
