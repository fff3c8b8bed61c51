import { ChangeDetectionStrategy, Component, computed, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { provideNativeDateAdapter } from '@angular/material/core';
import { MatDatepickerModule } from '@angular/material/datepicker';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { REPORTS } from '../../../../shared/report-definitions';
import type { ReportQuery } from '../../../../shared/schemas/reports';
import { urlFilters } from '../../core/url-filters';
import { ReportSection } from './report-section';

const ISO = /^\d{4}-\d{2}-\d{2}$/;
const pad = (n: number) => String(n).padStart(2, '0');
/** A picker's Date (local midnight) as the calendar day the person picked. */
const isoOf = (d: Date) => `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;
const dateOf = (iso: string) => new Date(Number(iso.slice(0, 4)), Number(iso.slice(5, 7)) - 1, Number(iso.slice(8, 10)));

/** The owner's and office's reports over a range of days, each with its chart, definitions and CSV. */
@Component({
  selector: 'sw-reports-page',
  imports: [ReactiveFormsModule, MatDatepickerModule, MatFormFieldModule, MatInputModule, ReportSection],
  providers: [provideNativeDateAdapter()],
  host: { class: 'sw-dense' },
  template: `
    <section class="sw-page">
      <h1>Reports</h1>
      <p class="sw-lead">How the agreements, the money, the visits and the technicians' hours are going, month by month and week by week.</p>
      <mat-form-field class="range">
        <mat-label>Dates</mat-label>
        <mat-date-range-input [formGroup]="range" [rangePicker]="picker">
          <input matStartDate formControlName="start" placeholder="From" aria-label="From" />
          <input matEndDate formControlName="end" placeholder="To" aria-label="To" (dateChange)="apply()" />
        </mat-date-range-input>
        <mat-hint>Months and weeks at either end count only the days inside the range.</mat-hint>
        <mat-datepicker-toggle matIconSuffix [for]="picker" />
        <mat-date-range-picker #picker />
      </mat-form-field>
      @for (r of reports; track r) {
        <sw-report-section [name]="r" [query]="query()" />
      }
    </section>
  `,
  styles: `
    .range {
      width: 100%;
      max-width: 360px;
      margin-bottom: 12px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReportsPage {
  private readonly url = urlFilters();
  protected readonly reports = REPORTS;
  private readonly from = signal(
    this.initial('from', () => {
      const d = new Date();
      return isoOf(new Date(d.getFullYear(), d.getMonth() - 11, 1));
    }),
  );
  private readonly to = signal(this.initial('to', () => isoOf(new Date())));
  protected readonly query = computed<ReportQuery>(() => ({ from: this.from(), to: this.to() }));
  protected readonly range = new FormGroup({
    start: new FormControl<Date | null>(dateOf(this.from())),
    end: new FormControl<Date | null>(dateOf(this.to())),
  });

  constructor() {
    this.url.keep(() => ({ from: this.from(), to: this.to() }));
  }

  private initial(name: string, fallback: () => string): string {
    const v = this.url.read(name);
    return v && ISO.test(v) ? v : fallback();
  }

  protected apply(): void {
    const { start, end } = this.range.getRawValue();
    if (!start || !end || end < start) return;
    this.from.set(isoOf(start));
    this.to.set(isoOf(end));
  }
}
