import * as z from 'zod';
import type { AgreementStatus } from '../agreements';
import { DEFAULT_DISCOUNT_CATEGORIES, ITEM_CATEGORIES } from '../pricebook';
import { isoDate } from './dates';
import { RENEWAL_VIEWS, type RenewalView } from '../renewal-views';
export { RENEWAL_VIEWS, type RenewalView, RENEWAL_VIEW_LABELS } from '../renewal-views';

const cents = (what: string) =>
  z
    .number({ error: `${what} must be a number of cents.` })
    .int(`${what} must be whole cents.`)
    .min(0, `${what} must not be negative.`)
    .max(10_000_000, `${what} is too large.`);

/** A tier's terms. Saving them writes a new version; agreements keep the version they were sold under. */
export const planTermsSchema = z.object({
  name: z.string().trim().min(2, 'Name the plan.').max(80, 'Keep the name under 80 characters.'),
  description: z.string().trim().max(500, 'Keep the description under 500 characters.').default(''),
  yearlyPriceCents: cents('Yearly price').min(100, 'Yearly price must be at least $1.00.'),
  additionalSystemCents: cents('Price per additional system'),
  coolingVisits: z.number().int('Cooling visits is a whole number.').min(0, 'At least 0.').max(12, 'At most 12.'),
  heatingVisits: z.number().int('Heating visits is a whole number.').min(0, 'At least 0.').max(12, 'At most 12.'),
  repairDiscountBps: z.number().int('Discount is whole basis points.').min(0, 'Discount must not be negative.').max(10_000, 'Discount is at most 100 %.'),
  diagnosticFeeWaived: z.boolean(),
  priorityWindowHours: z.number().int('Priority window is whole hours.').min(1, 'At least 1 hour.').max(720, 'At most 720 hours.'),
  extras: z.array(z.string().trim().min(1, 'An extra cannot be empty.').max(120, 'Keep each extra under 120 characters.')).max(12, 'At most 12 extras.').default([]),
  /** Price-book categories the repair discount applies to. */
  discountCategories: z
    .array(z.enum(ITEM_CATEGORIES, { error: 'Choose price-book categories.' }))
    .max(ITEM_CATEGORIES.length, 'Each category once.')
    .refine((cs) => new Set(cs).size === cs.length, 'Each category once.')
    .default([...DEFAULT_DISCOUNT_CATEGORIES]),
  /** Does the plan pay the labor to fit a part the manufacturer's warranty replaces? */
  warrantyLaborCovered: z.boolean({ error: 'Say whether the plan covers labor on warranty parts.' }).default(false),
});
export type PlanTerms = z.infer<typeof planTermsSchema>;

export const createPlanSchema = planTermsSchema.extend({
  code: z
    .string()
    .trim()
    .regex(/^[a-z0-9][a-z0-9-]{1,39}$/, 'Code is 2–40 lower-case letters, digits or dashes.'),
});
export const planActiveSchema = z.object({ active: z.boolean({ error: 'Say whether the plan is offered.' }) });

export interface PlanView extends PlanTerms {
  id: string;
  code: string;
  active: boolean;
  sortOrder: number;
  versionId: string;
  version: number;
  agreementsCount?: number;
}

export const enrollSchema = z.object({
  propertyId: z.uuid('Choose a property.'),
  planId: z.uuid('Choose a plan.'),
  systemsCount: z.number().int('Systems is a whole number.').min(1, 'At least one system.').max(20, 'At most 20 systems.').default(1),
  autoRenew: z.boolean().default(false),
});
export type EnrollInput = z.infer<typeof enrollSchema>;

export const renewSchema = z.object({ autoRenew: z.boolean().default(false) });
export const autoRenewSchema = z.object({ enabled: z.boolean({ error: 'Say whether to renew automatically.' }) });
export const manualRenewalSchema = z.object({
  method: z.enum(['check', 'cash'], { error: 'Method is check or cash.' }),
  reference: z.string().trim().max(100, 'Keep the reference under 100 characters.').default(''),
});
export const changeTierSchema = z.object({
  planId: z.uuid('Choose a plan.'),
  changeDate: isoDate('Change date is a real date, YYYY-MM-DD.').optional(),
});
export const cancelAgreementSchema = z.object({ reason: z.string().trim().max(300).default('') });

export interface AgreementTermView {
  startsOn: string;
  /** Exclusive end, as termEnd in shared/renewals.ts. */
  endsOn: string;
  lastDay: string;
  label: string;
  lastDayLabel: string;
  priceCents: number;
  planName: string;
  /** How it was paid: the invoice number and amount, or null for a term carried from before. */
  invoiceNumber: string | null;
  paidCents: number | null;
  source: string;
  inForce: boolean;
  upcoming: boolean;
}

export interface AgreementView {
  id: string;
  customerId: string;
  customerName: string;
  propertyId: string;
  propertyLabel: string;
  propertyAddress: string;
  status: AgreementStatus;
  startsOn: string;
  endsOn: string;
  /** Last day covered (the day before the exclusive end) of the latest paid term. */
  lastCoveredDay: string;
  /** "Covered through March 14, 2027" for the latest paid term (shared/agreement-terms.ts). */
  lastDayLabel: string;
  /** The term in force today (null before the first starts or after the last ends). */
  currentTerm: AgreementTermView | null;
  /** Every term, oldest first. */
  terms: AgreementTermView[];
  daysLeft: number;
  systemsCount: number;
  priceCents: number;
  renewalPriceCents: number;
  autoRenew: boolean;
  card: { brand: string; last4: string } | null;
  canRenew: boolean;
  renewalOpensOn: string;
  lapsesOn: string | null;
  creditCents: number;
  lastChargeError: string | null;
  plan: PlanView;
  openInvoiceId: string | null;
}

export const renewalQuerySchema = z.object({ view: z.enum(RENEWAL_VIEWS).default('due30') });
export const sendNoticesSchema = z.object({
  agreementIds: z.array(z.uuid('Each agreement id must be a UUID.')).min(1, 'Choose at least one agreement.').max(500, 'At most 500 at once.'),
});

export interface RenewalRow {
  agreementId: string;
  customerName: string;
  email: string | null;
  planName: string;
  status: AgreementStatus;
  endsOn: string;
  daysLeft: number;
  priceCents: number;
  autoRenew: boolean;
  lastNoticeAt: string | null;
}
export interface RenewalBoard {
  view: RenewalView;
  counts: Record<RenewalView, { count: number; totalCents: number }>;
  rows: RenewalRow[];
}
