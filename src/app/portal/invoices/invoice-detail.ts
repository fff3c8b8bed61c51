import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { ActivatedRoute, Router, RouterLink } from '@angular/router';
import { formatUsd } from '../../../../shared/money';
import type { InvoiceView } from '../../../../shared/schemas/billing';
import { toApiError } from '../../core/api-errors';
import { errorMessage, localCopy } from '../../core/resource-state';
import { InvoicesApi } from './invoices-api';
import { InvoiceStatusBadge } from '../../ui/status/invoice-status';
import { DayPipe } from '../../ui/dates';
import { pageTitle } from '../../ui/page-title';

/** One invoice: its lines, tax, payments, the PDF, and paying the balance by card. */
@Component({
  selector: 'sw-invoice-detail',
  imports: [DayPipe, RouterLink, MatButtonModule, MatIconModule, MatProgressBarModule, InvoiceStatusBadge],
  templateUrl: './invoice-detail.html',
  styleUrl: './invoice-detail.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InvoiceDetail {
  private readonly api = inject(InvoicesApi);
  private readonly route = inject(ActivatedRoute);
  private readonly router = inject(Router);
  readonly id = input.required<string>();
  protected readonly usd = formatUsd;
  private readonly read = rxResource({ params: () => this.id(), stream: ({ params }) => this.api.get(params) });
  protected readonly invoice = localCopy<InvoiceView>(this.read);
  protected readonly titled = pageTitle(() => {
    const i = this.invoice();
    return i ? `Invoice ${i.number}` : null;
  });
  private readonly loadError = errorMessage(this.read);
  private readonly actionError = signal<string | null>(null);
  protected readonly error = computed(() => this.actionError() ?? this.loadError());
  protected readonly notice = signal<string | null>(null);
  protected readonly paying = signal(false);

  constructor() {
    // Back from the payment page: settle what happened there, then read the invoice again.
    const checkout = this.route.snapshot.queryParamMap.get('checkout');
    if (checkout?.startsWith('cs_')) {
      this.api.checkoutReturn(checkout).subscribe({
        next: (r) => {
          this.notice.set(r.state === 'paid' ? 'Payment received. Thank you! A receipt is on its way to your e-mail.' : 'The payment was not completed. Nothing was charged.');
          void this.router.navigate([], { queryParams: {}, replaceUrl: true });
          this.read.reload();
        },
        error: (e: unknown) => this.actionError.set(toApiError(e).message),
      });
    } else if (checkout === 'canceled') {
      this.notice.set('Payment canceled. Nothing was charged.');
    }
  }

  protected pay() {
    const inv = this.invoice();
    if (!inv || this.paying()) return;
    this.paying.set(true);
    this.api.pay(inv.id).subscribe({
      next: (r) => window.location.assign(r.checkoutUrl),
      error: (e: unknown) => {
        this.paying.set(false);
        this.actionError.set(toApiError(e).message);
      },
    });
  }

  protected rate(bps: number) {
    return (bps / 100).toLocaleString('en-US', { maximumFractionDigits: 3 });
  }
}
