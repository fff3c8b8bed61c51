export const AGREEMENT_STATUSES = ['pending', 'active', 'renewal_due', 'past_due', 'lapsed', 'canceled'] as const;
export type AgreementStatus = (typeof AGREEMENT_STATUSES)[number];

export const AGREEMENT_STATUS_LABELS: Record<AgreementStatus, string> = {
  pending: 'Pending payment',
  active: 'Active',
  renewal_due: 'Renewal due',
  past_due: 'Past due',
  lapsed: 'Lapsed',
  canceled: 'Canceled',
};
