import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { AGREEMENT_STATUS_LABELS, type AgreementStatus } from '../../../../shared/agreements';

const ICON: Record<AgreementStatus, string> = {
  pending: 'info',
  active: 'status-ok',
  renewal_due: 'status-watch',
  past_due: 'status-alert',
  lapsed: 'status-alert',
  canceled: 'close',
};

/** An agreement status as an icon and a word, never colour alone. */
@Component({
  selector: 'sw-agreement-status',
  imports: [MatIconModule],
  template: `<span class="status" [class]="'status ' + status()"><mat-icon [svgIcon]="icon()" aria-hidden="true" />{{ label() }}</span>`,
  styles: `
    .status {
      display: inline-flex;
      align-items: center;
      gap: 4px;
      font-weight: 700;
      padding: 2px 10px 2px 6px;
      border-radius: 999px;
      background: var(--mat-sys-surface-container-high);
    }
    mat-icon {
      width: 18px;
      height: 18px;
    }
    .past_due,
    .lapsed {
      background: var(--mat-sys-error-container);
      color: var(--mat-sys-on-error-container);
    }
    .renewal_due {
      background: var(--mat-sys-tertiary-container);
      color: var(--mat-sys-on-tertiary-container);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AgreementStatusBadge {
  readonly status = input.required<AgreementStatus>();
  protected readonly icon = computed(() => ICON[this.status()]);
  protected readonly label = computed(() => AGREEMENT_STATUS_LABELS[this.status()]);
}
