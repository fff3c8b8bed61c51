import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import { dueWords } from '../../../../shared/reminder-labels';
import type { MyDueItem, MyReminders } from '../../../../shared/schemas/campaigns';
import { toApiError } from '../../core/api-errors';
import { MyRemindersApi } from './my-reminders-api';

/**
 * What is due at the household's homes: "Filter (16×25×1) due in 5 days", with "Book a tune-up"
 * and "I changed it". Self-contained, so any portal page can place it with <sw-due-list />.
 */
@Component({
  selector: 'sw-due-list',
  imports: [MatButtonModule, MatIconModule, RouterLink],
  template: `
    <section class="due" aria-labelledby="due-title">
      <h2 id="due-title">Coming up at home</h2>
      @if (items().length === 0) {
        <p class="empty">Nothing is due in the next two weeks.</p>
      } @else {
        <ul>
          @for (i of items(); track i.kind + (i.equipmentId ?? '') + i.propertyId) {
            <li [class.overdue]="i.inDays < 0">
              <span class="what"
                ><strong>{{ i.label }}</strong> {{ words(i) }}</span
              >
              <span class="why">{{ i.why }}</span>
              <span class="do">
                @if (i.bookingPath) {
                  <a mat-flat-button [routerLink]="'/portal/booking'" [queryParams]="{ kind: 'tune_up', property: i.propertyId }">Book a tune-up</a>
                }
                @if (i.kind === 'filter' && i.equipmentId) {
                  <button mat-stroked-button type="button" [disabled]="busy()" (click)="changed(i.equipmentId)" [attr.aria-label]="'I changed it: ' + i.label">I changed it</button>
                }
              </span>
            </li>
          }
        </ul>
      }
      <a mat-button routerLink="/portal/reminders">Choose which reminders you get</a>
    </section>
  `,
  styles: `
    ul {
      list-style: none;
      padding: 0;
      margin: 0 0 8px;
      display: grid;
      gap: 8px;
    }
    li {
      display: grid;
      grid-template-columns: 1fr auto;
      gap: 2px 12px;
      padding: 10px 12px;
      border: 1px solid var(--mat-sys-outline-variant);
      border-radius: var(--sw-radius, 8px);
    }
    li.overdue {
      border-left: 5px solid var(--sw-ember, #b5532a);
    }
    .why {
      grid-column: 1;
      color: var(--mat-sys-on-surface-variant);
      font-size: 0.9rem;
    }
    .do {
      grid-column: 2;
      grid-row: 1 / span 2;
      display: flex;
      gap: 8px;
      align-items: center;
    }
    .empty {
      color: var(--mat-sys-on-surface-variant);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DueList {
  private readonly api = inject(MyRemindersApi);
  private readonly snack = inject(MatSnackBar);
  private readonly read = rxResource({ stream: () => this.api.due() });
  private readonly fresh = signal<MyReminders | null>(null);
  protected readonly busy = signal(false);
  protected readonly items = computed<MyDueItem[]>(() => this.fresh()?.items ?? (this.read.hasValue() ? this.read.value().items : []));

  protected words(i: MyDueItem): string {
    return dueWords(i.inDays);
  }

  protected changed(equipmentId: string): void {
    this.busy.set(true);
    this.api.filterChanged(equipmentId).subscribe({
      next: (r) => {
        this.busy.set(false);
        this.fresh.set(r);
        this.snack.open('Noted: the next reminder counts from today.', 'OK', { duration: 4000 });
      },
      error: (err: unknown) => {
        this.busy.set(false);
        this.snack.open(toApiError(err).message, 'OK');
      },
    });
  }
}
