// The reports and what each number means.
// No zod here, so the client can use these without the validator; the API contract in shared/schemas/ builds on them.

export const REPORTS = ['agreements', 'revenue', 'visits', 'utilisation'] as const;

export type ReportName = (typeof REPORTS)[number];

/** What each number means, in plain words, shown under its chart and at the top of its CSV. */
export const REPORT_DEFINITIONS: Record<ReportName, { title: string; lines: string[] }> = {
  agreements: {
    title: 'Agreements',
    lines: [
      'Active: agreements with a paid term that covers the last day of the month (today, for this month), not canceled by then.',
      'New: agreements whose first paid term starts in the month.',
      'Due: paid terms whose last covered day falls in the month. Renewed: of those, the ones followed by a next paid term. Lapsed: not renewed, and the agreement has since lapsed or been canceled.',
      'Renewal rate: renewed ÷ due, for the terms due in the month.',
    ],
  },
  revenue: {
    title: 'Revenue',
    lines: [
      'Money received: card, check and cash payments, in the month they succeeded (company time zone), less refunds in the month they were made.',
      'Plans: payments on enrollment, renewal and plan-change invoices. Tune-ups: payments on service invoices for work done on a tune-up visit. Repairs: payments on every other service invoice (service calls, follow-up visits, and invoices the office typed without a visit).',
      'Average invoice: the mean total of the invoices issued in the month, drafts and voided ones left out.',
      'Coverage savings: the members’ plan discount taken off the invoices issued in the month.',
    ],
  },
  visits: {
    title: 'Visits',
    lines: [
      'Visits per week (Monday to Sunday, company time zone) by kind, canceled visits left out.',
      'No-show rate: visits marked “no one home” ÷ (completed visits + no-shows) in the week.',
      'Repairs: visits in the week on which the homeowner approved a quote; a follow-up visit to fit an ordered part is counted with the repair’s first visit, not again.',
      'First-visit fix: the share of those repairs where every part was on the truck, so no approved quote had to open a follow-up visit for an ordered part.',
    ],
  },
  utilisation: {
    title: 'Technician utilisation',
    lines: [
      'Booked hours: the planned work time of each technician’s visits that week, canceled visits left out.',
      'Available hours: the technician’s weekly working hours on the days in the range, less time off.',
      'Utilisation: booked ÷ available hours, per technician per week; above 100 % means booked past their hours.',
    ],
  },
};
