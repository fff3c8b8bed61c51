import { ChangeDetectionStrategy, Component, computed, effect, inject, input, output, signal, untracked } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { firstValueFrom } from 'rxjs';
import { categoriesOfKind, ITEM_CATEGORY_LABELS, ITEM_KIND_LABELS, ITEM_KINDS, ITEM_UNITS, type ItemCategory, type ItemKind } from '../../../../shared/pricebook';
import { PRICE_BOOK_FIELD_KEYS, PRICE_BOOK_IMPORT_FIELDS } from '../../../../shared/pricebook';
import type { PriceBookFieldKey, PriceBookItem } from '../../../../shared/schemas/pricebook';
import { applyFieldErrors, applyServerErrors, serverError } from '../../core/form-errors';
import { lazyModule } from '../../core/lazy-module';
import { PriceBookApi } from './price-book-api';

// The row reading the import uses (zod with the price-book schemas) loads in a chunk of its own
// beside the form, which draws without it.
const rows = lazyModule(() => import('../../../../shared/pricebook-csv'));

/** The specification values each category is matched on; other part categories carry notes. */
const SPEC_FIELDS: Partial<Record<ItemCategory, PriceBookFieldKey[]>> = {
  motor: [
    'application',
    'hp',
    'volts',
    'phase',
    'rpm',
    'speeds',
    'rotation',
    'rotation_viewed_from',
    'fla',
    'capacitor_taps',
    'capacitor_volts',
    'shaft_diameter',
    'shaft_length',
    'frame',
  ],
  capacitor: ['microfarads', 'volts', 'shape', 'tolerance'],
  contactor: ['poles', 'coil_volts', 'fla'],
  filter: ['filter_size', 'merv'],
  refrigerant: ['refrigerant'],
};
const HINTS: Partial<Record<PriceBookFieldKey, string>> = {
  hp: '1/2, or 1/6-1/2 for multi-horsepower',
  volts: '115, or 208-230',
  capacitor_taps: 'µF per tap, like 1/2:10, 1/3:7.5',
  microfarads: '7.5, or 40/5 for a dual can',
  rotation: 'reversible, CW or CCW',
  rotation_viewed_from: 'shaft end or lead end',
};
/** Server paths that land on a form column. */
const ALIASES: Record<string, string> = {
  unitCents: 'unit_price',
  costCents: 'cost',
  partsWarrantyMonths: 'warranty_months',
  'spec.horsepower': 'hp',
  'spec.horsepower.max': 'hp',
  'spec.volts': 'volts',
  'spec.phase': 'phase',
  'spec.rpm': 'rpm',
  'spec.speeds': 'speeds',
  'spec.rotation': 'rotation',
  'spec.rotationViewedFrom': 'rotation_viewed_from',
  'spec.fla': 'fla',
  'spec.taps': 'capacitor_taps',
  'spec.capacitorVolts': 'capacitor_volts',
  'spec.microfarads': 'microfarads',
  'spec.shape': 'shape',
  'spec.poles': 'poles',
  'spec.coilVolts': 'coil_volts',
  'spec.size': 'filter_size',
  'spec.merv': 'merv',
};

/** Adds or changes one price-book item, with the specification fields of its category. */
@Component({
  selector: 'sw-item-form',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatInputModule, MatSelectModule],
  templateUrl: './item-form.html',
  styles: `
    form {
      border: 1px solid var(--sw-teal-soft);
      border-radius: var(--sw-radius);
      padding: 8px 12px;
      margin: 12px 0;
    }
    .grid {
      display: grid;
      grid-template-columns: repeat(auto-fill, minmax(200px, 1fr));
      gap: 0 12px;
    }
    h2,
    h3 {
      font-size: 1.1rem;
      font-weight: 800;
    }
    .buttons {
      display: flex;
      gap: 12px;
    }
    .bad {
      color: var(--sw-alert);
      font-weight: 700;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ItemForm {
  private readonly api = inject(PriceBookApi);
  /** The item to change; null adds a new one. */
  readonly item = input<PriceBookItem | null>(null);
  readonly saved = output<PriceBookItem>();
  readonly canceled = output<void>();

  protected readonly kinds = ITEM_KINDS;
  protected readonly kindLabels = ITEM_KIND_LABELS;
  protected readonly units = ITEM_UNITS;
  protected readonly categoryLabels = ITEM_CATEGORY_LABELS;
  protected readonly labels = Object.fromEntries(PRICE_BOOK_IMPORT_FIELDS.map((f) => [f.key, f.label])) as Record<PriceBookFieldKey, string>;
  protected readonly hints = HINTS;
  protected readonly form = new FormGroup(
    Object.fromEntries(PRICE_BOOK_FIELD_KEYS.map((k) => [k, new FormControl('', { nonNullable: true })])) as Record<PriceBookFieldKey, FormControl<string>>,
  );
  private readonly kind = toSignal(this.form.controls.kind.valueChanges, { initialValue: '' });
  private readonly category = toSignal(this.form.controls.category.valueChanges, { initialValue: '' });
  protected readonly categories = computed(() => (this.kind() ? categoriesOfKind(this.kind() as ItemKind) : []));
  protected readonly specFields = computed((): PriceBookFieldKey[] => {
    const c = this.category() as ItemCategory;
    if (!c || this.kind() !== 'part') return [];
    return SPEC_FIELDS[c] ?? ['spec_notes'];
  });
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly err = (k: string) => serverError(this.form.get(k));

  constructor() {
    rows.preload();
    effect(() => {
      const it = this.item();
      // An item to edit fills the form once the row reading is in.
      const csv = it ? rows.value() : null;
      if (it && !csv) return;
      untracked(() => {
        this.form.reset();
        if (it && csv) this.form.setValue(csv.rowFromItem(it));
        else this.form.patchValue({ kind: 'part', unit: 'each', taxable: 'yes', active: 'yes', warranty_months: '0', cost: '0' });
      });
    });
  }

  protected async save(): Promise<void> {
    const csv = rows.value() ?? (await rows.load().catch(() => null));
    if (!csv) {
      this.error.set('The form could not load its checks. Check the connection and try again.');
      return;
    }
    const read = csv.itemFromRow(this.form.getRawValue());
    if (!read.value) {
      applyFieldErrors(this.form, Object.fromEntries(read.problems.map((p) => [p.field, p.message])));
      this.error.set(read.problems.find((p) => p.field === '_')?.message ?? 'Check the values marked below.');
      return;
    }
    this.busy.set(true);
    this.error.set(null);
    try {
      const it = this.item();
      this.saved.emit(await firstValueFrom(it ? this.api.update(it.id, read.value) : this.api.create(read.value)));
    } catch (e) {
      this.error.set(applyServerErrors(this.form, e, ALIASES) ?? 'Check the values marked below.');
    } finally {
      this.busy.set(false);
    }
  }
}
