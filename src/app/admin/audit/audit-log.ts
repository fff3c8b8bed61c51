import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatPaginatorModule, type PageEvent } from '@angular/material/paginator';
import { MatSelectModule } from '@angular/material/select';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatTableModule } from '@angular/material/table';
import { AuditApi } from './audit-api';
import { DateTimePipe } from '../../ui/dates';

const ACTION_WORDS: Record<string, string> = {
  sign_in: 'Signed in',
  sign_in_failed: 'Sign-in failed',
  sign_in_locked: 'Locked after failures',
  sign_out: 'Signed out',
  sign_out_everywhere: 'Signed out everywhere',
  link_requested: 'Asked for a sign-in link',
  password_set: 'Set a password',
  password_reset_requested: 'Asked for a password reset',
  household_invited: 'Household invited',
  staff_invited: 'Staff invited',
  role_changed: 'Role changed',
  user_disabled: 'Account turned off',
  user_enabled: 'Account turned on',
  settings_changed: 'Company settings changed',
};

/** Who signed in, who failed, who changed whose access: newest first, paged by the server. */
@Component({
  selector: 'sw-audit-log',
  host: { class: 'sw-dense' },
  imports: [DateTimePipe, MatPaginatorModule, MatSelectModule, MatFormFieldModule, MatTableModule],
  template: `
    <section class="sw-page">
      <h1>Sign-in and access log</h1>
      <p class="sw-lead">Who signed in, who failed, and every invitation and role change, newest first.</p>
      <mat-form-field appearance="outline">
        <mat-label>Show</mat-label>
        <mat-select [value]="action()" (valueChange)="filter($event)">
          <mat-option value="">Everything</mat-option>
          @for (a of actions; track a[0]) {
            <mat-option [value]="a[0]">{{ a[1] }}</mat-option>
          }
        </mat-select>
      </mat-form-field>
      @if (page.error()) {
        <p role="alert">The log could not be loaded. Please try again.</p>
      }
      <!-- A page's worth of rows is reserved before they arrive, so the paginator does not jump. -->
      <div class="table-wrap" [style.--sw-page-rows]="pageSize()">
        <table mat-table [dataSource]="items()" aria-label="Audit events">
          <ng-container matColumnDef="at">
            <th mat-header-cell *matHeaderCellDef>When</th>
            <td mat-cell *matCellDef="let e">{{ e.at | swDateTime }}</td>
          </ng-container>
          <ng-container matColumnDef="action">
            <th mat-header-cell *matHeaderCellDef>What</th>
            <td mat-cell *matCellDef="let e">{{ word(e.action) }}</td>
          </ng-container>
          <ng-container matColumnDef="actor">
            <th mat-header-cell *matHeaderCellDef>By</th>
            <td mat-cell *matCellDef="let e">{{ e.actorName ?? '—' }}</td>
          </ng-container>
          <ng-container matColumnDef="subject">
            <th mat-header-cell *matHeaderCellDef>About</th>
            <td mat-cell *matCellDef="let e">{{ e.subject }}</td>
          </ng-container>
          <ng-container matColumnDef="ip">
            <th mat-header-cell *matHeaderCellDef>Network address</th>
            <td mat-cell *matCellDef="let e">{{ e.ip ?? '' }}</td>
          </ng-container>
          <tr mat-header-row *matHeaderRowDef="columns"></tr>
          <tr mat-row *matRowDef="let row; columns: columns"></tr>
        </table>
      </div>
      <mat-paginator [length]="total()" [pageIndex]="pageIndex()" [pageSize]="pageSize()" [pageSizeOptions]="[25, 50, 100]" (page)="turn($event)" aria-label="Pages of the log" />
    </section>
  `,
  styles: `
    table {
      width: 100%;
    }
    .table-wrap {
      overflow-x: auto;
      min-height: calc(var(--mat-table-header-container-height, 56px) + var(--sw-page-rows, 25) * var(--mat-table-row-item-container-height, 52px));
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AuditLog {
  protected readonly columns = ['at', 'action', 'actor', 'subject', 'ip'];
  protected readonly actions = Object.entries(ACTION_WORDS);
  protected readonly pageIndex = signal(0);
  protected readonly pageSize = signal(25);
  protected readonly action = signal('');
  private readonly api = inject(AuditApi);
  protected readonly page = rxResource({
    params: () => ({ page: this.pageIndex(), pageSize: this.pageSize(), action: this.action() || undefined }),
    stream: ({ params }) => this.api.page(params),
  });
  protected readonly items = computed(() => (this.page.hasValue() ? this.page.value().items : []));
  protected readonly total = computed(() => (this.page.hasValue() ? this.page.value().total : 0));
  protected word = (a: string) => ACTION_WORDS[a] ?? a;

  protected turn(e: PageEvent): void {
    this.pageSize.set(e.pageSize);
    this.pageIndex.set(e.pageIndex);
  }
  protected filter(a: string): void {
    this.action.set(a);
    this.pageIndex.set(0);
  }
}
