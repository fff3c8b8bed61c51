import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { INVOICE_STATUS_LABELS } from '../../../../shared/invoice-status';
import type { InvoiceStatus } from '../../../../shared/schemas/billing';

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
  imports: [MatIconModule],
  template: `<span class="status"><mat-icon [svgIcon]="icon()" aria-hidden="true" />{{ label() }}</span>`,
  styles: `
    .status {
      display: inline-flex;
      gap: 4px;
      align-items: center;
      font-weight: 700;
    }
    mat-icon {
      width: 18px;
      height: 18px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InvoiceStatusBadge {
  readonly status = input.required<InvoiceStatus>();
  protected readonly icon = computed(() => ICON[this.status()]);
  protected readonly label = computed(() => INVOICE_STATUS_LABELS[this.status()]);
}
