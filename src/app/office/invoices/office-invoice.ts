import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, effect, inject, input, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar, MatSnackBarModule } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import { formatUsd } from '../../../../shared/money';
import type { InvoiceView } from '../../../../shared/schemas/billing';
import { toApiError } from '../../core/api-errors';
import { InvoiceStatusBadge } from '../../portal/invoices/invoice-status';
import { OfficeInvoicesApi } from './office-invoices-api';

/** Dollars as typed ("12.50") to integer cents; null when it is not an amount. */
export function dollarsToCents(text: string): number | null {
  const m = /^\s*\$?(\d{1,7})(?:\.(\d{1,2}))?\s*$/.exec(text);
  if (!m) return null;
  return Number(m[1]) * 100 + Number((m[2] ?? '0').padEnd(2, '0'));
}

/** One invoice for the office: record a check or cash payment, refund all or part, void. */
@Component({
  selector: 'sw-office-invoice',
  imports: [DatePipe, ReactiveFormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatInputModule, MatSelectModule, MatSnackBarModule, InvoiceStatusBadge],
  templateUrl: './office-invoice.html',
  styles: `:host { display: block; padding: 16px; max-width: 900px; } form { display: flex; flex-wrap: wrap; gap: 8px; align-items: center; margin: 12px 0; } table { border-collapse: collapse; width: 100%; } td, th { padding: 4px; border-bottom: 1px solid var(--mat-sys-outline-variant); text-align: left; } .num { text-align: right; } .visually-hidden { position: absolute; width: 1px; height: 1px; overflow: hidden; clip: rect(0 0 0 0); }`,
  host: { class: 'sw-dense' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OfficeInvoice {
  private readonly api = inject(OfficeInvoicesApi);
  private readonly snack = inject(MatSnackBar);
  private readonly fb = inject(NonNullableFormBuilder);
  readonly id = input.required<string>();
  protected readonly usd = formatUsd;
  protected readonly invoice = signal<InvoiceView | null>(null);
  protected readonly busy = signal(false);
  protected readonly payErrors = signal<Record<string, string>>({});
  protected readonly refundErrors = signal<Record<string, string>>({});
  protected readonly payForm = this.fb.group({ method: this.fb.control<'check' | 'cash'>('check'), amount: this.fb.control('', Validators.required), reference: this.fb.control('') });
  protected readonly refundForm = this.fb.group({ amount: this.fb.control('', Validators.required), reason: this.fb.control(''), paymentId: this.fb.control('') });
  private refundKey = crypto.randomUUID();

  constructor() {
    effect(() => this.load(this.id()));
  }

  private load(id: string) {
    this.api.get(id).subscribe({ next: (v) => this.invoice.set(v), error: (e: unknown) => this.snack.open(toApiError(e).message, 'Close') });
  }

  protected recordPayment() {
    const inv = this.invoice();
    const cents = dollarsToCents(this.payForm.controls.amount.value);
    if (!inv || this.busy()) return;
    if (cents === null) return this.payErrors.set({ amountCents: 'Enter an amount such as 125.00.' });
    this.busy.set(true);
    const { method, reference } = this.payForm.getRawValue();
    this.api.recordPayment(inv.id, { method, amountCents: cents, reference }).subscribe({
      next: (v) => this.done(v, 'Payment recorded. A receipt was e-mailed.'),
      error: (e: unknown) => this.failed(e, this.payErrors),
    });
  }

  protected refund() {
    const inv = this.invoice();
    const cents = dollarsToCents(this.refundForm.controls.amount.value);
    if (!inv || this.busy()) return;
    if (cents === null) return this.refundErrors.set({ amountCents: 'Enter an amount such as 25.00.' });
    this.busy.set(true);
    const { reason, paymentId } = this.refundForm.getRawValue();
    this.api.refund(inv.id, { amountCents: cents, reason, ...(paymentId ? { paymentId } : {}) }, this.refundKey).subscribe({
      next: (v) => {
        this.refundKey = crypto.randomUUID();
        this.done(v, 'Refund issued.');
      },
      error: (e: unknown) => this.failed(e, this.refundErrors),
    });
  }

  protected voidIt() {
    const inv = this.invoice();
    if (!inv || this.busy()) return;
    this.busy.set(true);
    this.api.void(inv.id).subscribe({ next: (v) => this.done(v, 'Invoice voided.'), error: (e: unknown) => this.failed(e, this.payErrors) });
  }

  private done(v: InvoiceView, message: string) {
    this.busy.set(false);
    this.invoice.set(v);
    this.payErrors.set({});
    this.refundErrors.set({});
    this.payForm.reset({ method: 'check', amount: '', reference: '' });
    this.refundForm.reset({ amount: '', reason: '', paymentId: '' });
    this.snack.open(message, 'Close', { duration: 4000 });
  }

  private failed(e: unknown, target: typeof this.payErrors) {
    const err = toApiError(e);
    this.busy.set(false);
    target.set(err.fields);
    this.snack.open(err.message, 'Close');
  }
}
