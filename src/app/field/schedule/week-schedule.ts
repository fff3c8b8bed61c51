import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import type { VisitView, WeekResponse } from '../../../../shared/schemas/booking';
import { VISIT_REASON_LABELS, visitTimeLabels } from '../../../../shared/visits';
import { toApiError } from '../../core/api-errors';
import { errorMessage, localCopy } from '../../core/resource-state';
import { VisitStatusMark } from '../../ui/status/visit-status';
import { ScheduleApi } from './schedule-api';
import { firstValueFrom } from 'rxjs';
import { addDays, dayLabel } from '../../ui/dates';

/** The technician's week, day by day, and the private calendar link for their phone. */
@Component({
  selector: 'sw-week-schedule',
  imports: [MatButtonModule, MatIconModule, RouterLink, VisitStatusMark],
  templateUrl: './week-schedule.html',
  styleUrl: './week-schedule.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class WeekSchedule {
  private readonly api = inject(ScheduleApi);
  private readonly snack = inject(MatSnackBar);
  protected readonly reasons = VISIT_REASON_LABELS;
  private readonly start = signal<string | undefined>(undefined);
  private readonly read = rxResource({ params: () => ({ start: this.start() }), stream: ({ params }) => this.api.week(params.start) });
  protected readonly week = localCopy<WeekResponse>(this.read, true);
  protected readonly error = errorMessage(this.read);
  protected readonly feedUrl = signal<string | null>(null);

  protected readonly days = computed(() => {
    const w = this.week();
    if (!w) return [];
    return Array.from({ length: 7 }, (_, i) => {
      const iso = addDays(w.start.slice(0, 10), i);
      return { iso, label: dayLabel(iso, w.timeZone, { weekday: true }), visits: w.visits.filter((v) => v.startsAt.slice(0, 10) === iso) };
    });
  });

  private load(): void {
    this.read.reload();
  }

  protected shift(weeks: number): void {
    const w = this.week();
    if (!w) return;
    this.start.set(addDays(w.start.slice(0, 10), weeks * 7));
  }

  /** The same arrival window and booked length as Today's visits (visitTimeLabels). */
  protected time(v: VisitView): { arrival: string; work: string } {
    return visitTimeLabels(v, this.week()?.timeZone ?? 'UTC');
  }

  protected async newFeed(): Promise<void> {
    try {
      const { url } = await firstValueFrom(this.api.issueFeed());
      this.feedUrl.set(url);
      this.load();
    } catch (err) {
      this.snack.open(toApiError(err).message, 'OK', { duration: 6000 });
    }
  }

  protected async revokeFeed(): Promise<void> {
    try {
      await firstValueFrom(this.api.revokeFeed());
      this.feedUrl.set(null);
      this.snack.open('Calendar link turned off. Calendars using it stop updating.', 'OK', { duration: 6000 });
      this.load();
    } catch (err) {
      this.snack.open(toApiError(err).message, 'OK', { duration: 6000 });
    }
  }

  protected async onTheWay(v: VisitView): Promise<void> {
    try {
      await firstValueFrom(this.api.setStatus(v.id, 'on_the_way'));
      this.snack.open('Homeowner told you are on the way.', 'OK', { duration: 4000 });
      this.load();
    } catch (err) {
      this.snack.open(toApiError(err).message, 'OK', { duration: 6000 });
    }
  }
}
