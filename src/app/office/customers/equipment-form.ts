import { ChangeDetectionStrategy, Component, inject, input, output, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { COMPRESSOR_TYPES, COMPRESSOR_TYPE_LABELS, EQUIPMENT_KINDS, EQUIPMENT_KIND_LABELS } from '../../../../shared/equipment';
import { equipmentInputSchema, REFRIGERANT_CHOICES, type Equipment } from '../../../../shared/schemas/equipment';
import { applyFieldErrors, applyServerErrors, serverError } from '../../core/form-errors';
import { CustomersApi } from './customers-api';
import { firstValueFrom } from 'rxjs';

/** Adds a piece of equipment to a property, in the trade's own fields. */
@Component({
  selector: 'sw-equipment-form',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatInputModule, MatSelectModule],
  templateUrl: './equipment-form.html',
  styles: `
    form {
      display: grid;
      gap: 0 12px;
      grid-template-columns: repeat(auto-fit, minmax(160px, 1fr));
    }
    .wide,
    .buttons,
    .error {
      grid-column: 1 / -1;
    }
    .buttons {
      display: flex;
      gap: 8px;
    }
    .error {
      color: var(--mat-sys-error);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class EquipmentForm {
  private readonly api = inject(CustomersApi);
  readonly propertyId = input.required<string>();
  readonly saved = output<Equipment>();
  readonly canceled = output<void>();

  protected readonly kinds = EQUIPMENT_KINDS.map((k) => ({ value: k, label: EQUIPMENT_KIND_LABELS[k] }));
  protected readonly refrigerants = REFRIGERANT_CHOICES;
  protected readonly compressorTypes = COMPRESSOR_TYPES.map((c) => ({ value: c, label: COMPRESSOR_TYPE_LABELS[c] }));
  protected readonly saving = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly serverError = serverError;

  protected readonly form = new FormGroup({
    kind: new FormControl<string>('condensing_unit', { nonNullable: true, validators: [Validators.required] }),
    make: new FormControl('', { nonNullable: true }),
    model: new FormControl('', { nonNullable: true }),
    serial: new FormControl('', { nonNullable: true }),
    installedOn: new FormControl('', { nonNullable: true }),
    refrigerant: new FormControl<string>('none', { nonNullable: true }),
    capacity: new FormControl('', { nonNullable: true }),
    capacityUnit: new FormControl<'tons' | 'btuh'>('tons', { nonNullable: true }),
    volts: new FormControl('', { nonNullable: true }),
    phase: new FormControl<string>('', { nonNullable: true }),
    ratedAmps: new FormControl('', { nonNullable: true }),
    filterSize: new FormControl('', { nonNullable: true }),
    filterType: new FormControl('', { nonNullable: true }),
    merv: new FormControl('', { nonNullable: true }),
    warrantyEndsOn: new FormControl('', { nonNullable: true }),
    location: new FormControl('', { nonNullable: true }),
    notes: new FormControl('', { nonNullable: true }),
    compressorType: new FormControl<string>('', { nonNullable: true }),
    maxCompressorHz: new FormControl('', { nonNullable: true }),
    maxExternalStaticInWc: new FormControl('', { nonNullable: true }),
  });

  protected async save(): Promise<void> {
    this.error.set(null);
    const value = this.form.getRawValue();
    const check = equipmentInputSchema.safeParse(value);
    if (!check.success) {
      applyFieldErrors(this.form, Object.fromEntries(check.error.issues.map((issue) => [String(issue.path[0] ?? ''), issue.message])));
      return;
    }
    this.saving.set(true);
    try {
      const saved = await firstValueFrom(this.api.addEquipment({ ...value, propertyId: this.propertyId() }));
      this.saved.emit(saved);
      this.form.reset();
    } catch (err) {
      this.error.set(applyServerErrors(this.form, err));
    } finally {
      this.saving.set(false);
    }
  }
}
