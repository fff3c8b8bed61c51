import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatListModule } from '@angular/material/list';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { formatUsd } from '../../../../shared/money';
import { errorMessage } from '../../core/resource-state';
import { InvoicesApi } from './invoices-api';
import { InvoiceStatusBadge } from '../../ui/status/invoice-status';
import { DayPipe } from '../../ui/dates';

const PURPOSE = { enrollment: 'Plan enrollment', renewal: 'Plan renewal', tier_change: 'Plan change', service: 'Service' } as const;

@Component({
  selector: 'sw-my-invoices',
  imports: [DayPipe, RouterLink, MatListModule, MatProgressBarModule, InvoiceStatusBadge],
  template: `
    <h1>Invoices</h1>
    <p class="sw-lead">Your invoices: open ones to pay and paid ones for your records.</p>
    @if (loading()) {
      <mat-progress-bar mode="indeterminate" aria-label="Loading invoices" />
    }
    @if (error()) {
      <p role="alert">{{ error() }}</p>
    }
    @if (!loading() && rows().length === 0) {
      <p>No invoices yet.</p>
    }
    <mat-nav-list aria-label="Invoices">
      @for (r of rows(); track r.id) {
        <a mat-list-item [routerLink]="['/portal/invoices', r.id]">
          <span matListItemTitle>Invoice {{ r.number }} · {{ purpose[r.purpose] }} · {{ usd(r.totalCents) }}</span>
          <span matListItemLine
            ><sw-invoice-status [status]="r.status" /> · {{ r.issuedAt | swDay }}
            @if (r.balanceCents) {
              · {{ usd(r.balanceCents) }} due
            }
          </span>
        </a>
      }
    </mat-nav-list>
  `,
  styles: `
    :host {
      display: block;
      max-width: 760px;
      margin: 0 auto;
      padding: 16px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MyInvoices {
  private readonly api = inject(InvoicesApi);
  protected readonly usd = formatUsd;
  protected readonly purpose = PURPOSE;
  private readonly read = rxResource({ stream: () => this.api.list() });
  protected readonly rows = computed(() => (this.read.hasValue() ? this.read.value().rows : []));
  protected readonly loading = this.read.isLoading;
  protected readonly error = errorMessage(this.read);
}
