import type { ChartConfiguration } from 'chart.js';
import { formatUsd } from '../../../../shared/money';
import type { Report, ReportName } from '../../../../shared/schemas/reports';

// One colour per series, the same on every report page (theme tokens from src/styles.scss).
function token(name: string): string {
  return (typeof document !== 'undefined' && getComputedStyle(document.documentElement).getPropertyValue(name).trim()) || 'gray';
}
const SERIES = {
  primary: '--sw-teal',
  accent: '--sw-ember',
  good: '--sw-ok',
  alert: '--sw-alert',
  ink: '--sw-ink',
} as const;
const color = (s: keyof typeof SERIES) => token(SERIES[s]);

const monthLabel = (iso: string) => new Intl.DateTimeFormat('en-US', { month: 'short', year: 'numeric', timeZone: 'UTC' }).format(new Date(`${iso}T00:00:00Z`));
const weekLabel = (iso: string) => new Intl.DateTimeFormat('en-US', { day: 'numeric', month: 'short', timeZone: 'UTC' }).format(new Date(`${iso}T00:00:00Z`));
const pct = (v: number | null) => (v === null ? null : Math.round(v * 1000) / 10);

type Config = ChartConfiguration<'bar' | 'line'>;

const base = (yTitle: string, y2Title?: string): Config['options'] => ({
  responsive: true,
  maintainAspectRatio: false,
  animation: false,
  interaction: { mode: 'index', intersect: false },
  scales: {
    y: { beginAtZero: true, title: { display: true, text: yTitle } },
    ...(y2Title ? { y2: { beginAtZero: true, position: 'right' as const, grid: { drawOnChartArea: false }, title: { display: true, text: y2Title } } } : {}),
  },
});

export function agreementsChart(r: Report<'agreements'>): Config {
  const rows = r.rows;
  return {
    type: 'bar',
    data: {
      labels: rows.map((x) => monthLabel(x.month)),
      datasets: [
        { type: 'line', label: 'Active', data: rows.map((x) => x.active), borderColor: color('ink'), backgroundColor: color('ink'), yAxisID: 'y' },
        { label: 'New', data: rows.map((x) => x.new), backgroundColor: color('primary'), yAxisID: 'y' },
        { label: 'Renewed', data: rows.map((x) => x.renewed), backgroundColor: color('good'), yAxisID: 'y' },
        { label: 'Lapsed', data: rows.map((x) => x.lapsed), backgroundColor: color('alert'), yAxisID: 'y' },
        {
          type: 'line',
          label: 'Renewal rate (%)',
          data: rows.map((x) => pct(x.renewalRate)),
          borderColor: color('accent'),
          backgroundColor: color('accent'),
          borderDash: [6, 4],
          yAxisID: 'y2',
          spanGaps: true,
        },
      ],
    } as Config['data'],
    options: base('Agreements', 'Renewal rate, %'),
  };
}

export function revenueChart(r: Report<'revenue'>): Config {
  const rows = r.rows;
  const dollars = (c: number | null) => (c === null ? null : c / 100);
  const options = base('Dollars received', 'Average invoice, $');
  return {
    type: 'bar',
    data: {
      labels: rows.map((x) => monthLabel(x.month)),
      datasets: [
        { label: 'Plans', data: rows.map((x) => dollars(x.plansCents)), backgroundColor: color('primary'), stack: 'money', yAxisID: 'y' },
        { label: 'Tune-ups', data: rows.map((x) => dollars(x.tuneUpsCents)), backgroundColor: color('ink'), stack: 'money', yAxisID: 'y' },
        { label: 'Repairs', data: rows.map((x) => dollars(x.repairsCents)), backgroundColor: color('accent'), stack: 'money', yAxisID: 'y' },
        { label: 'Coverage savings', data: rows.map((x) => dollars(x.savingsCents)), backgroundColor: color('good'), stack: 'savings', yAxisID: 'y' },
        {
          type: 'line',
          label: 'Average invoice',
          data: rows.map((x) => dollars(x.averageInvoiceCents)),
          borderColor: color('alert'),
          backgroundColor: color('alert'),
          borderDash: [6, 4],
          yAxisID: 'y2',
          spanGaps: true,
        },
      ],
    } as Config['data'],
    options: { ...options, scales: { ...options!.scales, x: { stacked: true } } },
  };
}

