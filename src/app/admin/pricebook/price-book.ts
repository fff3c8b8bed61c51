import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource, toSignal } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatPaginatorModule } from '@angular/material/paginator';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSortModule, type Sort } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import { debounceTime } from 'rxjs';
import { formatUsd } from '../../../../shared/money';
import { ITEM_CATEGORY_LABELS, ITEM_KIND_LABELS, ITEM_KINDS } from '../../../../shared/pricebook';
import type { PriceBookItem } from '../../../../shared/schemas/pricebook';
import { errorMessage } from '../../core/resource-state';
import { FlatRateTasks } from './flat-rate-tasks';
import { ItemForm } from './item-form';
import { PriceBookApi } from './price-book-api';

/** The price book: parts, labor and fees with their prices and specifications, and the flat-rate tasks. */
@Component({
  selector: 'sw-price-book',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatButtonModule,
    MatFormFieldModule,
    MatInputModule,
    MatPaginatorModule,
    MatProgressBarModule,
    MatSelectModule,
    MatSortModule,
    MatTableModule,
    FlatRateTasks,
    ItemForm,
  ],
  template: `
    <h1>Price book</h1>
    <p class="sw-lead">Parts, labor and fees with their prices. Quotes and invoices take their lines from here, and keep the price they were made with.</p>
    <div class="buttons">
      <button mat-flat-button type="button" (click)="editing.set('new')">Add an item</button>
      <a mat-stroked-button routerLink="/admin/price-book/import">Import from CSV</a>
      <a mat-stroked-button [href]="api.exportUrl" download>Export CSV</a>
    </div>
    <!-- The item form (with the validator it shares with the server) loads once the list is up, not before it. -->
    @defer (when editing(); prefetch on idle) {
      @if (editing(); as e) {
        <sw-item-form [item]="e === 'new' ? null : e" (saved)="onSaved($event)" (canceled)="editing.set(null)" />
      }
    }
    @if (notice(); as n) {
      <p role="status" class="ok">{{ n }}</p>
    }
    <div class="filters">
      <mat-form-field><mat-label>Search SKU or name</mat-label><input matInput [formControl]="search" /></mat-form-field>
      <mat-form-field>
        <mat-label>Kind</mat-label>
        <mat-select [value]="kind()" (selectionChange)="kind.set($event.value); pageIndex.set(0)">
          <mat-option value="">Any</mat-option>
          @for (k of kinds; track k) {
            <mat-option [value]="k">{{ kindLabels[k] }}</mat-option>
          }
        </mat-select>
      </mat-form-field>
      <mat-form-field>
        <mat-label>Offered</mat-label>
        <mat-select [value]="status()" (selectionChange)="status.set($event.value); pageIndex.set(0)">
          <mat-option value="active">Offered</mat-option><mat-option value="inactive">Retired</mat-option><mat-option value="all">All</mat-option>
        </mat-select>
      </mat-form-field>
    </div>
    <div class="progress">
      @if (list.isLoading()) {
        <mat-progress-bar mode="indeterminate" aria-label="Loading the price book" />
      }
    </div>
    @if (error(); as e) {
      <p role="alert">{{ e }}</p>
    }
    <!-- A page's worth of rows is reserved before they arrive, so the paginator and the tasks below do not jump. -->
    <div class="table-wrap">
      <table mat-table [dataSource]="rows()" matSort (matSortChange)="sorted($event)" aria-label="Price-book items">
        <ng-container matColumnDef="sku"
          ><th mat-header-cell *matHeaderCellDef mat-sort-header>SKU</th>
          <td mat-cell *matCellDef="let r">{{ r.sku }}</td></ng-container
        >
        <ng-container matColumnDef="name"
          ><th mat-header-cell *matHeaderCellDef mat-sort-header>Name</th>
          <td mat-cell *matCellDef="let r">
            <button mat-button type="button" (click)="editing.set(r)">{{ r.name }}</button>
          </td></ng-container
        >
        <ng-container matColumnDef="category"
          ><th mat-header-cell *matHeaderCellDef mat-sort-header>Category</th>
          <td mat-cell *matCellDef="let r">{{ categoryOf(r) }}</td></ng-container
        >
        <ng-container matColumnDef="unitCents"
          ><th mat-header-cell *matHeaderCellDef mat-sort-header class="num">Price</th>
          <td mat-cell *matCellDef="let r" class="num">{{ usd(r.unitCents) }}</td></ng-container
        >
        <ng-container matColumnDef="version"
          ><th mat-header-cell *matHeaderCellDef class="num">Version</th>
          <td mat-cell *matCellDef="let r" class="num">{{ r.version }}</td></ng-container
        >
        <tr mat-header-row *matHeaderRowDef="columns"></tr>
        <tr mat-row *matRowDef="let row; columns: columns"></tr>
        <tr class="mat-row" *matNoDataRow>
          <td class="mat-cell" [attr.colspan]="columns.length">No items match. Add an item, or import your price list from a CSV file.</td>
        </tr>
      </table>
    </div>
    <mat-paginator [length]="total()" [pageIndex]="pageIndex()" [pageSize]="25" [hidePageSize]="true" (page)="pageIndex.set($event.pageIndex)" aria-label="Price-book pages" />
    <sw-flat-rate-tasks />
  `,
  styles: `
    :host {
      display: block;
      padding: 16px;
    }
    // Fixed columns: the header keeps its place when the rows arrive.
    table {
      width: 100%;
      min-width: 720px;
      table-layout: fixed;
    }
    .mat-column-sku {
      width: 20%;
    }
    .mat-column-category {
      width: 20%;
    }
    .mat-column-unitCents {
      width: 12%;
    }
    .mat-column-version {
      width: 9%;
    }
    .progress {
      height: 4px;
    }
    .table-wrap {
      overflow-x: auto;
      min-height: calc(var(--mat-table-header-container-height, 56px) + 25 * var(--mat-table-row-item-container-height, 52px));
    }
    .num {
      text-align: right;
    }
    .filters,
    .buttons {
      display: flex;
      flex-wrap: wrap;
      gap: 0 12px;
      align-items: center;
    }
    .buttons {
      gap: 12px;
      margin: 0 0 12px;
    }
    .ok {
      color: var(--sw-ok);
      font-weight: 700;
    }
  `,
  host: { class: 'sw-dense' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PriceBook {
  protected readonly api = inject(PriceBookApi);
  protected readonly usd = (c: number) => formatUsd(c);
  protected readonly kinds = ITEM_KINDS;
  protected readonly kindLabels = ITEM_KIND_LABELS;
  protected readonly categoryOf = (r: PriceBookItem) => ITEM_CATEGORY_LABELS[r.category];
  protected readonly columns = ['sku', 'name', 'category', 'unitCents', 'version'];
  protected readonly search = new FormControl('', { nonNullable: true });
  private readonly q = toSignal(this.search.valueChanges.pipe(debounceTime(250)), { initialValue: '' });
  protected readonly kind = signal('');
  protected readonly status = signal('active');
  protected readonly pageIndex = signal(0);
  private readonly sort = signal({ sort: 'sku', dir: 'asc' });
  protected readonly editing = signal<PriceBookItem | 'new' | null>(null);
  protected readonly notice = signal<string | null>(null);
  protected readonly list = rxResource({
    params: () => ({ q: this.q().trim(), kind: this.kind(), status: this.status(), ...this.sort(), page: this.pageIndex(), pageSize: 25 }),
    stream: ({ params }) => this.api.items(params),
  });
  protected readonly rows = computed(() => (this.list.hasValue() ? this.list.value().items : []));
  protected readonly total = computed(() => (this.list.hasValue() ? this.list.value().total : 0));
  protected readonly error = errorMessage(this.list);

  protected sorted(s: Sort): void {
    this.sort.set(s.direction ? { sort: s.active, dir: s.direction } : { sort: 'sku', dir: 'asc' });
    this.pageIndex.set(0);
  }

  protected onSaved(item: PriceBookItem): void {
    this.editing.set(null);
    this.notice.set(`${item.sku} saved (version ${item.version}).`);
    this.list.reload();
  }
}
