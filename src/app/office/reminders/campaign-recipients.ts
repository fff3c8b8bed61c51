import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import type { CampaignRecipientEntry } from '../../../../shared/schemas/campaigns';
import { REMINDER_SEND_STATUSES, REMINDER_SEND_STATUS_LABELS, type ReminderSendStatus } from '../../../../shared/reminder-sends';
import { KeysetPager } from '../../core/keyset-pager';
import { errorMessage, localCopy } from '../../core/resource-state';
import { DateTimePipe } from '../../ui/dates';
import { ReminderSendStatusBadge } from '../../ui/status/reminder-send-status';
import { RemindersApi } from './reminders-api';

/** A campaign's delivery log: every household, what became of its message and the mail server's reply. */
@Component({
  selector: 'sw-campaign-recipients',
  imports: [DateTimePipe, MatButtonModule, MatFormFieldModule, MatSelectModule, MatTableModule, ReminderSendStatusBadge],
  templateUrl: './campaign-recipients.html',
  styleUrl: './delivery-log.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CampaignRecipients {
  private readonly api = inject(RemindersApi);
  readonly campaignId = input.required<string>();
  /** Changes as the campaign moves on (its sent, failed and unsubscribed counts), so the page reloads. */
  readonly progress = input(0);

  protected readonly statuses = REMINDER_SEND_STATUSES.map((s) => ({ value: s, label: REMINDER_SEND_STATUS_LABELS[s] }));
  protected readonly columns = ['name', 'email', 'status', 'reply', 'sentAt'];
  protected readonly status = signal<ReminderSendStatus | ''>('');
  protected readonly pager = new KeysetPager();
  private readonly read = rxResource({
    params: () => ({ id: this.campaignId(), status: this.status(), after: this.pager.after(), progress: this.progress() }),
    stream: ({ params }) => this.api.recipients(params.id, { ...(params.status ? { status: params.status } : {}), ...(params.after ? { after: params.after } : {}) }),
  });
  protected readonly page = localCopy(this.read, true);
  protected readonly items = computed<CampaignRecipientEntry[]>(() => this.page()?.items ?? []);
  protected readonly error = errorMessage(this.read);

  protected filter(status: ReminderSendStatus | ''): void {
    this.pager.reset();
    this.status.set(status);
  }
}
