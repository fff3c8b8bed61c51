import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { REPORT_DEFINITIONS } from '../../../../shared/report-definitions';
import type { Report, ReportName, ReportQuery } from '../../../../shared/schemas/reports';
import { errorMessage, localCopy } from '../../core/resource-state';
import { Chart } from '../../ui/chart';
import { CHARTS, tableOf } from './report-charts';
import { ReportsApi } from './reports-api';

/** One report: its chart, what each number means, the numbers as a table, and the CSV. */
@Component({
  selector: 'sw-report-section',
  imports: [Chart, MatButtonModule],
  template: `
    <section [attr.aria-labelledby]="name() + '-h'" class="report">
      <div class="head">
        <h2 [id]="name() + '-h'">{{ definition().title }}</h2>
        <a mat-stroked-button [href]="csvUrl()" [attr.download]="name() + '.csv'">Download CSV</a>
      </div>
      @if (error()) {
        <p role="alert" class="error">{{ error() }}</p>
      }
      <div class="chart">
        @if (config(); as c) {
          @defer (on idle) {
            <sw-chart [config]="c" [label]="definition().title + ' chart; the numbers are in the table below it'" />
          } @placeholder {
            <p class="loading">Loading…</p>
          }
        } @else if (!error()) {
          <p class="loading">Loading…</p>
        }
      </div>
      <ul class="definitions">
        @for (line of definition().lines; track $index) {
          <li>{{ line }}</li>
        }
      </ul>
      @if (table(); as t) {
        <details>
          <summary>Show the numbers</summary>
          <div class="scroll">
            <table>
              <thead>
                <tr>
                  @for (h of t.head; track $index) {
                    <th scope="col">{{ h }}</th>
                  }
                </tr>
              </thead>
              <tbody>
                @for (r of t.rows; track $index) {
                  <tr>
                    @for (c of r; track $index) {
                      <td>{{ c }}</td>
                    }
                  </tr>
                } @empty {
                  <tr>
                    <td [attr.colspan]="t.head.length">Nothing in this range.</td>
                  </tr>
                }
              </tbody>
            </table>
          </div>
        </details>
      }
    </section>
  `,
  styles: `
    .report {
      padding: 12px 0 20px;
      border-top: 1px solid var(--mat-sys-outline-variant);
    }
    .head {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      justify-content: space-between;
      gap: 8px;
    }
    h2 {
      margin: 0;
      font-size: 1.2rem;
    }
    .chart {
      position: relative;
      height: 300px;
    }
    .definitions {
      margin: 8px 0;
      padding-left: 18px;
      color: var(--mat-sys-on-surface-variant);
      font-size: 0.92rem;
    }
    .scroll {
      overflow-x: auto;
    }
    table {
      border-collapse: collapse;
      font-size: 0.9rem;
    }
    th,
    td {
      padding: 2px 10px;
      text-align: right;
      border-bottom: 1px solid var(--mat-sys-outline-variant);
      white-space: nowrap;
    }
    th:first-child,
    td:first-child {
      text-align: left;
    }
    .error {
      color: var(--sw-alert);
      font-weight: 700;
    }
    .loading {
      color: var(--mat-sys-on-surface-variant);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReportSection {
  private readonly api = inject(ReportsApi);
  readonly name = input.required<ReportName>();
  readonly query = input.required<ReportQuery>();
  private readonly read = rxResource({ params: () => ({ name: this.name(), q: this.query() }), stream: ({ params }) => this.api.load(params.name, params.q) });
  private readonly report = localCopy<Report>(this.read, true);
  protected readonly error = errorMessage(this.read);
  protected readonly definition = computed(() => REPORT_DEFINITIONS[this.name()]);
  protected readonly csvUrl = computed(() => this.api.csvUrl(this.name(), this.query()));
  protected readonly config = computed(() => {
    const r = this.report();
    return r ? (CHARTS[r.report] as (x: Report) => ReturnType<(typeof CHARTS)['agreements']>)(r) : null;
  });
  protected readonly table = computed(() => {
    const r = this.report();
    return r ? tableOf(r) : null;
  });
}
