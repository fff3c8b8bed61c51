import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type { TodayVisit } from '../../../../shared/schemas/field';
import { toApiError } from '../../core/api-errors';
import { FieldApi } from '../field-api';
import { firstValueFrom } from 'rxjs';

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
  protected readonly visits = signal<TodayVisit[]>([]);
  protected readonly date = signal<string | null>(null);
  protected readonly loading = signal(true);
  protected readonly error = signal<string | null>(null);
  protected readonly heading = computed(() => {
    const d = this.date();
    return d ? new Date(`${d}T12:00:00`).toLocaleDateString('en-US', { weekday: 'long', month: 'long', day: 'numeric' }) : '';
  });

  constructor() {
    void this.load();
  }

  protected async load(): Promise<void> {
    this.loading.set(true);
    this.error.set(null);
    try {
      const res = await firstValueFrom(this.api.today());
      this.visits.set(res.visits);
      this.date.set(res.date);
    } catch (err) {
      this.error.set(toApiError(err).message);
    } finally {
      this.loading.set(false);
    }
  }
}
