import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import type { ChartConfiguration, PointStyle } from 'chart.js';
import type { PropertyReadings, ReadingSeries, ReadingStatus, SystemReadings } from '../../../../shared/schemas/field';
import { errorMessage, localCopy } from '../../core/resource-state';
import { bandPlugin, type Band } from './band-plugin';
import { ReadingsApi } from './readings-api';
import { ReadingStatusMark } from '../../ui/status/reading-status';
import { Chart } from '../../ui/chart';
import { dayLabel } from '../../ui/dates';
import { Session } from '../../core/session';

const POINT_STYLE: Record<ReadingStatus, PointStyle> = { ok: 'circle', watch: 'triangle', alert: 'rectRot' };
const POINT_TOKEN: Record<ReadingStatus, string> = { ok: '--sw-ok', watch: '--sw-watch', alert: '--sw-alert' };

/** A theme colour by its custom property: the canvas cannot read CSS variables itself. */
function token(name: string): string {
  return getComputedStyle(document.documentElement).getPropertyValue(name).trim() || '#808080';
}

/** "#23744a" at 16 % opacity, for the band behind the line. */
function translucent(hex: string, alpha: number): string {
  const m = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(hex);
  return m ? `rgba(${parseInt(m[1]!, 16)}, ${parseInt(m[2]!, 16)}, ${parseInt(m[3]!, 16)}, ${alpha})` : hex;
}
const WORDS: Record<ReadingStatus, string> = { ok: 'in range', watch: 'worth watching', alert: 'out of range' };

/** A home's readings over time, one chart per system, with the normal band shaded behind the line. */
@Component({
  selector: 'sw-readings-chart',
  imports: [Chart, MatButtonToggleModule, ReadingStatusMark],
  templateUrl: './readings-chart.html',
  styleUrl: './readings-chart.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReadingsChart {
  private readonly api = inject(ReadingsApi);
  private readonly session = inject(Session);
  protected readonly day = (iso: string) => dayLabel(iso, this.session.timeZone());
  readonly propertyId = input.required<string>();

  private readonly read = rxResource({ params: () => this.propertyId(), stream: ({ params }) => this.api.property(params) });
  protected readonly data = localCopy<PropertyReadings>(this.read);
  protected readonly error = errorMessage(this.read);
  /** Chosen check per system. */
  protected readonly chosen = signal<Record<string, string>>({});

  protected readonly systems = computed(() => (this.data()?.systems ?? []).filter((s) => s.series.length > 0));

  protected seriesOf(system: SystemReadings): ReadingSeries {
    const pick = this.chosen()[system.equipmentId];
    return system.series.find((s) => s.check === pick) ?? system.series.find((s) => s.check === 'temperature_split') ?? system.series[0]!;
  }

  protected choose(system: SystemReadings, check: string): void {
    this.chosen.set({ ...this.chosen(), [system.equipmentId]: check });
  }

  protected band(p: { expected: { min?: number; max?: number; target?: number } }): string {
    const { min, max } = p.expected;
    if (min !== undefined && max !== undefined) return `${min}–${max}`;
    if (max !== undefined) return `up to ${max}`;
    return '—';
  }

  protected summary(series: ReadingSeries): string {
    const last = series.points[series.points.length - 1]!;
    return `${series.label} over ${series.points.length} visit${series.points.length === 1 ? '' : 's'}; latest ${last.value} ${series.unit} on ${this.day(last.recordedAt)}, ${WORDS[last.status]}${last.expected.min !== undefined && last.expected.max !== undefined ? ` (normal ${last.expected.min}–${last.expected.max} ${series.unit})` : ''}.`;
  }

  // One config object per series, cached so change detection does not rebuild the chart.
  private readonly configs = new Map<ReadingSeries, { config: ChartConfiguration<'line'>; plugins: ReturnType<typeof bandPlugin>[] }>();

  protected chart(series: ReadingSeries) {
    let c = this.configs.get(series);
    if (c) return c;
    const bands: Band[] = series.points.map((p) => ({ min: p.expected.min, max: p.expected.max }));
    const all = series.points.flatMap((p) => [p.value, p.expected.min, p.expected.max].filter((v): v is number => v !== undefined));
    const lo = Math.min(...all);
    const hi = Math.max(...all);
    const pad = Math.max(1, (hi - lo) * 0.15);
    c = {
      config: {
        type: 'line',
        data: {
          labels: series.points.map((p) => this.day(p.recordedAt)),
          datasets: [
            {
              label: `${series.label} (${series.unit})`,
              data: series.points.map((p) => p.value),
              borderColor: token('--sw-teal'),
              borderWidth: 3,
              pointRadius: 7,
              pointHoverRadius: 9,
              pointStyle: series.points.map((p) => POINT_STYLE[p.status]),
              pointBackgroundColor: series.points.map((p) => token(POINT_TOKEN[p.status])),
              tension: 0,
            },
          ],
        },
        options: {
          responsive: true,
          maintainAspectRatio: false,
          animation: false,
          scales: {
            y: { suggestedMin: lo - pad, suggestedMax: hi + pad, title: { display: true, text: series.unit } },
            x: { offset: true },
          },
          plugins: {
            legend: { display: false },
            tooltip: {
              callbacks: {
                label: (item) => {
                  const p = series.points[item.dataIndex]!;
                  return `${p.value} ${series.unit}, ${WORDS[p.status]} (normal ${this.band(p)})`;
                },
              },
            },
          },
        },
      },
      plugins: [bandPlugin(() => bands, translucent(token('--sw-ok'), 0.16))],
    };
    this.configs.set(series, c);
    return c;
  }
}
