import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressSpinnerModule } from '@angular/material/progress-spinner';
import { MatRadioModule } from '@angular/material/radio';
import { MatStepperModule, type MatStepper } from '@angular/material/stepper';
import { RouterLink } from '@angular/router';
import { EMERGENCY_SIGN_LABELS, EMERGENCY_SIGNS, SYMPTOMS, URGENT_REASONS } from '../../../../shared/visit-reasons';
import type { ArrivalWindowView, BookingOptions, VisitView } from '../../../../shared/schemas/booking';
import { VISIT_REASON_LABELS, VISIT_REASONS, VISIT_STATE_WORDS, type VisitReason } from '../../../../shared/visits';
import { toApiError } from '../../core/api-errors';
import { applyFieldErrors } from '../../core/form-errors';
import { errorMessage, localCopy } from '../../core/resource-state';
import { BookingApi } from './booking-api';
import { groupByDay } from './window-days';
import { firstValueFrom } from 'rxjs';
import { PhoneLink } from '../../ui/phone-link';
import { pageTitle } from '../../ui/page-title';

const REASON_ICONS: Record<VisitReason, string> = {
  no_cooling: 'snowflake',
  no_heat: 'flame',
  tune_up: 'wrench',
  noise: 'bell',
  water_leak: 'warning',
  thermostat: 'gauge',
  other: 'info',
};

type ChoiceStep = 'property' | 'reason' | 'window';

const MISSING_WORDS: Record<ChoiceStep, string> = {
  property: 'Choose the home the visit is for.',
  reason: 'Choose what the visit is for, then press Next.',
  window: 'Choose an arrival window, or press Later dates to see more.',
};

