import { ChangeDetectionStrategy, Component, inject, input } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type { VisitSummary as Summary } from '../../../../shared/schemas/field';
import { errorMessage, localCopy } from '../../core/resource-state';
import { ReadingsApi } from '../readings-chart/readings-api';
import { ReadingsChart } from '../readings-chart/readings-chart';
import { ReadingStatusMark } from '../../ui/status/reading-status';
import { dayLabel } from '../../ui/dates';
import { Session } from '../../core/session';

/** A completed visit in plain words, with the home's readings over time. */
@Component({
  selector: 'sw-visit-summary',
  imports: [MatIconModule, RouterLink, ReadingsChart, ReadingStatusMark],
  templateUrl: './visit-summary.html',
  styleUrl: './visit-summary.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class VisitSummary {
  private readonly api = inject(ReadingsApi);
  private readonly session = inject(Session);
  /** Route parameter. */
  readonly id = input.required<string>();
  private readonly read = rxResource({ params: () => this.id(), stream: ({ params }) => this.api.visitSummary(params) });
  protected readonly summary = localCopy<Summary>(this.read);
  protected readonly error = errorMessage(this.read, (e) => (e.status === 404 ? 'We could not find a finished visit with that link.' : e.message));

  protected longDay(iso: string): string {
    return dayLabel(iso, this.session.timeZone(), { weekday: true });
  }
}
