// Invoice statuses and their words.
// No zod here, so the client can use these without the validator; the API contract in shared/schemas/ builds on them.

export const INVOICE_STATUSES = ['draft', 'open', 'paid', 'void', 'refunded', 'partially_refunded'] as const;

export type InvoiceStatus = (typeof INVOICE_STATUSES)[number];

export const INVOICE_STATUS_LABELS: Record<InvoiceStatus, string> = {
  draft: 'Draft',
  open: 'Open',
  paid: 'Paid',
  void: 'Void',
  refunded: 'Refunded',
  partially_refunded: 'Partly refunded',
};
