import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatRadioModule } from '@angular/material/radio';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import type { VisitView } from '../../../../shared/schemas/booking';
import { VISIT_REASON_LABELS, VISIT_STATE_WORDS } from '../../../../shared/visits';
import { toApiError } from '../../core/api-errors';
import { errorMessage, localCopy } from '../../core/resource-state';
import { BookingApi } from './booking-api';
import { groupByDay } from './window-days';
import { VisitStatusMark } from '../../ui/status/visit-status';
import { firstValueFrom } from 'rxjs';
import { PhoneLink } from '../../ui/phone-link';

/** One visit: its window and status, with reschedule and cancel until the cut-off. */
@Component({
  selector: 'sw-visit-detail',
  imports: [PhoneLink, ReactiveFormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatIconModule, MatRadioModule, VisitStatusMark],
  templateUrl: './visit-detail.html',
  styleUrl: './visit-request.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class VisitDetail {
  private readonly api = inject(BookingApi);
  private readonly snack = inject(MatSnackBar);
  readonly id = input.required<string>();

  private readonly read = rxResource({ params: () => this.id(), stream: ({ params }) => this.api.visit(params) });
  protected readonly visit = localCopy<VisitView>(this.read);
  protected readonly picking = signal(false);
  protected readonly stateWords = VISIT_STATE_WORDS;
  /** Open windows to move to, read while the homeowner is choosing one. */
  private readonly windowsRead = rxResource({
    params: () => {
      const v = this.visit();
      return this.picking() && v ? { propertyId: v.propertyId, reason: v.reason, visitId: v.id, days: 14 } : undefined;
    },
    stream: ({ params }) => this.api.windows(params),
  });
  private readonly loadError = errorMessage(this.read);
  private readonly windowsError = errorMessage(this.windowsRead);
  private readonly actionError = signal<string | null>(null);
  protected readonly error = computed(() => this.actionError() ?? this.loadError() ?? this.windowsError());
  protected readonly busy = signal(false);
  protected readonly days = computed(() => groupByDay(this.windowsRead.hasValue() ? this.windowsRead.value().windows : []));
  protected readonly reasonLabel = computed(() => {
    const v = this.visit();
    return v ? VISIT_REASON_LABELS[v.reason] : '';
  });
  protected readonly windowStart = new FormControl('', { nonNullable: true, validators: [Validators.required] });

  protected startReschedule(): void {
    if (this.picking()) this.windowsRead.reload();
    else this.picking.set(true);
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
      if (e.code === 'window_full') this.startReschedule();
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
      this.actionError.set(toApiError(err).message);
    } finally {
      this.busy.set(false);
    }
  }
}
