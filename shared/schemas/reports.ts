import { z } from 'zod';
import { isoDate } from './dates';

// The owner's and office's reports: one chart each, one SQL statement each. The definitions are
// written here once, so the page shows under each chart exactly what the server computes.

export const REPORTS = ['agreements', 'revenue', 'visits', 'utilisation'] as const;
export type ReportName = (typeof REPORTS)[number];

/** The longest range one request may ask for (three years of months, or weeks). */
export const REPORT_MAX_DAYS = 366 * 3 + 1;

export const reportNameSchema = z.enum(REPORTS, { error: `Report is one of ${REPORTS.join(', ')}.` });

export const reportQuerySchema = z
  .object({
    from: isoDate('From is a real date, YYYY-MM-DD.'),
    to: isoDate('To is a real date, YYYY-MM-DD.'),
  })
  .refine((q) => q.to >= q.from, { message: 'To must be on or after From.', path: ['to'] })
  .refine((q) => (Date.parse(q.to) - Date.parse(q.from)) / 86_400_000 < REPORT_MAX_DAYS, { message: 'Choose a range of at most three years.', path: ['to'] });
export type ReportQuery = z.infer<typeof reportQuerySchema>;

export interface AgreementsMonth {
  /** First day of the month, YYYY-MM-DD. */
  month: string;
  /** Agreements with a paid term covering the month's last day (or today, for the current month). */
  active: number;
  new: number;
  /** Terms whose last day falls in the month… */
  due: number;
  /** …that were followed by a next paid term. */
  renewed: number;
  /** …that were not renewed and whose agreement has since lapsed or been canceled. */
  lapsed: number;
  /** renewed ÷ due, 0–1; null in a month with nothing due. */
  renewalRate: number | null;
}

export interface RevenueMonth {
  month: string;
  /** Enrollment, renewal and plan-change invoices. */
  plansCents: number;
  /** Service invoices for work on a tune-up visit. */
  tuneUpsCents: number;
  /** Every other service invoice: service calls, follow-up visits, invoices typed without a visit. */
  repairsCents: number;
  totalCents: number;
  invoices: number;
  averageInvoiceCents: number | null;
  savingsCents: number;
}

export interface VisitsWeek {
  /** Monday of the week, YYYY-MM-DD. */
  week: string;
  tuneUps: number;
  serviceCalls: number;
  done: number;
  noShows: number;
  /** no-shows ÷ (done + no-shows), 0–1; null in a week with neither. */
  noShowRate: number | null;
  /** Visits on which the homeowner approved a quote, follow-up visits left out. */
  repairs: number;
  /** …of which no approved quote opened a follow-up visit for an ordered part. */
  firstVisitFixes: number;
  /** firstVisitFixes ÷ repairs, 0–1; null in a week with no repair. */
  firstVisitFixRate: number | null;
}

export interface UtilisationWeek {
  week: string;
  technicianId: string;
  technicianName: string;
  /** Whole minutes, so the sums stay exact. */
  bookedMinutes: number;
  availableMinutes: number;
  /** booked ÷ available, 0 or more; null when the technician had no hours that week. */
  utilisation: number | null;
}

export interface ReportRows {
  agreements: AgreementsMonth;
  revenue: RevenueMonth;
  visits: VisitsWeek;
  utilisation: UtilisationWeek;
}

export interface Report<N extends ReportName = ReportName> {
  report: N;
  from: string;
  to: string;
  rows: ReportRows[N][];
}

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
