import { relations } from 'drizzle-orm';
import { agreementHistory, agreements } from './agreements';
import { agreementTerms, invoices } from './billing';
import { customers, properties } from './customers';
import { plans, planVersions } from './plans';

// Drizzle relations for the relational query API (db.query...with). They change no SQL schema.
// One file imports every table it relates, so the table files need not import one another.

export const plansRelations = relations(plans, ({ many }) => ({ versions: many(planVersions) }));

export const planVersionsRelations = relations(planVersions, ({ one }) => ({
  plan: one(plans, { fields: [planVersions.planId], references: [plans.id] }),
}));

export const agreementsRelations = relations(agreements, ({ one, many }) => ({
  customer: one(customers, { fields: [agreements.customerId], references: [customers.id] }),
  property: one(properties, { fields: [agreements.propertyId], references: [properties.id] }),
  planVersion: one(planVersions, { fields: [agreements.planVersionId], references: [planVersions.id] }),
  invoices: many(invoices),
  terms: many(agreementTerms),
  history: many(agreementHistory),
}));

export const agreementTermsRelations = relations(agreementTerms, ({ one }) => ({
  agreement: one(agreements, { fields: [agreementTerms.agreementId], references: [agreements.id] }),
}));

export const agreementHistoryRelations = relations(agreementHistory, ({ one }) => ({
  agreement: one(agreements, { fields: [agreementHistory.agreementId], references: [agreements.id] }),
}));

export const invoicesRelations = relations(invoices, ({ one }) => ({
  agreement: one(agreements, { fields: [invoices.agreementId], references: [agreements.id] }),
}));
