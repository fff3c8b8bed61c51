import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { PLACE_LABELS, type ReplacementFit, type ReplacementResult } from '../../../../shared/part-matching';
import { MOTOR_APPLICATION_LABELS, MOTOR_APPLICATIONS } from '../../../../shared/pricebook';
import { applyFieldErrors, applyServerErrors, serverError } from '../../core/form-errors';
import { lazyModule } from '../../core/lazy-module';
import type { PickedLine } from './quote-draft';
import { QuotesApi } from './quotes-api';

// The nameplate schemas the server parses with (zod and the price-book schemas) load in a chunk
// of their own while the form is filled in.
const schemas = lazyModule(() => import('../../../../shared/schemas/pricebook'));

const text = () => new FormControl('', { nonNullable: true });

/** A found part as a quote line, taken from where it is stocked. */
export function lineOf(fit: ReplacementFit): PickedLine {
  const c = fit.candidate;
  const from = c.location ? `${PLACE_LABELS[fit.place]}: ${c.location.name} (${c.quantity} there)` : PLACE_LABELS.order;
  return { source: 'item', refId: c.itemId, sku: c.sku, description: c.name, quantity: 1, stockLocationId: c.location?.id ?? null, from };
}

/**
 * "Find a replacement": the failed part's nameplate values in, the parts that fit out, this truck
 * first, then the other trucks, then the shop, each with what matches, what differs and what
 * the swap needs.
 */
@Component({
  selector: 'sw-replacement-search',
  imports: [ReactiveFormsModule, MatButtonModule, MatButtonToggleModule, MatFormFieldModule, MatInputModule, MatSelectModule],
  templateUrl: './replacement-search.html',
  styleUrl: './quote-builder.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReplacementSearch {
  private readonly api = inject(QuotesApi);
  readonly visitId = input<string | null>(null);
  /** The quote's options, by title, that a found part can join. */
  readonly options = input<string[]>([]);
  readonly add = output<{ option: number; lines: PickedLine[] }>();

  protected readonly appLabels = MOTOR_APPLICATION_LABELS;
  protected readonly applications = MOTOR_APPLICATIONS;
  protected readonly places = PLACE_LABELS;
  protected readonly kind = signal<'motor' | 'capacitor'>('motor');
  protected readonly target = signal(0);
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly result = signal<ReplacementResult | null>(null);
  protected readonly added = signal<string | null>(null);
  protected readonly errorOf = (form: FormGroup, name: string) => serverError(form.get(name));

  protected readonly motor = new FormGroup({
    application: new FormControl<string>('indoor_blower', { nonNullable: true }),
    horsepower: text(),
    volts: text(),
    supplyVolts: text(),
    phase: new FormControl('1', { nonNullable: true }),
    rpm: text(),
    speeds: text(),
    speedsUsed: text(),
    amps: text(),
    rotation: new FormControl('unknown', { nonNullable: true }),
    rotationViewedFrom: new FormControl('shaft_end', { nonNullable: true }),
    oldCapacitorMicrofarads: text(),
  });
  protected readonly capacitor = new FormGroup({ microfarads: text(), volts: text(), shape: new FormControl('', { nonNullable: true }) });

  protected readonly optionTitles = computed(() => (this.options().length ? this.options() : ['Option 1']));

  constructor() {
    schemas.preload();
  }

  protected async search(): Promise<void> {
    const form = this.kind() === 'motor' ? this.motor : this.capacitor;
    const raw =
      this.kind() === 'motor' ? { category: 'motor', ...this.motorValue() } : { category: 'capacitor', ...this.capacitor.getRawValue(), shape: this.capacitor.value.shape || null };
    // The same schema the server parses with, for an answer before the request.
    const checks = schemas.value() ?? (await schemas.load().catch(() => null));
    if (!checks) {
      this.error.set('The form could not load its checks. Check the connection and try again.');
      return;
    }
    const checked = (this.kind() === 'motor' ? checks.failedMotorSchema : checks.failedCapacitorSchema).safeParse(raw);
    if (!checked.success) {
      const fields = Object.fromEntries(checked.error.issues.map((i) => [String(i.path[0] ?? '_'), i.message]));
      applyFieldErrors(form, fields);
      this.error.set('Check the values marked below.');
      return;
    }
    this.busy.set(true);
    this.error.set(null);
    this.added.set(null);
    this.api.replacements({ failed: checked.data, visitId: this.visitId() }).subscribe({
      next: (r) => {
        this.busy.set(false);
        this.result.set(r);
      },
      error: (e: unknown) => {
        this.busy.set(false);
        const aliases = Object.fromEntries(Object.keys(form.controls).map((k) => [`failed.${k}`, k]));
        this.error.set(applyServerErrors(form, e, aliases) ?? 'Check the values marked below.');
      },
    });
  }

  private motorValue() {
    const v = this.motor.getRawValue();
    return { ...v, rotationViewedFrom: v.rotation === 'unknown' ? null : v.rotationViewedFrom, speedsUsed: v.speedsUsed || v.speeds };
  }

  protected pick(fit: ReplacementFit, withCapacitor: ReplacementFit | null): void {
    const lines = [lineOf(fit), ...(withCapacitor ? [lineOf(withCapacitor)] : [])];
    this.add.emit({ option: this.target(), lines });
    this.added.set(`Added ${lines.map((l) => l.description).join(' and ')} to ${this.optionTitles()[this.target()] ?? 'the quote'}.`);
  }
}
