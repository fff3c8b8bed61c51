import { sql } from 'drizzle-orm';
import { boolean, check, date, index, integer, jsonb, numeric, pgTable, smallint, text, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { INVOICE_PURPOSES, INVOICE_STATUSES, PAYMENT_METHODS, PAYMENT_STATUSES } from '../../../shared/schemas/billing';
import { createdAt, id, inList, tstz } from './columns';
import { company } from './company';
import { customers } from './customers';
import { agreements } from './agreements';
import { planVersions } from './plans';
import { users } from './users';
import { visits } from './visits';

// One row per company: the next invoice number. Taken with UPDATE … RETURNING inside the
// transaction that issues the invoice, so numbers never skip or repeat.
export const invoiceCounters = pgTable(
  'invoice_counters',
  {
    companyId: smallint()
      .primaryKey()
      .references(() => company.id, { onDelete: 'cascade' }),
    nextNumber: integer().notNull().default(1001),
  },
  (t) => [check('invoice_counters_next', sql`${t.nextNumber} >= 1`)],
);

// The processor's customer record for a household (one per household).
export const billingAccounts = pgTable('billing_accounts', {
  customerId: uuid()
    .primaryKey()
    .references(() => customers.id, { onDelete: 'restrict' }),
  stripeCustomerId: text().notNull().unique(),
  createdAt: createdAt(),
});

export const invoices = pgTable(
  'invoices',
  {
    id: id(),
    // Null while a draft; assigned when issued.
    number: integer(),
    customerId: uuid()
      .notNull()
      .references(() => customers.id, { onDelete: 'restrict' }),
    agreementId: uuid().references(() => agreements.id, { onDelete: 'restrict' }),
    /** The visit the work was done on, for work invoiced from a visit (a quote's or a direct one). */
    visitId: uuid().references(() => visits.id, { onDelete: 'set null' }),
    purpose: text({ enum: INVOICE_PURPOSES }).notNull(),
    status: text({ enum: INVOICE_STATUSES }).notNull(),
    // For agreement invoices: the plan version sold and the term it pays for.
    planVersionId: uuid().references(() => planVersions.id, { onDelete: 'restrict' }),
    termStartsOn: date({ mode: 'string' }),
    discountBps: integer().notNull().default(0),
    taxRateBps: integer().notNull().default(0),
    subtotalCents: integer().notNull(),
    discountCents: integer().notNull(),
    taxCents: integer().notNull(),
    totalCents: integer().notNull(),
    paidCents: integer().notNull().default(0),
    refundedCents: integer().notNull().default(0),
    notes: text().notNull().default(''),
    issuedAt: tstz(),
    paidAt: tstz(),
    voidedAt: tstz(),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('invoices_number_key').on(t.number),
    // One renewal invoice per agreement term: a re-run of the renewal engine finds the same one.
    uniqueIndex('invoices_agreement_term_key')
      .on(t.agreementId, t.termStartsOn, t.purpose)
      .where(sql`${t.purpose} in ('enrollment', 'renewal') and ${t.status} <> 'void'`),
    index('invoices_customer_idx').on(t.customerId),
    index('invoices_visit_idx').on(t.visitId),
    index('invoices_status_idx').on(t.status),
    check('invoices_status', sql.raw(`status in (${inList(INVOICE_STATUSES)})`)),
    check('invoices_purpose', sql.raw(`purpose in (${inList(INVOICE_PURPOSES)})`)),
    check('invoices_number_when_issued', sql`${t.status} = 'draft' or ${t.number} is not null`),
    check('invoices_amounts', sql`${t.subtotalCents} >= 0 and ${t.discountCents} >= 0 and ${t.taxCents} >= 0 and ${t.totalCents} >= 0`),
    check('invoices_paid', sql`${t.paidCents} >= 0 and ${t.refundedCents} >= 0 and ${t.refundedCents} <= ${t.paidCents}`),
  ],
);

export const invoiceLines = pgTable(
  'invoice_lines',
  {
    id: id(),
    invoiceId: uuid()
      .notNull()
      .references(() => invoices.id, { onDelete: 'cascade' }),
    position: smallint().notNull(),
    description: text().notNull(),
    kind: text().notNull(),
    quantity: numeric({ precision: 12, scale: 3, mode: 'number' }).notNull(),
    unitCents: integer().notNull(),
    taxable: boolean().notNull(),
    grossCents: integer().notNull(),
    discountCents: integer().notNull(),
    netCents: integer().notNull(),
    /** Why the line costs what it does (a plan's coverage written out); empty for most lines. */
    reason: text().notNull().default(''),
  },
  (t) => [
    uniqueIndex('invoice_lines_position_key').on(t.invoiceId, t.position),
    check('invoice_lines_kind', sql`${t.kind} in ('labor', 'parts', 'plan_fee', 'other')`),
    check('invoice_lines_amounts', sql`${t.unitCents} >= 0 and ${t.quantity} >= 0`),
  ],
);

export const payments = pgTable(
  'payments',
  {
    id: id(),
    invoiceId: uuid()
      .notNull()
      .references(() => invoices.id, { onDelete: 'restrict' }),
    method: text({ enum: PAYMENT_METHODS }).notNull(),
    status: text({ enum: PAYMENT_STATUSES }).notNull(),
    amountCents: integer().notNull(),
    refundedCents: integer().notNull().default(0),
    stripeCheckoutSessionId: text(),
    stripePaymentIntentId: text(),
    checkoutUrl: text(),
    // Check number or a note for cash.
    reference: text().notNull().default(''),
    failureMessage: text(),
    recordedById: uuid().references(() => users.id, { onDelete: 'restrict' }),
    succeededAt: tstz(),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('payments_checkout_session_key').on(t.stripeCheckoutSessionId),
    uniqueIndex('payments_payment_intent_key').on(t.stripePaymentIntentId),
    index('payments_invoice_idx').on(t.invoiceId),
    check('payments_method', sql.raw(`method in (${inList(PAYMENT_METHODS)})`)),
    check('payments_status', sql.raw(`status in (${inList(PAYMENT_STATUSES)})`)),
    check('payments_amount', sql`${t.amountCents} >= 0 and ${t.refundedCents} >= 0 and ${t.refundedCents} <= ${t.amountCents}`),
  ],
);

export const refunds = pgTable(
  'refunds',
  {
    id: id(),
    paymentId: uuid()
      .notNull()
      .references(() => payments.id, { onDelete: 'restrict' }),
    amountCents: integer().notNull(),
    stripeRefundId: text(),
    reason: text().notNull().default(''),
    createdById: uuid().references(() => users.id, { onDelete: 'restrict' }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('refunds_stripe_key').on(t.stripeRefundId), check('refunds_amount', sql`${t.amountCents} > 0`)],
);

// Each processor event once: the primary key is the event id, so a redelivery inserts nothing.
export const stripeEvents = pgTable('stripe_events', {
  id: text().primaryKey(),
  type: text().notNull(),
  payload: jsonb().notNull(),
  receivedAt: createdAt(),
  processedAt: tstz(),
  error: text(),
});

// Renewal notices sent, one per agreement, term and notice day (60/30/7); office sends have none.
export const renewalNotices = pgTable(
  'renewal_notices',
  {
    id: id(),
    agreementId: uuid()
      .notNull()
      .references(() => agreements.id, { onDelete: 'cascade' }),
    termEndsOn: date({ mode: 'string' }).notNull(),
    daysBefore: smallint(),
    sentById: uuid().references(() => users.id, { onDelete: 'restrict' }),
    sentAt: createdAt(),
  },
  (t) => [
    uniqueIndex('renewal_notices_once_key')
      .on(t.agreementId, t.termEndsOn, t.daysBefore)
      .where(sql`${t.daysBefore} is not null`),
    index('renewal_notices_agreement_idx').on(t.agreementId),
  ],
);

// Every term an agreement has had; the unique start makes extending a term idempotent.
export const agreementTerms = pgTable(
  'agreement_terms',
  {
    id: id(),
    agreementId: uuid()
      .notNull()
      .references(() => agreements.id, { onDelete: 'cascade' }),
    startsOn: date({ mode: 'string' }).notNull(),
    endsOn: date({ mode: 'string' }).notNull(),
    planVersionId: uuid()
      .notNull()
      .references(() => planVersions.id, { onDelete: 'restrict' }),
    priceCents: integer().notNull(),
    invoiceId: uuid().references(() => invoices.id, { onDelete: 'restrict' }),
    source: text().notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('agreement_terms_start_key').on(t.agreementId, t.startsOn), check('agreement_terms_order', sql`${t.endsOn} > ${t.startsOn}`)],
);
