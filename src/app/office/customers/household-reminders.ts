import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import type { HouseholdReminderEntry } from '../../../../shared/schemas/campaigns';
import { KeysetPager } from '../../core/keyset-pager';
import { errorMessage, localCopy } from '../../core/resource-state';
import { DateTimePipe } from '../../ui/dates';
import { ReminderSendStatusBadge } from '../../ui/status/reminder-send-status';
import { RemindersApi } from '../reminders/reminders-api';

/** The reminders a household was sent, newest first, with what became of each. */
@Component({
  selector: 'sw-household-reminders',
  imports: [DateTimePipe, MatButtonModule, ReminderSendStatusBadge],
  template: `
    <section class="log" aria-labelledby="household-reminders-title">
      <h2 id="household-reminders-title">Reminders sent</h2>
      @if (error(); as message) {
        <p class="error" role="alert">{{ message }}</p>
      }
      <!-- A plain table: the customer page carries no Material table code for one small list. -->
      <div class="table-wrap" style="--sw-page-rows: 5">
        <table class="plain-table" aria-label="Reminders this household was sent">
          <thead>
            <tr>
              <th scope="col">Reminder</th>
              <th scope="col">To</th>
              <th scope="col">Status</th>
              <th scope="col">Mail server's reply</th>
              <th scope="col">When</th>
            </tr>
          </thead>
          <tbody>
            @for (r of items(); track r.sendId) {
              <tr>
                <td>{{ r.label }}</td>
                <td>{{ r.email }}</td>
                <td><sw-reminder-send-status [status]="r.status" /></td>
                <td class="reply">{{ r.reply ?? '—' }}</td>
                <td>{{ r.sentAt ?? r.queuedAt | swDateTime }}</td>
              </tr>
            } @empty {
              <tr>
                <td class="empty" colspan="5">{{ page() ? 'No reminders sent to this household yet.' : 'Loading…' }}</td>
              </tr>
            }
          </tbody>
        </table>
      </div>
      @if (pager.hasPrevious() || page()?.next) {
        <nav class="pager" aria-label="Reminder pages">
          <span>Page {{ pager.page() }}</span>
          <button mat-stroked-button type="button" [disabled]="!pager.hasPrevious()" (click)="pager.previous()">Newer</button>
          <button mat-stroked-button type="button" [disabled]="!page()?.next" (click)="pager.next(page()?.next ?? null)">Older</button>
        </nav>
      }
    </section>
  `,
  styleUrl: '../reminders/delivery-log.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class HouseholdReminders {
  private readonly api = inject(RemindersApi);
  readonly customerId = input.required<string>();
  protected readonly pager = new KeysetPager();
  private readonly read = rxResource({
    params: () => ({ id: this.customerId(), after: this.pager.after() }),
    stream: ({ params }) => this.api.householdSends(params.id, params.after ? { after: params.after } : {}),
  });
  protected readonly page = localCopy(this.read, true);
  protected readonly items = computed<HouseholdReminderEntry[]>(() => this.page()?.items ?? []);
  protected readonly error = errorMessage(this.read);
}
