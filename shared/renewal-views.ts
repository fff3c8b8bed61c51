// The renewal board's views.
// No zod here, so the client can use these without the validator; the API contract in shared/schemas/ builds on them.

export const RENEWAL_VIEWS = ['due30', 'due60', 'due90', 'past_due', 'lapsed', 'renewed'] as const;

export type RenewalView = (typeof RENEWAL_VIEWS)[number];

export const RENEWAL_VIEW_LABELS: Record<RenewalView, string> = {
  due30: 'Due in 30 days',
  due60: 'Due in 60 days',
  due90: 'Due in 90 days',
  past_due: 'Past due',
  lapsed: 'Lapsed',
  renewed: 'Recently renewed',
};
