import { sql } from 'drizzle-orm';
import { boolean, check, date, index, integer, pgTable, smallint, text, uuid } from 'drizzle-orm/pg-core';
import { AGREEMENT_STATUSES } from '../../../shared/agreements';
import { createdAt, id, inList, tstz } from './columns';
import { customers, properties } from './customers';
import { planVersions } from './plans';
import { users } from './users';

// A household's maintenance agreement for one property, and its history. The terms it has had
// (agreement_terms) sit in billing.ts beside the invoices that paid for them: a term points at
// its invoice and an invoice at its agreement, so keeping them apart keeps the schema acyclic.
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
    // The reminder audience's "agreement in force" per household, read from the index alone.
    index('agreements_customer_live_idx')
      .on(t.customerId, t.endsOn, t.planVersionId, t.propertyId)
      .where(sql`status in ('active', 'renewal_due')`),
    check('agreements_status', sql.raw(`status in (${inList(AGREEMENT_STATUSES)})`)),
    check('agreements_term', sql`${t.endsOn} > ${t.startsOn}`),
    check('agreements_systems', sql`${t.systemsCount} between 1 and 20`),
    check('agreements_price', sql`${t.priceCents} >= 0`),
    check('agreements_credit', sql`${t.creditCents} >= 0`),
    check('agreements_dunning', sql`${t.dunningRetries} between 0 and 10`),
  ],
);

// Status changes and recorded actions, newest last.
export const agreementHistory = pgTable(
  'agreement_history',
  {
    id: id(),
    agreementId: uuid()
      .notNull()
      .references(() => agreements.id, { onDelete: 'cascade' }),
    event: text().notNull(),
    fromStatus: text(),
    toStatus: text(),
    note: text().notNull().default(''),
    actorId: uuid().references(() => users.id, { onDelete: 'restrict' }),
    at: createdAt(),
  },
  (t) => [index('agreement_history_agreement_idx').on(t.agreementId, t.at)],
);
