import * as z from 'zod';
import type { ItemCategory } from '../pricebook';
import type { InvoiceStatus } from './billing';
import type { QuoteOptionView, QuoteSummary, StockLocationKind } from './pricebook';

// The rest of the quotes and stock contract: the requests and answers that shared/schemas/pricebook.ts
// does not carry (lists, savings, parts used on a visit, stock movements).

const wholeNumber = (label: string, min: number, max: number) =>
  z.coerce
    .number({ error: `${label} is a number.` })
    .int(`${label} is a whole number.`)
    .min(min, `${label} is at least ${min}.`)
    .max(max, `${label} is at most ${max}.`);

export const quoteStatsQuerySchema = z.object({ periodDays: wholeNumber('Period', 1, 730).default(90) });
export type QuoteStatsQuery = z.infer<typeof quoteStatsQuerySchema>;

/** Starts a new draft revision from the current (frozen) one. */
export const quoteReviseSchema = z.object({ revision: wholeNumber('Revision', 1, 999) });
export type QuoteRevise = z.infer<typeof quoteReviseSchema>;

export const quoteRevisionQuerySchema = z.object({ revision: wholeNumber('Revision', 1, 999).optional() });

export const PRICE_BOOK_TASK_STATUSES = ['active', 'inactive', 'all'] as const;
export const taskListQuerySchema = z.object({ status: z.enum(PRICE_BOOK_TASK_STATUSES, { error: 'Status is active, inactive or all.' }).default('active') });

export interface QuotePage {
  items: QuoteSummary[];
  total: number;
  page: number;
  pageSize: number;
}

/** Coverage worked out for lines not yet saved. */
export interface QuotePreview {
  options: QuoteOptionView[];
  coverageNotes: string[];
}

/** "Your plan saved you $X this year": the coverage actually given on approved quotes and issued invoices. */
export interface PlanSavings {
  customerId: string;
  /** The company's calendar year, e.g. 2026. */
  year: number;
  savingsCents: number;
  /** How many invoices the figure comes from. */
  invoiceCount: number;
  sentence: string;
}

/** Parts used on a visit: they leave the truck in the same transaction that records them. */
export const partsUsedSchema = z.object({
  /** The truck or shop they come from; left out, the visit technician's truck. */
  locationId: z.preprocess((v) => (v === '' ? null : v), z.uuid({ error: 'Choose the truck the parts come from.' }).nullable()).default(null),
  lines: z
    .array(
      z.object({
        itemId: z.uuid({ error: 'Choose a part from the price book.' }),
        quantity: wholeNumber('Quantity', 1, 9999),
      }),
      { error: 'List the parts and how many.' },
    )
    .min(1, 'Add at least one part.')
    .max(50, 'At most 50 parts at once.')
    .refine((ls) => new Set(ls.map((l) => l.itemId)).size === ls.length, 'List each part once.'),
});
export type PartsUsed = z.infer<typeof partsUsedSchema>;

export const STOCK_MOVEMENT_KINDS = ['use', 'restock', 'transfer_out', 'transfer_in', 'count'] as const;
export type StockMovementKind = (typeof STOCK_MOVEMENT_KINDS)[number];

export const stockMovementQuerySchema = z.object({
  locationId: z.preprocess((v) => (v === '' ? undefined : v), z.uuid({ error: 'Choose a truck or the shop.' }).optional()),
  visitId: z.preprocess((v) => (v === '' ? undefined : v), z.uuid({ error: 'Choose a visit.' }).optional()),
});

export interface StockMovement {
  id: string;
  kind: StockMovementKind;
  locationId: string;
  locationName: string;
  itemId: string;
  sku: string;
  name: string;
  category: ItemCategory;
  /** Signed: negative when parts leave the location. */
  quantity: number;
  visitId: string | null;
  quoteId: string | null;
  byName: string | null;
  note: string;
  at: string;
}

// ---- Invoices on a visit, paid on the technician's device ----

export const visitInvoicesQuerySchema = z.object({ visitId: z.uuid({ error: 'Choose a visit.' }) });
export const visitCheckoutSchema = z.object({ visitId: z.uuid({ error: 'Choose the visit the work was done on.' }) });
export type VisitCheckout = z.infer<typeof visitCheckoutSchema>;

/** An invoice issued for work on the visit (an approved quote's or a direct one). */
export interface VisitInvoice {
  id: string;
  number: number | null;
  status: InvoiceStatus;
  totalCents: number;
  discountCents: number;
  balanceCents: number;
  notes: string;
}

// ---- Parts to load: today's booked repairs against the technician's own truck ----

export interface PartToLoad {
  itemId: string;
  sku: string;
  name: string;
  /** Parts the approved quotes of today's visits still need from this truck. */
  needed: number;
  onTruck: number;
  short: number;
  /** Today's visits that need it. */
  visits: { visitId: string; customerName: string }[];
  /** Where the rest is: the shop and other trucks holding any. */
  elsewhere: { locationId: string; name: string; kind: StockLocationKind; quantity: number }[];
}

export interface PartsToLoad {
  parts: PartToLoad[];
}
