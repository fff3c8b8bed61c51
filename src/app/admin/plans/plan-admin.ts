import { ChangeDetectionStrategy, Component, inject, computed, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { MatSnackBar, MatSnackBarModule } from '@angular/material/snack-bar';
import { formatUsd } from '../../../../shared/money';
import { DEFAULT_DISCOUNT_CATEGORIES, ITEM_CATEGORIES, ITEM_CATEGORY_LABELS, type ItemCategory } from '../../../../shared/pricebook';
import type { PlanTerms, PlanView } from '../../../../shared/schemas/plans';
import { toApiError } from '../../core/api-errors';
import { applyFieldErrors, applyServerErrors, serverError } from '../../core/form-errors';
import { errorMessage } from '../../core/resource-state';

/** The server names amounts in cents and basis points; the form holds them as typed. */
const FORM_NAMES = { yearlyPriceCents: 'yearlyPrice', additionalSystemCents: 'additionalSystem', repairDiscountBps: 'repairDiscountPct' };
import { dollarsToCents } from '../../../../shared/money';
import { planFeatures } from '../../portal/plan/plan-features';
import { PlanAdminApi } from './plan-admin-api';

const centsText = (c: number) => (c / 100).toFixed(2);

/** Plan tiers for the owner. Saving new terms writes a new version; agreements sold keep theirs. */
@Component({
  selector: 'sw-plan-admin',
  imports: [ReactiveFormsModule, MatButtonModule, MatCardModule, MatCheckboxModule, MatFormFieldModule, MatInputModule, MatSelectModule, MatSlideToggleModule, MatSnackBarModule],
  templateUrl: './plan-admin.html',
  styleUrl: './plan-admin.scss',
  host: { class: 'sw-dense' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PlanAdmin {
  private readonly api = inject(PlanAdminApi);
  private readonly snack = inject(MatSnackBar);
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly usd = formatUsd;
  protected readonly features = planFeatures;
  protected readonly categories = ITEM_CATEGORIES.map((c) => ({ value: c, label: ITEM_CATEGORY_LABELS[c] }));
  private readonly read = rxResource({ stream: () => this.api.list() });
  protected readonly plans = computed<PlanView[]>(() => (this.read.hasValue() ? this.read.value().plans : []));
  protected readonly loadError = errorMessage(this.read);
  protected readonly editing = signal<PlanView | 'new' | null>(null);
  protected readonly err = (name: string) => serverError(this.form.get(name));
  protected readonly busy = signal(false);
  protected readonly form = this.fb.group({
    code: this.fb.control(''),
    name: this.fb.control('', Validators.required),
    description: this.fb.control(''),
    yearlyPrice: this.fb.control('', Validators.required),
    additionalSystem: this.fb.control('0.00', Validators.required),
    coolingVisits: this.fb.control(1),
    heatingVisits: this.fb.control(1),
    repairDiscountPct: this.fb.control('10'),
    diagnosticFeeWaived: this.fb.control(true),
    priorityWindowHours: this.fb.control(48),
    extras: this.fb.control(''),
    discountCategories: this.fb.control<ItemCategory[]>([...DEFAULT_DISCOUNT_CATEGORIES]),
    warrantyLaborCovered: this.fb.control(false),
  });

  private reload() {
    this.read.reload();
  }

  protected edit(p: PlanView | 'new') {
    this.editing.set(p);
    if (p === 'new') {
      this.form.reset();
      return;
    }
    this.form.setValue({
      code: p.code,
      name: p.name,
      description: p.description,
      yearlyPrice: centsText(p.yearlyPriceCents),
      additionalSystem: centsText(p.additionalSystemCents),
      coolingVisits: p.coolingVisits,
      heatingVisits: p.heatingVisits,
      repairDiscountPct: String(p.repairDiscountBps / 100),
      diagnosticFeeWaived: p.diagnosticFeeWaived,
      priorityWindowHours: p.priorityWindowHours,
      extras: p.extras.join('\n'),
      discountCategories: [...p.discountCategories],
      warrantyLaborCovered: p.warrantyLaborCovered,
    });
  }

  protected save() {
    const target = this.editing();
    if (!target || this.busy()) return;
    const v = this.form.getRawValue();
    const yearly = dollarsToCents(v.yearlyPrice);
    const extra = dollarsToCents(v.additionalSystem);
    const pct = Number(v.repairDiscountPct);
    const local: Record<string, string> = {};
    if (yearly === null) local['yearlyPriceCents'] = 'Enter a price such as 189.00.';
    if (extra === null) local['additionalSystemCents'] = 'Enter a price such as 89.00.';
    if (!Number.isFinite(pct) || Math.round(pct * 100) !== pct * 100) local['repairDiscountBps'] = 'Enter a percentage with at most 2 decimals.';
    if (Object.keys(local).length) return void applyFieldErrors(this.form, local, FORM_NAMES);
    const terms: PlanTerms = {
      name: v.name,
      description: v.description,
      yearlyPriceCents: yearly!,
      additionalSystemCents: extra!,
      coolingVisits: Number(v.coolingVisits),
      heatingVisits: Number(v.heatingVisits),
      repairDiscountBps: Math.round(pct * 100),
      diagnosticFeeWaived: v.diagnosticFeeWaived,
      priorityWindowHours: Number(v.priorityWindowHours),
      extras: v.extras
        .split('\n')
        .map((x) => x.trim())
        .filter(Boolean),
      discountCategories: v.discountCategories,
      warrantyLaborCovered: v.warrantyLaborCovered,
    };
    this.busy.set(true);
    const req = target === 'new' ? this.api.create({ ...terms, code: v.code }) : this.api.update(target.id, terms);
    req.subscribe({
      next: (p) => {
        this.busy.set(false);
        this.editing.set(null);
        this.snack.open(`${p.name} saved as version ${p.version}. Agreements already sold keep their terms.`, 'Close', { duration: 5000 });
        this.reload();
      },
      error: (e: unknown) => {
        this.busy.set(false);
        applyServerErrors(this.form, e, FORM_NAMES);
        this.snack.open(toApiError(e).message, 'Close');
      },
    });
  }

  protected setActive(p: PlanView, active: boolean) {
    this.api.setActive(p.id, active).subscribe({ next: () => this.reload(), error: (e: unknown) => this.snack.open(toApiError(e).message, 'Close') });
  }
}
