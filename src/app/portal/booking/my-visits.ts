import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { groupServiceHistory, VISIT_REASON_LABELS } from '../../../../shared/visits';
import { errorMessage } from '../../core/resource-state';
import { BookingApi } from './booking-api';
import { VisitStatusMark } from '../../ui/status/visit-status';

/** The household's visits: coming up, then past. */
@Component({
  selector: 'sw-my-visits',
  imports: [MatButtonModule, MatIconModule, RouterLink, VisitStatusMark],
  template: `
    <h1>Your visits</h1>
    <p class="sw-lead">Visits coming up and past; open one to change or cancel it.</p>
    <a mat-flat-button routerLink="/portal/booking"><mat-icon svgIcon="add" aria-hidden="true" /> Request a visit</a>
    @if (error(); as e) {
      <p role="alert">{{ e }}</p>
    }
    <h2>Coming up</h2>
    <ul class="list" aria-label="Coming up">
      @for (v of groups().upcoming; track v.id) {
        <li>
          <a [routerLink]="['/portal/booking/visits', v.id]">
            <span class="title">{{ reasons[v.reason] }} · {{ v.windowLabel }}</span>
            <sw-visit-status [status]="v.status" />
          </a>
        </li>
      } @empty {
        <li>Nothing booked.</li>
      }
    </ul>
    <h2>Past visits</h2>
    <ul class="list" aria-label="Past visits">
      @for (v of groups().past; track v.id) {
        <li>
          <a [routerLink]="['/portal/booking/visits', v.id]">
            <span class="title">{{ reasons[v.reason] }} · {{ v.windowLabel }}</span>
            <sw-visit-status [status]="v.status" />
          </a>
        </li>
      } @empty {
        <li>No past visits yet.</li>
      }
    </ul>
  `,
  styles: `
    :host {
      display: block;
      max-width: 720px;
      margin: 0 auto;
      padding: 16px;
    }
    .list {
      list-style: none;
      padding: 0;
      margin: 16px 0;
      display: flex;
      flex-direction: column;
      gap: 8px;
    }
    .list a {
      display: flex;
      flex-direction: column;
      gap: 2px;
      padding: 12px;
      border: 1px solid var(--mat-sys-outline-variant);
      border-radius: 8px;
      color: inherit;
      text-decoration: none;
    }
    .title {
      font-weight: 600;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MyVisits {
  private readonly api = inject(BookingApi);
  protected readonly reasons = VISIT_REASON_LABELS;
  private readonly read = rxResource({ stream: () => this.api.visits() });
  protected readonly visits = computed(() => (this.read.hasValue() ? this.read.value() : []));
  /** Coming up soonest first, past newest first: the one rule in shared/visits.ts. */
  protected readonly groups = computed(() => groupServiceHistory(this.visits(), new Date()));
  protected readonly error = errorMessage(this.read);
}