export function visitsChart(r: Report<'visits'>): Config {
  const rows = r.rows;
  const options = base('Visits', 'No-show and first-visit fix rates, %');
  return {
    type: 'bar',
    data: {
      labels: rows.map((x) => weekLabel(x.week)),
      datasets: [
        { label: 'Tune-ups', data: rows.map((x) => x.tuneUps), backgroundColor: color('primary'), stack: 'kind', yAxisID: 'y' },
        { label: 'Service calls', data: rows.map((x) => x.serviceCalls), backgroundColor: color('accent'), stack: 'kind', yAxisID: 'y' },
        {
          type: 'line',
          label: 'No-show rate (%)',
          data: rows.map((x) => pct(x.noShowRate)),
          borderColor: color('alert'),
          backgroundColor: color('alert'),
          yAxisID: 'y2',
          spanGaps: true,
        },
        {
          type: 'line',
          label: 'First-visit fix (%)',
          data: rows.map((x) => pct(x.firstVisitFixRate)),
          borderColor: color('good'),
          backgroundColor: color('good'),
          borderDash: [6, 4],
          yAxisID: 'y2',
          spanGaps: true,
        },
      ],
    } as Config['data'],
    options: { ...options, scales: { ...options!.scales, x: { stacked: true } } },
  };
}

export function utilisationChart(r: Report<'utilisation'>): Config {
  const weeks = [...new Set(r.rows.map((x) => x.week))];
  const techs = [...new Map(r.rows.map((x) => [x.technicianId, x.technicianName])).entries()];
  const palette: (keyof typeof SERIES)[] = ['primary', 'accent', 'good', 'ink', 'alert'];
  return {
    type: 'line',
    data: {
      labels: weeks.map(weekLabel),
      datasets: techs.map(([id, name], i) => {
        const c = color(palette[i % palette.length]!);
        return {
          label: name,
          data: weeks.map((w) => pct(r.rows.find((x) => x.week === w && x.technicianId === id)?.utilisation ?? null)),
          borderColor: c,
          backgroundColor: c,
          spanGaps: true,
        };
      }),
    },
    options: base('Booked ÷ available hours, %'),
  };
}

export const CHARTS: { [N in ReportName]: (r: Report<N>) => Config } = {
  agreements: agreementsChart,
  revenue: revenueChart,
  visits: visitsChart,
  utilisation: utilisationChart,
};

/** The chart's numbers as a table, for screen readers and for reading exact values. */
export function tableOf(r: Report): { head: string[]; rows: string[][] } {
  const p = (v: number | null) => (v === null ? '—' : `${(v * 100).toFixed(1)} %`);
  const h = (m: number) => (m / 60).toFixed(1);
  switch (r.report) {
    case 'agreements':
      return {
        head: ['Month', 'Active', 'New', 'Due', 'Renewed', 'Lapsed', 'Renewal rate'],
        rows: (r as Report<'agreements'>).rows.map((x) => [monthLabel(x.month), `${x.active}`, `${x.new}`, `${x.due}`, `${x.renewed}`, `${x.lapsed}`, p(x.renewalRate)]),
      };
    case 'revenue':
      return {
        head: ['Month', 'Plans', 'Tune-ups', 'Repairs', 'Total', 'Invoices', 'Average invoice', 'Coverage savings'],
        rows: (r as Report<'revenue'>).rows.map((x) => [
          monthLabel(x.month),
          formatUsd(x.plansCents),
          formatUsd(x.tuneUpsCents),
          formatUsd(x.repairsCents),
          formatUsd(x.totalCents),
          `${x.invoices}`,
          x.averageInvoiceCents === null ? '—' : formatUsd(x.averageInvoiceCents),
          formatUsd(x.savingsCents),
        ]),
      };
    case 'visits':
      return {
        head: ['Week of', 'Tune-ups', 'Service calls', 'Done', 'No-shows', 'No-show rate', 'Repairs', 'Fixed on first visit', 'First-visit fix'],
        rows: (r as Report<'visits'>).rows.map((x) => [
          weekLabel(x.week),
          `${x.tuneUps}`,
          `${x.serviceCalls}`,
          `${x.done}`,
          `${x.noShows}`,
          p(x.noShowRate),
          `${x.repairs}`,
          `${x.firstVisitFixes}`,
          p(x.firstVisitFixRate),
        ]),
      };
    case 'utilisation':
      return {
        head: ['Week of', 'Technician', 'Booked h', 'Available h', 'Utilisation'],
        rows: (r as Report<'utilisation'>).rows.map((x) => [weekLabel(x.week), x.technicianName, h(x.bookedMinutes), h(x.availableMinutes), p(x.utilisation)]),
      };
  }
}
