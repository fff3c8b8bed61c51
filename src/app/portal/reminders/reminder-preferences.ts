import { ChangeDetectionStrategy, Component, effect, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatSnackBar } from '@angular/material/snack-bar';
import { HOUSEHOLD_FACTORS, HOUSEHOLD_FACTOR_LABELS, REMINDER_KINDS, REMINDER_LABELS, type HouseholdFactor, type ReminderKind } from '../../../../shared/reminder-labels';
import { toApiError } from '../../core/api-errors';
import { DueList } from './due-list';
import { MyRemindersApi } from './my-reminders-api';

type Flags<K extends string> = Record<K, FormControl<boolean>>;
const flags = <K extends string>(keys: readonly K[], on: boolean) => Object.fromEntries(keys.map((k) => [k, new FormControl(on, { nonNullable: true })])) as Flags<K>;

/** Which reminders arrive by e-mail, and what about the home shortens filter changes. */
@Component({
  selector: 'sw-reminder-preferences',
  imports: [ReactiveFormsModule, MatButtonModule, MatCheckboxModule, DueList],
  template: `
    <section class="sw-page">
      <h1>Reminders</h1>
      <p class="sw-lead">What is due at your home, and which reminders we send you by e-mail.</p>
      <sw-due-list />
      <form [formGroup]="form" (ngSubmit)="save()">
        <fieldset formGroupName="email">
          <legend>Send me these reminders by e-mail</legend>
          @for (k of kinds; track k.kind) {
            <mat-checkbox [formControlName]="k.kind">{{ k.label }}</mat-checkbox>
          }
        </fieldset>
        <fieldset formGroupName="factors">
          <legend>About our home (filters are due sooner)</legend>
          @for (f of factors; track f.factor) {
            <mat-checkbox [formControlName]="f.factor">{{ f.label }}</mat-checkbox>
          }
        </fieldset>
        @if (unsubscribed()) {
          <p role="note">You unsubscribed from reminder e-mails. Receipts, sign-in links and visit confirmations still arrive.</p>
        }
        <button mat-flat-button type="submit" [disabled]="saving()">Save</button>
      </form>
    </section>
  `,
  styles: `
    fieldset {
      border: 1px solid var(--mat-sys-outline-variant);
      border-radius: 8px;
      margin: 16px 0;
      display: flex;
      flex-direction: column;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReminderPreferences {
  private readonly api = inject(MyRemindersApi);
  private readonly snack = inject(MatSnackBar);
  private readonly read = rxResource({ stream: () => this.api.due() });
  protected readonly kinds = REMINDER_KINDS.map((kind) => ({ kind, label: REMINDER_LABELS[kind] }));
  protected readonly factors = HOUSEHOLD_FACTORS.map((factor) => ({ factor, label: HOUSEHOLD_FACTOR_LABELS[factor] }));
  protected readonly form = new FormGroup({ email: new FormGroup(flags(REMINDER_KINDS, true)), factors: new FormGroup(flags(HOUSEHOLD_FACTORS, false)) });
  protected readonly saving = signal(false);
  protected readonly unsubscribed = signal(false);

  constructor() {
    effect(() => {
      if (!this.read.hasValue()) return;
      const r = this.read.value();
      this.unsubscribed.set(r.unsubscribed);
      for (const k of REMINDER_KINDS) this.form.controls.email.controls[k].setValue(!r.preferences.emailOff.includes(k));
      for (const f of HOUSEHOLD_FACTORS) this.form.controls.factors.controls[f].setValue(r.preferences.factors.includes(f));
    });
  }

  protected save(): void {
    const v = this.form.getRawValue();
    const emailOff = REMINDER_KINDS.filter((k) => !v.email[k]) as ReminderKind[];
    const factors = HOUSEHOLD_FACTORS.filter((f) => v.factors[f]) as HouseholdFactor[];
    this.saving.set(true);
    this.api.savePreferences({ emailOff, factors }).subscribe({
      next: () => {
        this.saving.set(false);
        this.snack.open('Reminder choices saved.', 'OK', { duration: 4000 });
      },
      error: (err: unknown) => {
        this.saving.set(false);
        this.snack.open(toApiError(err).message, 'OK');
      },
    });
  }
}
