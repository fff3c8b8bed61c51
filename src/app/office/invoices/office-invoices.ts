import { ChangeDetectionStrategy, Component, DestroyRef, inject, signal } from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatPaginatorModule, type PageEvent } from '@angular/material/paginator';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import { debounceTime, map, merge, startWith, switchMap } from 'rxjs';
import { formatUsd } from '../../../../shared/money';
import { INVOICE_STATUSES, INVOICE_STATUS_LABELS } from '../../../../shared/invoice-status';
import type { InvoiceStatus, InvoiceSummary } from '../../../../shared/schemas/billing';
import { urlFilters } from '../../core/url-filters';
import { InvoiceStatusBadge } from '../../ui/status/invoice-status';
import { OfficeInvoicesApi } from './office-invoices-api';
import { DayPipe } from '../../ui/dates';

/** Every invoice, searchable by household or number, filtered by status, paged on the server. */
@Component({
  selector: 'sw-office-invoices',
  imports: [DayPipe, ReactiveFormsModule, RouterLink, MatFormFieldModule, MatInputModule, MatPaginatorModule, MatSelectModule, MatTableModule, InvoiceStatusBadge],
  template: `
    <h1>Invoices</h1>
    <p class="sw-lead">Every invoice: find one by household or number, or filter by status.</p>
    <div class="filters">
      <mat-form-field>
        <mat-label>Search household or number</mat-label>
        <input matInput [formControl]="search" />
      </mat-form-field>
      <mat-form-field>
        <mat-label>Status</mat-label>
        <mat-select [formControl]="status">
          <mat-option value="">Any</mat-option>
          @for (s of statuses; track s) {
            <mat-option [value]="s">{{ labels[s] }}</mat-option>
          }
        </mat-select>
      </mat-form-field>
    </div>
    <table mat-table [dataSource]="rows()">
      <ng-container matColumnDef="number"
        ><th mat-header-cell *matHeaderCellDef>Number</th>
        <td mat-cell *matCellDef="let r">
          <a [routerLink]="['/office/invoices', r.id]">{{ r.number ?? 'Draft' }}</a>
        </td></ng-container
      >
      <ng-container matColumnDef="customer"
        ><th mat-header-cell *matHeaderCellDef>Household</th>
        <td mat-cell *matCellDef="let r">{{ r.customerName }}</td></ng-container
      >
      <ng-container matColumnDef="status"
        ><th mat-header-cell *matHeaderCellDef>Status</th>
        <td mat-cell *matCellDef="let r"><sw-invoice-status [status]="r.status" /></td
      ></ng-container>
      <ng-container matColumnDef="issued"
        ><th mat-header-cell *matHeaderCellDef>Issued</th>
        <td mat-cell *matCellDef="let r">{{ r.issuedAt | swDay }}</td></ng-container
      >
      <ng-container matColumnDef="total"
        ><th mat-header-cell *matHeaderCellDef class="num">Total</th>
        <td mat-cell *matCellDef="let r" class="num">{{ usd(r.totalCents) }}</td></ng-container
      >
      <ng-container matColumnDef="balance"
        ><th mat-header-cell *matHeaderCellDef class="num">Balance</th>
        <td mat-cell *matCellDef="let r" class="num">{{ usd(r.balanceCents) }}</td></ng-container
      >
      <tr mat-header-row *matHeaderRowDef="columns"></tr>
      <tr mat-row *matRowDef="let row; columns: columns"></tr>
    </table>
    <mat-paginator [length]="total()" [pageSize]="50" [hidePageSize]="true" (page)="page($event)" aria-label="Invoice pages" />
  `,
  styles: `
    :host {
      display: block;
      padding: 16px;
    }
    .filters {
      display: flex;
      gap: 12px;
      flex-wrap: wrap;
    }
    table {
      width: 100%;
    }
    .num {
      text-align: right;
    }
  `,
  host: { class: 'sw-dense' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OfficeInvoices {
  private readonly api = inject(OfficeInvoicesApi);
  protected readonly usd = formatUsd;
  protected readonly statuses = INVOICE_STATUSES;
  protected readonly labels = INVOICE_STATUS_LABELS;
  protected readonly columns = ['number', 'customer', 'status', 'issued', 'total', 'balance'];
  private readonly url = urlFilters();
  protected readonly search = new FormControl(this.url.read('q') ?? '', { nonNullable: true });
  protected readonly status = new FormControl<InvoiceStatus | ''>(asStatus(this.url.read('status')), { nonNullable: true });
  private readonly filter = toSignal(
    merge(this.search.valueChanges, this.status.valueChanges).pipe(map(() => ({ q: this.search.value.trim() || null, status: this.status.value || null }))),
  );
  protected readonly rows = signal<InvoiceSummary[]>([]);
  protected readonly total = signal(0);
  private readonly offset = signal(0);
  private readonly pages = new FormControl(0, { nonNullable: true });

  constructor() {
    this.url.keep(() => this.filter() ?? {});
    merge(this.search.valueChanges.pipe(debounceTime(250)), this.status.valueChanges, this.pages.valueChanges)
      .pipe(
        startWith(null),
        switchMap(() => this.api.list({ status: this.status.value, q: this.search.value.trim() || undefined, offset: this.offset() })),
        takeUntilDestroyed(inject(DestroyRef)),
      )
      .subscribe((r) => {
        this.rows.set(r.rows);
        this.total.set(r.total);
      });
  }

  protected page(e: PageEvent) {
    this.offset.set(e.pageIndex * e.pageSize);
    this.pages.setValue(e.pageIndex);
  }
}

const asStatus = (v: string | null): InvoiceStatus | '' => ((INVOICE_STATUSES as readonly string[]).includes(v ?? '') ? (v as InvoiceStatus) : '');
