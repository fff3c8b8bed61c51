import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { REMINDER_SEND_STATUS_LABELS, type ReminderSendStatus } from '../../../../shared/reminder-sends';
import { StatusBadge } from './status-badge';

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
  imports: [StatusBadge],
  template: `<sw-status-badge [icon]="icon()" [label]="label()" />`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReminderSendStatusBadge {
  readonly status = input.required<ReminderSendStatus>();
  protected readonly icon = computed(() => ICON[this.status()]);
  protected readonly label = computed(() => REMINDER_SEND_STATUS_LABELS[this.status()]);
}
