import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatPaginatorModule, type PageEvent } from '@angular/material/paginator';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSortModule, type Sort } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { formatUsd } from '../../../../shared/money';
import { QUOTE_STATUS_LABELS } from '../../../../shared/pricebook';
import type { QuoteSummary } from '../../../../shared/schemas/pricebook';
import { errorMessage } from '../../core/resource-state';
import { OfficeQuotesApi } from './office-quotes-api';

/** Quotes waiting for the homeowner, with their age and value, and how many quotes are approved. */
@Component({
  selector: 'sw-open-quotes',
  imports: [MatButtonToggleModule, MatPaginatorModule, MatProgressBarModule, MatSortModule, MatTableModule],
  template: `
    <h1>Quotes</h1>
    <p class="sw-lead">Quotes sent to homeowners, with their age and value, and how many are approved.</p>
    @if (stats.hasValue()) {
      @if (stats.value(); as s) {
        <dl class="facts">
          <div>
            <dt>Open quotes</dt>
            <dd>{{ s.open.count }}</dd>
          </div>
          <div>
            <dt>Open value</dt>
            <dd>{{ usd(s.open.valueCents) }}</dd>
          </div>
          <div>
            <dt>Approved, last {{ s.periodDays }} days</dt>
            <dd>{{ s.approvalRateBps === null ? 'No quotes decided yet' : pct(s.approvalRateBps) }}</dd>
          </div>
        </dl>
      }
    }
    <mat-button-toggle-group [value]="status()" (change)="status.set($event.value); pageIndex.set(0)" aria-label="Which quotes">
      <mat-button-toggle value="open">Open</mat-button-toggle>
      <mat-button-toggle value="approved">Approved</mat-button-toggle>
      <mat-button-toggle value="declined">Declined</mat-button-toggle>
      <mat-button-toggle value="expired">Expired</mat-button-toggle>
      <mat-button-toggle value="">All</mat-button-toggle>
    </mat-button-toggle-group>
    @if (list.isLoading()) {
      <mat-progress-bar mode="indeterminate" aria-label="Loading quotes" />
    }
    @if (error(); as e) {
      <p role="alert">{{ e }}</p>
    }
    <table mat-table [dataSource]="rows()" matSort (matSortChange)="sorted($event)" aria-label="Quotes">
      <ng-container matColumnDef="number"
        ><th mat-header-cell *matHeaderCellDef>Quote</th>
        <td mat-cell *matCellDef="let r">{{ r.number ? 'Q-' + r.number : 'Draft' }}</td></ng-container
      >
      <ng-container matColumnDef="customer"
        ><th mat-header-cell *matHeaderCellDef>Household</th>
        <td mat-cell *matCellDef="let r">{{ r.customerName }}</td></ng-container
      >
      <ng-container matColumnDef="status"
        ><th mat-header-cell *matHeaderCellDef mat-sort-header>Status</th>
        <td mat-cell *matCellDef="let r">{{ labelOf(r) }}</td></ng-container
      >
      <ng-container matColumnDef="createdAt"
        ><th mat-header-cell *matHeaderCellDef mat-sort-header>Age</th>
        <td mat-cell *matCellDef="let r">{{ r.ageDays }} day{{ r.ageDays === 1 ? '' : 's' }}</td></ng-container
      >
      <ng-container matColumnDef="totalCents"
        ><th mat-header-cell *matHeaderCellDef mat-sort-header class="num">Value</th>
        <td mat-cell *matCellDef="let r" class="num">{{ usd(r.totalCents) }}</td></ng-container
      >
      <tr mat-header-row *matHeaderRowDef="columns"></tr>
      <tr mat-row *matRowDef="let row; columns: columns"></tr>
      <tr class="mat-row" *matNoDataRow>
        <td class="mat-cell" [attr.colspan]="columns.length">No quotes here. Technicians build quotes on their visits; sent ones show here until the homeowner answers.</td>
      </tr>
    </table>
    <mat-paginator [length]="total()" [pageIndex]="pageIndex()" [pageSize]="25" [hidePageSize]="true" (page)="paged($event)" aria-label="Quote pages" />
  `,
  styles: `
    :host {
      display: block;
      padding: 16px;
    }
    table {
      width: 100%;
    }
    .num {
      text-align: right;
    }
    .facts {
      display: flex;
      flex-wrap: wrap;
      gap: 12px 32px;
    }
    dt {
      font-size: 0.85rem;
    }
    dd {
      margin: 0;
      font-weight: 800;
      font-size: 1.3rem;
    }
  `,
  host: { class: 'sw-dense' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OpenQuotes {
  private readonly api = inject(OfficeQuotesApi);
  protected readonly usd = (c: number) => formatUsd(c);
  protected readonly pct = (bps: number) => `${(bps / 100).toFixed(bps % 100 ? 1 : 0)} %`;
  protected readonly labelOf = (r: QuoteSummary) => QUOTE_STATUS_LABELS[r.status];
  protected readonly columns = ['number', 'customer', 'status', 'createdAt', 'totalCents'];
  protected readonly status = signal('open');
  protected readonly pageIndex = signal(0);
  private readonly sort = signal<{ sort: string; dir: string }>({ sort: 'createdAt', dir: 'asc' });
  protected readonly stats = rxResource({ stream: () => this.api.stats(90) });
  protected readonly list = rxResource({
    params: () => ({ status: this.status() || undefined, ...this.sort(), page: this.pageIndex(), pageSize: 25 }),
    stream: ({ params }) => this.api.quotes(params),
  });
  protected readonly rows = computed(() => (this.list.hasValue() ? this.list.value().items : []));
  protected readonly total = computed(() => (this.list.hasValue() ? this.list.value().total : 0));
  protected readonly error = errorMessage(this.list);

  protected sorted(s: Sort): void {
    this.sort.set(s.direction ? { sort: s.active, dir: s.direction } : { sort: 'createdAt', dir: 'asc' });
    this.pageIndex.set(0);
  }
  protected paged(e: PageEvent): void {
    this.pageIndex.set(e.pageIndex);
  }
}
