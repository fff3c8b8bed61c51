import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { ActivatedRoute, Router } from '@angular/router';
import { formatUsd } from '../../../../shared/money';
import type { VisitInvoice } from '../../../../shared/schemas/quotes';
import { toApiError } from '../../core/api-errors';
import { errorMessage } from '../../core/resource-state';
import { InvoiceStatusBadge } from '../../ui/status/invoice-status';
import { QuotesApi } from './quotes-api';

/**
 * The invoices for work on this visit (an approved quote's, or work invoiced without one), and
 * paying one with the homeowner's card on this device: the processor's payment page opens here
 * and comes back to the visit, which then shows it paid.
 */
@Component({
  selector: 'sw-visit-payments',
  imports: [MatButtonModule, InvoiceStatusBadge],
  template: `
    @if (invoices().length || notice() || error()) {
      <section class="block" aria-labelledby="payments-title">
        <h2 id="payments-title">Payment</h2>
        @if (notice(); as n) {
          <p role="status" [class.ok]="n.paid" [class.bad]="!n.paid">{{ n.text }}</p>
        }
        <ul class="lines" aria-label="Invoices for this visit">
          @for (i of invoices(); track i.id) {
            <li>
              <div class="what">
                <strong>Invoice {{ i.number }} · {{ usd(i.totalCents) }}</strong>
                <span class="detail"><sw-invoice-status [status]="i.status" />{{ i.discountCents ? ' · plan savings ' + usd(i.discountCents) : '' }}</span>
              </div>
              @if (i.status === 'open' && i.balanceCents > 0) {
                <button mat-flat-button type="button" class="big" (click)="pay(i)" [disabled]="paying() !== null">
                  {{ paying() === i.id ? 'Opening the payment page…' : 'Pay now on this device' }}
                </button>
              }
            </li>
          }
        </ul>
        @if (error(); as e) {
          <p role="alert" class="bad">{{ e }}</p>
        }
      </section>
    }
  `,
  styleUrl: './quote-builder.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class VisitPayments {
  private readonly api = inject(QuotesApi);
  private readonly route = inject(ActivatedRoute);
  private readonly router = inject(Router);
  readonly visitId = input.required<string>();
  /** Bumped by the page when an invoice is issued on it, to read the list again. */
  readonly changes = input(0);

  protected readonly usd = formatUsd;
  /** Bumped once a return from the payment page is recorded: a read still in flight may predate it. */
  private readonly synced = signal(0);
  private readonly read = rxResource({
    params: () => ({ id: this.visitId(), n: this.changes(), synced: this.synced() }),
    stream: ({ params }) => this.api.visitInvoices(params.id),
  });
  protected readonly invoices = computed<VisitInvoice[]>(() => (this.read.hasValue() ? this.read.value() : []));
  private readonly actionError = signal<string | null>(null);
  private readonly loadError = errorMessage(this.read);
  protected readonly error = computed(() => this.actionError() ?? this.loadError());
  protected readonly notice = signal<{ paid: boolean; text: string } | null>(null);
  protected readonly paying = signal<string | null>(null);

  constructor() {
    // Back from the payment page: record what happened there, then read the invoices again.
    const checkout = this.route.snapshot.queryParamMap.get('checkout');
    if (checkout?.startsWith('cs_')) {
      this.api.checkoutReturn(checkout).subscribe({
        next: (r) => {
          const paid = r.state === 'paid';
          this.notice.set({
            paid,
            text: paid ? 'Paid on this device. The receipt is on its way to the homeowner by e-mail.' : 'The payment was not completed. Nothing was charged.',
          });
          void this.router.navigate([], { queryParams: {}, replaceUrl: true });
          this.synced.update((n) => n + 1);
        },
        error: (e: unknown) => this.actionError.set(toApiError(e).message),
      });
    } else if (checkout === 'canceled') {
      this.notice.set({ paid: false, text: 'Payment canceled. Nothing was charged.' });
    }
  }

  protected pay(i: VisitInvoice): void {
    if (this.paying()) return;
    this.paying.set(i.id);
    this.actionError.set(null);
    this.api.payOnDevice(i.id, this.visitId()).subscribe({
      next: (r) => window.location.assign(r.checkoutUrl),
      error: (e: unknown) => {
        this.paying.set(null);
        this.actionError.set(toApiError(e).message);
      },
    });
  }
}
