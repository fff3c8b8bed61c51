import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { REMINDER_SEND_STATUS_LABELS, type ReminderSendStatus } from '../../../../shared/reminder-sends';

const ICON: Record<ReminderSendStatus, string> = {
  pending: 'status-watch',
  sending: 'status-watch',
  sent: 'status-ok',
  failed: 'status-alert',
  suppressed: 'close',
  cancelled: 'close',
};

/** What became of one reminder e-mail, as an icon and a word. */
@Component({
  selector: 'sw-reminder-send-status',
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
export class ReminderSendStatusBadge {
  readonly status = input.required<ReminderSendStatus>();
  protected readonly icon = computed(() => ICON[this.status()]);
  protected readonly label = computed(() => REMINDER_SEND_STATUS_LABELS[this.status()]);
}
