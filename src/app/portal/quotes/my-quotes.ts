import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatListModule } from '@angular/material/list';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { formatUsd } from '../../../../shared/money';
import { QUOTE_STATUS_LABELS } from '../../../../shared/pricebook';
import { errorMessage } from '../../core/resource-state';
import { PortalQuotesApi } from './portal-quotes-api';

/** The household's quotes: those waiting for an answer first, then the decided ones. */
import { DayPipe } from '../../ui/dates';

@Component({
  selector: 'sw-my-quotes',
  imports: [DayPipe, RouterLink, MatListModule, MatProgressBarModule],
  template: `
    <h1>Quotes</h1>
    <p class="sw-lead">Repairs your technician has quoted. Open one to approve an option or decline.</p>
    @if (read.isLoading()) {
      <mat-progress-bar mode="indeterminate" aria-label="Loading quotes" />
    }
    @if (error()) {
      <p role="alert">{{ error() }}</p>
    }
    @if (read.hasValue()) {
      <h2>Waiting for your answer</h2>
      @if (!waiting().length) {
        <p>No quote is waiting. After a visit, your technician's quote arrives by e-mail and shows here.</p>
      }
      <mat-nav-list aria-label="Quotes waiting for your answer">
        @for (q of waiting(); track q.id) {
          <a mat-list-item [routerLink]="['/portal/quotes', q.id]">
            <span matListItemTitle>Quote {{ q.number ?? '' }} · up to {{ usd(q.totalCents) }}</span>
            <span matListItemLine>Sent {{ q.createdAt | swDay }}</span>
          </a>
        }
      </mat-nav-list>
      @if (decided().length) {
        <h2>Earlier quotes</h2>
        <mat-nav-list aria-label="Earlier quotes">
          @for (q of decided(); track q.id) {
            <a mat-list-item [routerLink]="['/portal/quotes', q.id]">
              <span matListItemTitle>Quote {{ q.number ?? '' }} · {{ labels[q.status] }}</span>
              <span matListItemLine>{{ q.createdAt | swDay }}</span>
            </a>
          }
        </mat-nav-list>
      }
    }
  `,
  styles: `
    :host {
      display: block;
      max-width: 760px;
      margin: 0 auto;
      padding: 16px;
    }
    h2 {
      font-size: 1.2rem;
      font-weight: 800;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MyQuotes {
  private readonly api = inject(PortalQuotesApi);
  protected readonly usd = (c: number) => formatUsd(c);
  protected readonly labels = QUOTE_STATUS_LABELS;
  protected readonly read = rxResource({ stream: () => this.api.list() });
  private readonly rows = computed(() => (this.read.hasValue() ? this.read.value() : []));
  protected readonly waiting = computed(() => this.rows().filter((q) => q.status === 'sent'));
  protected readonly decided = computed(() => this.rows().filter((q) => q.status !== 'sent'));
  protected readonly error = errorMessage(this.read);
}
