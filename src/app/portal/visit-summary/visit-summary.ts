import { ChangeDetectionStrategy, Component, effect, inject, input, signal, untracked } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type { VisitSummary as Summary } from '../../../../shared/schemas/field';
import { toApiError } from '../../core/api-errors';
import { ReadingsApi } from '../readings-chart/readings-api';
import { ReadingsChart } from '../readings-chart/readings-chart';
import { StatusMark } from '../readings-chart/status-mark';
import { firstValueFrom } from 'rxjs';

/** A completed visit in plain words, with the home's readings over time. */
@Component({
  selector: 'sw-visit-summary',
  imports: [MatIconModule, RouterLink, ReadingsChart, StatusMark],
  templateUrl: './visit-summary.html',
  styleUrl: './visit-summary.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class VisitSummary {
  private readonly api = inject(ReadingsApi);
  /** Route parameter. */
  readonly id = input.required<string>();
  protected readonly summary = signal<Summary | null>(null);
  protected readonly error = signal<string | null>(null);

  constructor() {
    effect(() => {
      const id = this.id();
      untracked(() => void this.load(id));
    });
  }

  private async load(id: string): Promise<void> {
    this.error.set(null);
    try {
      this.summary.set(await firstValueFrom(this.api.visitSummary(id)));
    } catch (err) {
      const e = toApiError(err);
      this.error.set(e.status === 404 ? 'We could not find a finished visit with that link.' : e.message);
    }
  }

  protected longDay(iso: string): string {
    return new Date(`${iso}T12:00:00`).toLocaleDateString('en-US', { weekday: 'long', month: 'long', day: 'numeric', year: 'numeric' });
  }
}
