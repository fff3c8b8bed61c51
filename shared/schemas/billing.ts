import * as z from 'zod';
import { formatUsd, lineTotalCents, MAX_INVOICE_CENTS, MAX_INVOICE_LINES, MAX_LINE_CENTS } from '../money';
import { INVOICE_STATUSES, type InvoiceStatus } from '../invoice-status';
export { INVOICE_STATUSES, type InvoiceStatus, INVOICE_STATUS_LABELS } from '../invoice-status';

export const INVOICE_PURPOSES = ['enrollment', 'renewal', 'tier_change', 'service'] as const;
export type InvoicePurpose = (typeof INVOICE_PURPOSES)[number];

export const PAYMENT_METHODS = ['card', 'check', 'cash'] as const;
export type PaymentMethod = (typeof PAYMENT_METHODS)[number];
export const PAYMENT_STATUSES = ['pending', 'succeeded', 'failed', 'canceled'] as const;
export type PaymentStatus = (typeof PAYMENT_STATUSES)[number];

const cents = (what: string) =>
  z
    .number({ error: `${what} must be a number of cents.` })
    .int(`${what} must be whole cents.`)
    .min(0, `${what} must not be negative.`)
    .max(100_000_000, `${what} is too large.`);

/** A line's total for the bounds below; a line that fails its own checks counts as zero here. */
function lineCents(l: { quantity: unknown; unitCents: unknown }): number {
  try {
    return lineTotalCents(l.quantity as number, l.unitCents as number);
  } catch {
    return 0;
  }
}

export const invoiceLineInputSchema = z
  .object({
    description: z.string().trim().min(1, 'Describe the line.').max(200, 'Keep the description under 200 characters.'),
    kind: z.enum(['labor', 'parts', 'plan_fee', 'other'], { error: 'Kind is labor, parts, plan_fee or other.' }),
    quantity: z
      .number({ error: 'Quantity must be a number.' })
      .min(0, 'Quantity must not be negative.')
      .max(100_000, 'Quantity is too large.')
      .refine((q) => Math.abs(Math.round(q * 1000) - q * 1000) < 1e-6, 'Quantity allows at most 3 decimals.'),
    unitCents: cents('Unit price'),
    taxable: z.boolean({ error: 'Say whether the line is taxable.' }),
  })
  .refine((l) => lineCents(l) <= MAX_LINE_CENTS, { message: `A line can be at most ${formatUsd(MAX_LINE_CENTS)}.`, path: ['unitCents'] });
export type InvoiceLineInput = z.infer<typeof invoiceLineInputSchema>;

export const createInvoiceSchema = z.object({
  customerId: z.uuid('Choose a household.'),
  lines: z
    .array(invoiceLineInputSchema)
    .min(1, 'Add at least one line.')
    .max(MAX_INVOICE_LINES, `At most ${MAX_INVOICE_LINES} lines.`)
    // Before discount and tax; the money rules check the total again once tax is known.
    .refine((lines) => lines.reduce((sum, l) => sum + lineCents(l), 0) <= MAX_INVOICE_CENTS, `An invoice can be at most ${formatUsd(MAX_INVOICE_CENTS)}.`),
  notes: z.string().max(2000).default(''),
  issue: z.boolean().default(true),
});
export type CreateInvoiceInput = z.infer<typeof createInvoiceSchema>;

export const offlinePaymentSchema = z.object({
  method: z.enum(['check', 'cash'], { error: 'Method is check or cash.' }),
  amountCents: cents('Amount').min(1, 'Amount must be more than zero.'),
  reference: z.string().trim().max(100, 'Keep the reference under 100 characters.').default(''),
});
export type OfflinePaymentInput = z.infer<typeof offlinePaymentSchema>;

export const refundSchema = z.object({
  amountCents: cents('Amount').min(1, 'Amount must be more than zero.'),
  reason: z.string().trim().max(300, 'Keep the reason under 300 characters.').default(''),
  paymentId: z.uuid('Choose a payment.').optional(),
});
export type RefundInput = z.infer<typeof refundSchema>;

export const invoiceListQuerySchema = z.object({
  status: z.enum(INVOICE_STATUSES).optional(),
  customerId: z.uuid().optional(),
  q: z.string().max(100).optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).default(0),
});

export interface InvoiceLineView {
  description: string;
  kind: string;
  quantity: number;
  unitCents: number;
  taxable: boolean;
  grossCents: number;
  discountCents: number;
  netCents: number;
  /** The plan's coverage on this line written out, e.g. "Repair discount 15 %: −$27.00."; empty when none. */
  reason: string;
}

export interface PaymentView {
  id: string;
  method: PaymentMethod;
  status: PaymentStatus;
  amountCents: number;
  refundedCents: number;
  reference: string;
  cardLast4: string | null;
  succeededAt: string | null;
  createdAt: string;
}

export interface InvoiceView {
  id: string;
  number: number | null;
  customerId: string;
  customerName: string;
  agreementId: string | null;
  purpose: InvoicePurpose;
  status: InvoiceStatus;
  discountBps: number;
  taxRateBps: number;
  subtotalCents: number;
  discountCents: number;
  taxCents: number;
  totalCents: number;
  paidCents: number;
  refundedCents: number;
  balanceCents: number;
  notes: string;
  issuedAt: string | null;
  paidAt: string | null;
  lines: InvoiceLineView[];
  payments: PaymentView[];
}

export interface InvoiceSummary {
  id: string;
  number: number | null;
  customerName: string;
  purpose: InvoicePurpose;
  status: InvoiceStatus;
  totalCents: number;
  balanceCents: number;
  issuedAt: string | null;
}

export interface CheckoutStart {
  checkoutUrl: string;
}
