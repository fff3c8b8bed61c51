import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { errorMessage } from '../../core/resource-state';
import { FieldApi } from '../field-api';
import { dayLabel } from '../../ui/dates';
import { Session } from '../../core/session';

/** The technician's visits today, in time order, one big tap target each. */
@Component({
  selector: 'sw-today-visits',
  imports: [MatButtonModule, MatIconModule, RouterLink],
  templateUrl: './today-visits.html',
  styleUrl: './today-visits.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TodayVisits {
  private readonly api = inject(FieldApi);
  private readonly session = inject(Session);
  private readonly today = rxResource({ stream: () => this.api.today() });
  protected readonly visits = computed(() => (this.today.hasValue() ? this.today.value().visits : []));
  protected readonly date = computed(() => (this.today.hasValue() ? this.today.value().date : null));
  protected readonly loading = this.today.isLoading;
  protected readonly error = errorMessage(this.today);
  protected readonly heading = computed(() => {
    const d = this.date();
    return d ? dayLabel(d, this.session.timeZone(), { weekday: true }) : '';
  });

  protected load(): void {
    this.today.reload();
  }
}
