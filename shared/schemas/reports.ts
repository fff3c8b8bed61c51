import * as z from 'zod';
import { isoDate } from './dates';
import { REPORTS, type ReportName } from '../report-definitions';
export { REPORTS, type ReportName, REPORT_DEFINITIONS } from '../report-definitions';

// The owner's and office's reports: one chart each, one SQL statement each. The definitions are
// written here once, so the page shows under each chart exactly what the server computes.

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
