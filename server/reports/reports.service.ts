import { type Report, type ReportName, type ReportQuery, type ReportRows } from '../../shared/schemas/reports';
import type { AppDeps } from '../deps';
import { toCsv } from '../http/csv';
import { REPORT_SQL } from './report-sql';

type Raw = Record<string, unknown>;
const int = (v: unknown) => (v === null || v === undefined ? 0 : Number(v));
const intOrNull = (v: unknown) => (v === null || v === undefined ? null : Number(v));

// Column renames only: the statement has already computed every number.
const SHAPE: { [N in ReportName]: (r: Raw) => ReportRows[N] } = {
  agreements: (r) => ({
    month: String(r.month),
    active: int(r.active),
    new: int(r.new),
    due: int(r.due),
    renewed: int(r.renewed),
    lapsed: int(r.lapsed),
    renewalRate: intOrNull(r.renewal_rate),
  }),
  revenue: (r) => ({
    month: String(r.month),
    plansCents: int(r.plans_cents),
    tuneUpsCents: int(r.tune_ups_cents),
    repairsCents: int(r.repairs_cents),
    totalCents: int(r.total_cents),
    invoices: int(r.invoices),
    averageInvoiceCents: intOrNull(r.average_invoice_cents),
    savingsCents: int(r.savings_cents),
  }),
  visits: (r) => ({
    week: String(r.week),
    tuneUps: int(r.tune_ups),
    serviceCalls: int(r.service_calls),
    done: int(r.done),
    noShows: int(r.no_shows),
    noShowRate: intOrNull(r.no_show_rate),
    repairs: int(r.repairs),
    firstVisitFixes: int(r.first_visit_fixes),
    firstVisitFixRate: intOrNull(r.first_visit_fix_rate),
  }),
  utilisation: (r) => ({
    week: String(r.week),
    technicianId: String(r.technician_id),
    technicianName: String(r.technician_name),
    bookedMinutes: int(r.booked_minutes),
    availableMinutes: int(r.available_minutes),
    utilisation: intOrNull(r.utilisation),
  }),
};

/** One report over a range of the company's days, in one SQL statement. */
export async function runReport<N extends ReportName>(deps: Pick<AppDeps, 'database' | 'clock'>, name: N, q: ReportQuery): Promise<Report<N>> {
  const { db } = deps.database;
  const result = await db.execute<Raw>(REPORT_SQL[name](q, deps.clock()));
  const rows = result.rows.map((r) => SHAPE[name](r) as ReportRows[N]);
  return { report: name, from: q.from, to: q.to, rows };
}

const dollars = (cents: number | null) => (cents === null ? '' : (cents / 100).toFixed(2));
const ratio = (v: number | null) => (v === null ? '' : v.toFixed(4));
const hours = (minutes: number) => (minutes / 60).toFixed(2);

const CSV: { [N in ReportName]: { fields: string[]; row: (r: ReportRows[N]) => (string | number)[] } } = {
  agreements: {
    fields: ['month', 'active', 'new', 'due', 'renewed', 'lapsed', 'renewal_rate'],
    row: (r) => [r.month, r.active, r.new, r.due, r.renewed, r.lapsed, ratio(r.renewalRate)],
  },
  revenue: {
    fields: ['month', 'plans_usd', 'tune_ups_usd', 'repairs_usd', 'total_usd', 'invoices_issued', 'average_invoice_usd', 'coverage_savings_usd'],
    row: (r) => [
      r.month,
      dollars(r.plansCents),
      dollars(r.tuneUpsCents),
      dollars(r.repairsCents),
      dollars(r.totalCents),
      r.invoices,
      dollars(r.averageInvoiceCents),
      dollars(r.savingsCents),
    ],
  },
  visits: {
    fields: ['week', 'tune_ups', 'service_calls', 'done', 'no_shows', 'no_show_rate', 'repairs', 'first_visit_fixes', 'first_visit_fix_rate'],
    row: (r) => [r.week, r.tuneUps, r.serviceCalls, r.done, r.noShows, ratio(r.noShowRate), r.repairs, r.firstVisitFixes, ratio(r.firstVisitFixRate)],
  },
  utilisation: {
    fields: ['week', 'technician', 'booked_hours', 'available_hours', 'utilisation'],
    row: (r) => [r.week, r.technicianName, hours(r.bookedMinutes), hours(r.availableMinutes), ratio(r.utilisation)],
  },
};

/** The same report as a spreadsheet: one header row, one row per month, week or technician-week. */
export async function reportCsv(deps: Pick<AppDeps, 'database' | 'clock'>, name: ReportName, q: ReportQuery): Promise<string> {
  const report = await runReport(deps, name, q);
  const shape = CSV[name] as { fields: string[]; row: (r: unknown) => (string | number)[] };
  return toCsv(shape.fields, report.rows.map(shape.row));
}