/** The visit request stepper: safety check first, then property, reason, details, window, review. */
@Component({
  selector: 'sw-visit-request',
  imports: [
    PhoneLink,
    ReactiveFormsModule,
    RouterLink,
    MatButtonModule,
    MatCheckboxModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressSpinnerModule,
    MatRadioModule,
    MatStepperModule,
  ],
  templateUrl: './visit-request.html',
  styleUrl: './visit-request.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class VisitRequest {
  private readonly api = inject(BookingApi);
  private readonly fb = inject(NonNullableFormBuilder);

  /** Set by the office when booking for a caller on the phone. */
  readonly customerId = input<string | undefined>(undefined);
  readonly forCaller = input(false);
  /** From a reminder's link (`?kind=tune_up&property=<id>`): the visit kind and home to pre-select. */
  readonly kind = input<string | undefined>(undefined);
  readonly property = input<string | undefined>(undefined);

  protected readonly signs = EMERGENCY_SIGNS.map((s) => ({ id: s, label: EMERGENCY_SIGN_LABELS[s] }));
  protected readonly reasons = VISIT_REASONS.map((r) => ({ id: r, label: VISIT_REASON_LABELS[r], icon: REASON_ICONS[r], urgent: URGENT_REASONS.includes(r) }));

  private readonly optionsRead = rxResource({ params: () => ({ customerId: this.customerId() }), stream: ({ params }) => this.api.options(params.customerId) });
  protected readonly options = localCopy<BookingOptions>(this.optionsRead);
  protected readonly loadError = errorMessage(this.optionsRead);
  protected readonly emergency = signal<'unknown' | 'yes' | 'no'>('unknown');
  protected readonly windows = signal<ArrivalWindowView[]>([]);
  protected readonly windowsLoading = signal(false);
  protected readonly windowsNote = signal<string | null>(null);
  protected readonly member = signal(false);
  protected readonly promiseHours = signal<number | null>(null);
  protected readonly filled = signal<string | null>(null);
  protected readonly busy = signal(false);
  protected readonly submitError = signal<string | null>(null);
  protected readonly booked = signal<VisitView | null>(null);
  // After booking the tab says what happened, not "Request a visit".
  protected readonly titled = pageTitle(() => {
    const v = this.booked();
    return v ? VISIT_STATE_WORDS[v.status].heading : null;
  });
  protected readonly stateWords = VISIT_STATE_WORDS;
  protected readonly photos = signal<File[]>([]);
  /** The step whose Next was pressed with nothing chosen; its message stays until a choice is made. */
  protected readonly missing = signal<ChoiceStep | null>(null);
  protected readonly missingWords = MISSING_WORDS;

  protected readonly propertyForm = this.fb.group({ propertyId: ['', Validators.required] });
  protected readonly reasonForm = this.fb.group({ reason: this.fb.control<VisitReason | ''>('', Validators.required) });
  protected readonly detailsForm = new FormGroup({
    symptoms: new FormControl<string[]>([], { nonNullable: true }),
    notes: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(2000)] }),
  });
  protected readonly windowForm = this.fb.group({ windowStart: ['', Validators.required] });

  private readonly reason = signal<VisitReason | ''>('');
  private readonly propertyId = signal('');
  protected readonly symptomChoices = computed(() => {
    const r = this.reason();
    return r ? SYMPTOMS[r] : [];
  });
  protected readonly days = computed(() => groupByDay(this.windows()));
  /** True when some offered window closes inside the plan's promised response time (marked Priority). */
  protected readonly promiseKept = computed(() => this.windows().some((w) => w.meetsPriorityPromise));
  protected readonly chosenProperty = computed(() => this.options()?.properties.find((p) => p.id === this.propertyId()) ?? null);
  private readonly windowStart = signal('');
  protected readonly chosenWindow = computed(() => this.windows().find((w) => w.start === this.windowStart()) ?? null);
  protected readonly reasonLabel = computed(() => {
    const r = this.reason();
    return r ? VISIT_REASON_LABELS[r] : '';
  });

  constructor() {
    // A household with one home skips the choice.
    effect(() => {
      const o = this.options();
      if (o?.properties.length === 1) untracked(() => this.propertyForm.controls.propertyId.setValue(o.properties[0]!.id));
    });
    // A link may name the home and the kind of visit; only a home of this household is taken.
    effect(() => {
      const o = this.options();
      const wanted = this.property();
      if (o && wanted && o.properties.some((p) => p.id === wanted)) untracked(() => this.propertyForm.controls.propertyId.setValue(wanted));
    });
    effect(() => {
      const reason = reasonForKind(this.kind());
      if (reason) untracked(() => this.reasonForm.controls.reason.setValue(reason));
    });
    this.propertyForm.controls.propertyId.valueChanges.subscribe((v) => {
      this.propertyId.set(v);
      if (v && this.missing() === 'property') this.missing.set(null);
    });
    this.windowForm.controls.windowStart.valueChanges.subscribe((v) => {
      this.windowStart.set(v);
      if (v && this.missing() === 'window') this.missing.set(null);
    });
    this.reasonForm.controls.reason.valueChanges.subscribe((v) => {
      this.reason.set(v);
      if (v && this.missing() === 'reason') this.missing.set(null);
      this.detailsForm.controls.symptoms.setValue([]);
    });
  }

  protected checkChosen(step: ChoiceStep): void {
    const form = { property: this.propertyForm, reason: this.reasonForm, window: this.windowForm }[step];
    form.markAllAsTouched();
    this.missing.set(form.valid ? null : step);
  }

  protected answerEmergency(answer: 'yes' | 'no', stepper: MatStepper): void {
    this.emergency.set(answer);
    if (answer === 'no') setTimeout(() => stepper.next());
  }

  protected toggleSymptom(s: string, on: boolean): void {
    const c = this.detailsForm.controls.symptoms;
    c.setValue(on ? [...c.value, s] : c.value.filter((x) => x !== s));
  }

  protected pickPhotos(ev: Event): void {
    const files = Array.from((ev.target as HTMLInputElement).files ?? []).slice(0, 6);
    this.photos.set(files);
  }

  protected async loadWindows(from?: string): Promise<void> {
    const propertyId = this.propertyId();
    const reason = this.reason();
    if (!propertyId || !reason) return;
    this.windowsLoading.set(true);
    this.windowsNote.set(null);
    try {
      const res = await firstValueFrom(this.api.windows({ propertyId, reason, from, days: 14 }));
      this.member.set(res.member);
      this.promiseHours.set(res.priorityWindowHours);
      this.windows.set(from ? [...this.windows(), ...res.windows.filter((w) => !this.windows().some((x) => x.start === w.start))] : res.windows);
      if (!res.windows.length) this.windowsNote.set('No arrival windows are open in these two weeks. Please call us and we will find a time.');
    } catch (err) {
      this.windowsNote.set(toApiError(err).message);
    } finally {
      this.windowsLoading.set(false);
    }
  }

  protected moreWindows(): void {
    const last = this.windows().at(-1);
    if (last) void this.loadWindows(last.start.slice(0, 10));
  }

  protected async confirm(stepper: MatStepper): Promise<void> {
    const reason = this.reason();
    if (!reason || this.busy()) return;
    this.busy.set(true);
    this.submitError.set(null);
    this.filled.set(null);
    try {
      const photoIds = this.photos().length ? (await firstValueFrom(this.api.uploadPhotos(this.propertyId(), this.photos()))).map((f) => f.id) : [];
      const visit = await firstValueFrom(
        this.api.book({
          propertyId: this.propertyId(),
          reason,
          symptoms: this.detailsForm.controls.symptoms.value,
          notes: this.detailsForm.controls.notes.value,
          photoIds,
          windowStart: this.windowForm.controls.windowStart.value,
          noEmergency: true,
        }),
      );
      this.booked.set(visit);
    } catch (err) {
      const e = toApiError(err);
      if (e.code === 'window_full') {
        // The answer carries the next free windows; a fresh list shows them with everything else still open.
        this.filled.set(e.message);
        this.windowForm.controls.windowStart.setValue('');
        await this.loadWindows();
        stepper.previous();
      } else {
        this.submitError.set(e.message);
        applyFieldErrors(this.detailsForm, e.fields);
        applyFieldErrors(this.windowForm, e.fields);
      }
    } finally {
      this.busy.set(false);
    }
  }
}

/** A tune-up link picks the tune-up reason; any reason's own name picks that reason. */
function reasonForKind(kind: string | undefined): VisitReason | null {
  if (!kind) return null;
  return (VISIT_REASONS as readonly string[]).includes(kind) ? (kind as VisitReason) : null;
}
