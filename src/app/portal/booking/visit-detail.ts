import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { FormControl, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatRadioModule } from '@angular/material/radio';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import type { ArrivalWindowView, VisitView } from '../../../../shared/schemas/booking';
import { VISIT_REASON_LABELS } from '../../../../shared/visits';
import { toApiError } from '../../core/api-errors';
import { BookingApi } from './booking-api';
import { groupByDay } from './window-days';
import { VisitStatusMark } from './visit-status';
import { firstValueFrom } from 'rxjs';

/** One visit: its window and status, with reschedule and cancel until the cut-off. */
@Component({
  selector: 'sw-visit-detail',
  imports: [ReactiveFormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatIconModule, MatRadioModule, VisitStatusMark],
  templateUrl: './visit-detail.html',
  styleUrl: './visit-request.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class VisitDetail {
  private readonly api = inject(BookingApi);
  private readonly snack = inject(MatSnackBar);
  readonly id = input.required<string>();

  protected readonly visit = signal<VisitView | null>(null);
  protected readonly error = signal<string | null>(null);
  protected readonly windows = signal<ArrivalWindowView[]>([]);
  protected readonly picking = signal(false);
  protected readonly busy = signal(false);
  protected readonly days = computed(() => groupByDay(this.windows()));
  protected readonly reasonLabel = computed(() => {
    const v = this.visit();
    return v ? VISIT_REASON_LABELS[v.reason] : '';
  });
  protected readonly windowStart = new FormControl('', { nonNullable: true, validators: [Validators.required] });

  constructor() {
    effect(() => {
      const id = this.id();
      untracked(() => void this.load(id));
    });
  }

  private async load(id: string): Promise<void> {
    try {
      this.visit.set(await firstValueFrom(this.api.visit(id)));
    } catch (err) {
      this.error.set(toApiError(err).message);
    }
  }

  protected async startReschedule(): Promise<void> {
    const v = this.visit();
    if (!v) return;
    this.picking.set(true);
    try {
      const res = await firstValueFrom(this.api.windows({ propertyId: v.propertyId, reason: v.reason, visitId: v.id, days: 14 }));
      this.windows.set(res.windows);
    } catch (err) {
      this.error.set(toApiError(err).message);
    }
  }

  protected async reschedule(): Promise<void> {
    const v = this.visit();
    if (!v || this.windowStart.invalid || this.busy()) return;
    this.busy.set(true);
    try {
      this.visit.set(await firstValueFrom(this.api.reschedule(v.id, this.windowStart.value)));
      this.picking.set(false);
      this.snack.open('Visit moved. We sent you an updated invitation.', 'OK', { duration: 5000 });
    } catch (err) {
      const e = toApiError(err);
      this.windowStart.setErrors({ server: e.message });
      if (e.code === 'window_full') await this.startReschedule();
    } finally {
      this.busy.set(false);
    }
  }

  protected async cancel(): Promise<void> {
    const v = this.visit();
    if (!v || this.busy()) return;
    this.busy.set(true);
    try {
      this.visit.set(await firstValueFrom(this.api.cancel(v.id)));
      this.snack.open('Visit canceled.', 'OK', { duration: 5000 });
    } catch (err) {
      this.error.set(toApiError(err).message);
    } finally {
      this.busy.set(false);
    }
  }
}
