import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { INVOICE_STATUS_LABELS } from '../../../../shared/invoice-status';
import type { InvoiceStatus } from '../../../../shared/schemas/billing';
import { StatusBadge } from './status-badge';

const ICON: Record<InvoiceStatus, string> = {
  draft: 'info',
  open: 'status-watch',
  paid: 'status-ok',
  void: 'close',
  refunded: 'arrow_back',
  partially_refunded: 'arrow_back',
};

/** An invoice status as an icon and a word. */
@Component({
  selector: 'sw-invoice-status',
  imports: [StatusBadge],
  template: `<sw-status-badge [icon]="icon()" [label]="label()" />`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InvoiceStatusBadge {
  readonly status = input.required<InvoiceStatus>();
  protected readonly icon = computed(() => ICON[this.status()]);
  protected readonly label = computed(() => INVOICE_STATUS_LABELS[this.status()]);
}
