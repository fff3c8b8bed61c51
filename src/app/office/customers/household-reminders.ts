import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatTableModule } from '@angular/material/table';
import type { HouseholdReminderEntry } from '../../../../shared/schemas/campaigns';
import { KeysetPager } from '../../core/keyset-pager';
import { errorMessage, localCopy } from '../../core/resource-state';
import { DateTimePipe } from '../../ui/dates';
import { ReminderSendStatusBadge } from '../../ui/status/reminder-send-status';
import { RemindersApi } from '../reminders/reminders-api';

/** The reminders a household was sent, newest first, with what became of each. */
@Component({
  selector: 'sw-household-reminders',
  imports: [DateTimePipe, MatButtonModule, MatTableModule, ReminderSendStatusBadge],
  template: `
    <section class="log" aria-labelledby="household-reminders-title">
      <h2 id="household-reminders-title">Reminders sent</h2>
      @if (error(); as message) {
        <p class="error" role="alert">{{ message }}</p>
      }
      <div class="table-wrap" style="--sw-page-rows: 5">
        <table mat-table [dataSource]="items()" aria-label="Reminders this household was sent">
          <ng-container matColumnDef="label">
            <th mat-header-cell *matHeaderCellDef scope="col">Reminder</th>
            <td mat-cell *matCellDef="let r">{{ r.label }}</td>
          </ng-container>
          <ng-container matColumnDef="email">
            <th mat-header-cell *matHeaderCellDef scope="col">To</th>
            <td mat-cell *matCellDef="let r">{{ r.email }}</td>
          </ng-container>
          <ng-container matColumnDef="status">
            <th mat-header-cell *matHeaderCellDef scope="col">Status</th>
            <td mat-cell *matCellDef="let r"><sw-reminder-send-status [status]="r.status" /></td>
          </ng-container>
          <ng-container matColumnDef="reply">
            <th mat-header-cell *matHeaderCellDef scope="col">Mail server's reply</th>
            <td mat-cell *matCellDef="let r" class="reply">{{ r.reply ?? '—' }}</td>
          </ng-container>
          <ng-container matColumnDef="at">
            <th mat-header-cell *matHeaderCellDef scope="col">When</th>
            <td mat-cell *matCellDef="let r">{{ r.sentAt ?? r.queuedAt | swDateTime }}</td>
          </ng-container>
          <tr mat-header-row *matHeaderRowDef="columns"></tr>
          <tr mat-row *matRowDef="let row; columns: columns"></tr>
          <tr class="mat-mdc-row" *matNoDataRow>
            <td class="mat-mdc-cell empty" [attr.colspan]="columns.length">{{ page() ? 'No reminders sent to this household yet.' : 'Loading…' }}</td>
          </tr>
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
  protected readonly columns = ['label', 'email', 'status', 'reply', 'at'];
  protected readonly pager = new KeysetPager();
  private readonly read = rxResource({
    params: () => ({ id: this.customerId(), after: this.pager.after() }),
    stream: ({ params }) => this.api.householdSends(params.id, params.after ? { after: params.after } : {}),
  });
  protected readonly page = localCopy(this.read, true);
  protected readonly items = computed<HouseholdReminderEntry[]>(() => this.page()?.items ?? []);
  protected readonly error = errorMessage(this.read);
}
