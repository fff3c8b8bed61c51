import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router, RouterLink } from '@angular/router';
import { US_STATES } from '../../../../shared/customer-fields';
import { applyFieldErrors, applyServerErrors, serverError } from '../../core/form-errors';
import { lazyModule } from '../../core/lazy-module';
import { CustomersApi } from './customers-api';
import { firstValueFrom } from 'rxjs';

// The household schema the server parses with (zod, and libphonenumber-js for phone numbers)
// loads in a chunk of its own beside the form, which draws without it.
const schemas = lazyModule(() => import('../../../../shared/schemas/customers'));

/** New household with its first property. The shared schema checks here and again on the server. */
@Component({
  selector: 'sw-customer-form',
  imports: [ReactiveFormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatSelectModule],
  templateUrl: './customer-form.html',
  styles: `
    :host {
      display: block;
      padding: 16px;
      max-width: 760px;
      margin: 0 auto;
    }
    form {
      display: grid;
      gap: 4px 12px;
      grid-template-columns: repeat(auto-fit, minmax(220px, 1fr));
    }
    h2,
    .wide,
    .buttons,
    .error {
      grid-column: 1 / -1;
    }
    .buttons {
      display: flex;
      gap: 8px;
      margin-top: 8px;
    }
    .error {
      color: var(--mat-sys-error);
      display: flex;
      gap: 6px;
      align-items: center;
    }
  `,
  host: { class: 'sw-dense' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CustomerForm {
  private readonly api = inject(CustomersApi);
  private readonly router = inject(Router);
  private readonly snack = inject(MatSnackBar);
  protected readonly states = US_STATES;
  protected readonly saving = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly serverError = serverError;

  protected readonly form = new FormGroup({
    name: new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.maxLength(120)] }),
    email: new FormControl('', { nonNullable: true, validators: [Validators.email] }),
    phone: new FormControl('', { nonNullable: true }),
    notes: new FormControl('', { nonNullable: true }),
    property: new FormGroup({
      label: new FormControl('Home', { nonNullable: true }),
      street: new FormControl('', { nonNullable: true, validators: [Validators.required] }),
      unit: new FormControl('', { nonNullable: true }),
      city: new FormControl('', { nonNullable: true, validators: [Validators.required] }),
      state: new FormControl('MO', { nonNullable: true, validators: [Validators.required] }),
      zip: new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.pattern(/^[0-9]{5}(-[0-9]{4})?$/)] }),
      accessNotes: new FormControl('', { nonNullable: true }),
    }),
  });

  private readonly phone = toSignal(this.form.controls.phone.valueChanges, { initialValue: '' });
  /** The number as it will be stored (E.164), once the phone rules are in. */
  protected readonly phonePreview = computed(() => {
    const v = this.phone().trim();
    const rules = v ? schemas.value() : null;
    return rules ? rules.toE164(v) : null;
  });

  constructor() {
    schemas.preload();
  }

  protected async save(): Promise<void> {
    this.error.set(null);
    const value = this.form.getRawValue();
    // Same schema as the server: errors show at once, under their fields.
    const rules = schemas.value() ?? (await schemas.load().catch(() => null));
    if (!rules) {
      this.error.set('The form could not load its checks. Check the connection and try again.');
      return;
    }
    const check = rules.customerCreateSchema.safeParse(value);
    if (!check.success) {
      applyFieldErrors(this.form, Object.fromEntries(check.error.issues.map((issue) => [issue.path.join('.'), issue.message])));
      return;
    }
    this.saving.set(true);
    try {
      const { id } = await firstValueFrom(this.api.create(value));
      this.snack.open('Household added.', 'OK', { duration: 3000 });
      await this.router.navigate(['/office/customers', id]);
    } catch (err) {
      this.error.set(applyServerErrors(this.form, err));
    } finally {
      this.saving.set(false);
    }
  }
}
