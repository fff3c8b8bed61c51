import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSnackBar } from '@angular/material/snack-bar';
import { companySettingsSchema, type CompanySettings } from '../../../../shared/schemas/settings';
import { seasonSettingsIssue } from '../../../../shared/seasons';
import { toApiError } from '../../core/api-errors';
import { applyFieldErrors, applyServerErrors, serverError } from '../../core/form-errors';
import { CompanySettingsApi } from './company-settings-api';

/** The server's names for the two fields the form holds in other units. */
const FORM_NAMES: Record<string, string> = { taxRateBps: 'taxRatePct', diagnosticFeeCents: 'diagnosticFee' };

const DAYS = [
  { key: '1', label: 'Monday' },
  { key: '2', label: 'Tuesday' },
  { key: '3', label: 'Wednesday' },
  { key: '4', label: 'Thursday' },
  { key: '5', label: 'Friday' },
  { key: '6', label: 'Saturday' },
  { key: '7', label: 'Sunday' },
] as const;
const MONTHS = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'].map((label, i) => ({
  value: i + 1,
  label,
}));
type DayKey = (typeof DAYS)[number]['key'];
type DayGroup = FormGroup<{ closed: FormControl<boolean>; open: FormControl<string>; close: FormControl<string> }>;

/**
 * The owner's pages for the company's details (`section` "company") and for its hours and booking
 * rules ("hours"). Both edit the one settings record, so each saves the whole of it.
 */
@Component({
  selector: 'sw-company-settings',
  imports: [ReactiveFormsModule, MatButtonModule, MatCheckboxModule, MatFormFieldModule, MatInputModule],
  templateUrl: './company-settings.html',
  styleUrl: './company-settings.scss',
  host: { class: 'sw-dense' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CompanySettingsPage {
  private readonly api = inject(CompanySettingsApi);
  private readonly snack = inject(MatSnackBar);
  private readonly fb = inject(NonNullableFormBuilder);

  /** Which of the two pages this is, from the route's data. */
  readonly section = input<'company' | 'hours'>('company');
  protected readonly days = DAYS;
  protected readonly months = MONTHS;
  protected readonly saving = signal(false);
  private readonly read = rxResource({ stream: () => this.api.get() });
  protected readonly loaded = computed(() => this.read.hasValue());

  protected readonly form = this.fb.group({
    name: ['', Validators.required],
    phone: ['', Validators.required],
    email: ['', [Validators.required, Validators.email]],
    street: ['', Validators.required],
    city: ['', Validators.required],
    state: ['', Validators.required],
    zip: ['', Validators.required],
    timeZone: ['America/Chicago', Validators.required],
    taxRatePct: [0, [Validators.required, Validators.min(0), Validators.max(50)]],
    diagnosticFee: [0, [Validators.required, Validators.min(0)]],
    arrivalWindowMinutes: [120, Validators.required],
    leadTimeMinutes: [120, Validators.required],
    heldBackPct: [25, Validators.required],
    cancelCutoffHours: [24, Validators.required],
    coolingStartMonth: [3, Validators.required],
    heatingStartMonth: [9, Validators.required],
    hours: this.fb.group(Object.fromEntries(DAYS.map((d) => [d.key, this.dayGroup()])) as Record<DayKey, DayGroup>),
  });

  constructor() {
    effect(() => {
      const e = this.read.error();
      if (e) untracked(() => this.snack.open(toApiError(e).message, 'Dismiss'));
    });
    effect(() => {
      if (!this.read.hasValue()) return;
      const s: CompanySettings = this.read.value();
      untracked(() =>
        this.form.patchValue({
          ...s,
          taxRatePct: s.taxRateBps / 100,
          diagnosticFee: s.diagnosticFeeCents / 100,
          hours: Object.fromEntries(
            DAYS.map((d) => [d.key, s.businessHours[d.key] ? { closed: false, ...s.businessHours[d.key]! } : { closed: true, open: '08:00', close: '17:00' }]),
          ),
        }),
      );
    });
  }

  private dayGroup(): DayGroup {
    return this.fb.group({ closed: this.fb.control(false), open: this.fb.control('08:00'), close: this.fb.control('17:00') });
  }

  protected hoursOf(key: DayKey): DayGroup {
    return this.form.controls.hours.controls[key];
  }

  /** The message under a field, named as the server names it. */
  protected error(field: string): string | null {
    return serverError(this.form.get(FORM_NAMES[field] ?? field));
  }

  protected save(): void {
    if (this.saving()) return;
    const v = this.form.getRawValue();
    const body = {
      name: v.name,
      phone: v.phone,
      email: v.email,
      street: v.street,
      city: v.city,
      state: v.state,
      zip: v.zip,
      timeZone: v.timeZone,
      taxRateBps: Math.round(Number(v.taxRatePct) * 100),
      diagnosticFeeCents: Math.round(Number(v.diagnosticFee) * 100),
      arrivalWindowMinutes: Number(v.arrivalWindowMinutes),
      leadTimeMinutes: Number(v.leadTimeMinutes),
      heldBackPct: Number(v.heldBackPct),
      cancelCutoffHours: Number(v.cancelCutoffHours),
      coolingStartMonth: Number(v.coolingStartMonth),
      heatingStartMonth: Number(v.heatingStartMonth),
      businessHours: Object.fromEntries(DAYS.map((d) => [d.key, v.hours[d.key].closed ? null : { open: v.hours[d.key].open, close: v.hours[d.key].close }])),
    };
    // The same schema the server uses: errors show next to their fields before a round trip.
    const checked = companySettingsSchema.safeParse(body);
    const seasons = seasonSettingsIssue(body);
    if (checked.success && seasons) {
      applyFieldErrors(this.form, { [seasons.field]: seasons.message }, FORM_NAMES);
      return;
    }
    if (!checked.success) {
      applyFieldErrors(this.form, Object.fromEntries(checked.error.issues.map((i) => [i.path.join('.'), i.message])), FORM_NAMES);
      return;
    }
    this.saving.set(true);
    this.api.save(checked.data).subscribe({
      next: () => {
        this.saving.set(false);
        this.snack.open('Saved. New bookings use these hours and rules from now on.', 'OK', { duration: 5000 });
      },
      error: (err: unknown) => {
        this.saving.set(false);
        applyServerErrors(this.form, err, FORM_NAMES);
        this.snack.open(toApiError(err).message, 'Dismiss');
      },
    });
  }
}
