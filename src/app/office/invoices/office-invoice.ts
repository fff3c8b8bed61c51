import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar, MatSnackBarModule } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import { dollarsToCents, formatUsd } from '../../../../shared/money';
import type { InvoiceView } from '../../../../shared/schemas/billing';
import { toApiError } from '../../core/api-errors';
import { applyFieldErrors, applyServerErrors, serverError } from '../../core/form-errors';
import { errorMessage, localCopy } from '../../core/resource-state';
import { InvoiceStatusBadge } from '../../ui/status/invoice-status';
import { OfficeInvoicesApi } from './office-invoices-api';
import { DateTimePipe } from '../../ui/dates';
import { pageTitle } from '../../ui/page-title';

/** One invoice for the office: record a check or cash payment, refund all or part, void. */
@Component({
  selector: 'sw-office-invoice',
  imports: [DateTimePipe, ReactiveFormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatInputModule, MatSelectModule, MatSnackBarModule, InvoiceStatusBadge],
  templateUrl: './office-invoice.html',
  styles: `
    :host {
      display: block;
      padding: 16px;
      max-width: 900px;
    }
    form {
      display: flex;
      flex-wrap: wrap;
      gap: 8px;
      align-items: center;
      margin: 12px 0;
    }
    table {
      border-collapse: collapse;
      width: 100%;
    }
    td,
    th {
      padding: 4px;
      border-bottom: 1px solid var(--mat-sys-outline-variant);
      text-align: left;
    }
    .num {
      text-align: right;
    }
    .visually-hidden {
      position: absolute;
      width: 1px;
      height: 1px;
      overflow: hidden;
      clip: rect(0 0 0 0);
    }
  `,
  host: { class: 'sw-dense' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OfficeInvoice {
  private readonly api = inject(OfficeInvoicesApi);
  private readonly snack = inject(MatSnackBar);
  private readonly fb = inject(NonNullableFormBuilder);
  readonly id = input.required<string>();
  protected readonly usd = formatUsd;
  private readonly read = rxResource({ params: () => this.id(), stream: ({ params }) => this.api.get(params) });
  protected readonly invoice = localCopy<InvoiceView>(this.read);
  protected readonly titled = pageTitle(() => {
    const i = this.invoice();
    return i ? `Invoice ${i.number ?? '(draft)'} · ${i.customerName}` : null;
  });
  protected readonly loadError = errorMessage(this.read);
  protected readonly busy = signal(false);
  protected readonly serverError = serverError;
  protected readonly payForm = this.fb.group({
    method: this.fb.control<'check' | 'cash'>('check'),
    amount: this.fb.control('', Validators.required),
    reference: this.fb.control(''),
  });
  protected readonly refundForm = this.fb.group({ amount: this.fb.control('', Validators.required), reason: this.fb.control(''), paymentId: this.fb.control('') });
  private refundKey = crypto.randomUUID();

  protected recordPayment() {
    const inv = this.invoice();
    const cents = dollarsToCents(this.payForm.controls.amount.value);
    if (!inv || this.busy()) return;
    if (cents === null) return void applyFieldErrors(this.payForm, { amount: 'Enter an amount such as 125.00.' });
    this.busy.set(true);
    const { method, reference } = this.payForm.getRawValue();
    this.api.recordPayment(inv.id, { method, amountCents: cents, reference }).subscribe({
      next: (v) => this.done(v, 'Payment recorded. A receipt was e-mailed.'),
      error: (e: unknown) => this.failed(e, this.payForm),
    });
  }

  protected refund() {
    const inv = this.invoice();
    const cents = dollarsToCents(this.refundForm.controls.amount.value);
    if (!inv || this.busy()) return;
    if (cents === null) return void applyFieldErrors(this.refundForm, { amount: 'Enter an amount such as 25.00.' });
    this.busy.set(true);
    const { reason, paymentId } = this.refundForm.getRawValue();
    this.api.refund(inv.id, { amountCents: cents, reason, ...(paymentId ? { paymentId } : {}) }, this.refundKey).subscribe({
      next: (v) => {
        this.refundKey = crypto.randomUUID();
        this.done(v, 'Refund issued.');
      },
      error: (e: unknown) => this.failed(e, this.refundForm),
    });
  }

  protected voidIt() {
    const inv = this.invoice();
    if (!inv || this.busy()) return;
    this.busy.set(true);
    this.api.void(inv.id).subscribe({ next: (v) => this.done(v, 'Invoice voided.'), error: (e: unknown) => this.failed(e, this.payForm) });
  }

  private done(v: InvoiceView, message: string) {
    this.busy.set(false);
    this.invoice.set(v);
    this.payForm.reset({ method: 'check', amount: '', reference: '' });
    this.refundForm.reset({ amount: '', reason: '', paymentId: '' });
    this.snack.open(message, 'Close', { duration: 4000 });
  }

  private failed(e: unknown, form: typeof this.payForm | typeof this.refundForm) {
    this.busy.set(false);
    applyServerErrors(form, e, { amountCents: 'amount' });
    this.snack.open(toApiError(e).message, 'Close');
  }
}
