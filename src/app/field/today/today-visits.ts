import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { errorMessage } from '../../core/resource-state';
import { FieldApi } from '../field-api';
import { dayLabel } from '../../ui/dates';
import { Session } from '../../core/session';
import { PartsToLoad } from './parts-to-load';

/** The technician's visits today, in time order, one big tap target each. */
@Component({
  selector: 'sw-today-visits',
  imports: [MatButtonModule, MatIconModule, RouterLink, PartsToLoad],
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
  /** Parts to load are a technician's own truck against their own visits. */
  protected readonly technician = computed(() => this.session.role() === 'technician');
  protected readonly error = errorMessage(this.today);
  protected readonly heading = computed(() => {
    const d = this.date();
    return d ? dayLabel(d, this.session.timeZone(), { weekday: true }) : '';
  });

  /** The first visit still to go to: where the day starts. */
  protected readonly first = computed(() => this.visits().find((v) => v.status !== 'done' && v.status !== 'canceled' && v.status !== 'no_show') ?? null);
  /** A geo: URI (RFC 5870, with the address as its query) opens the phone's own maps app; the web link is for a desktop. */
  protected readonly geoLink = computed(() => {
    const v = this.first();
    return v ? `geo:0,0?q=${encodeURIComponent(v.address)}` : null;
  });
  protected readonly webMapLink = computed(() => {
    const v = this.first();
    return v ? `https://www.openstreetmap.org/search?query=${encodeURIComponent(v.address)}` : null;
  });
  protected readonly remaining = computed(() => this.visits().filter((v) => v.status !== 'done' && v.status !== 'canceled' && v.status !== 'no_show').length);

  protected load(): void {
    this.today.reload();
  }
}
