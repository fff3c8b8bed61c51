import { ChangeDetectionStrategy, Component, computed, effect, inject, linkedSignal, signal, untracked } from '@angular/core';
import { formatTermDay } from '../../../../shared/agreement-terms';
import { rxResource } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatRadioModule } from '@angular/material/radio';
import { MatSelectModule } from '@angular/material/select';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { ActivatedRoute, Router, RouterLink } from '@angular/router';
import { formatUsd } from '../../../../shared/money';
import type { AgreementView, PlanView } from '../../../../shared/schemas/plans';
import { toApiError } from '../../core/api-errors';
import { applyServerErrors, serverError } from '../../core/form-errors';
import { AgreementStatusBadge } from '../../ui/status/agreement-status';
import { planFeatures } from './plan-features';
import { PortalQuotesApi } from '../quotes/portal-quotes-api';
import { PlansApi, type HomeChoice } from './plans-api';

// Every screen shows a term's days the same way (shared/agreement-terms.ts).
const longDate = formatTermDay;

/** The homeowner's agreement: what it covers, renewing online, automatic renewal with a saved card, and joining a plan. */
@Component({
  selector: 'sw-my-plan',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatButtonModule,
    MatCardModule,
    MatCheckboxModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatRadioModule,
    MatSelectModule,
    MatSlideToggleModule,
    AgreementStatusBadge,
  ],
  templateUrl: './my-plan.html',
  styleUrl: './my-plan.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MyPlan {
  private readonly api = inject(PlansApi);
  private readonly route = inject(ActivatedRoute);
  private readonly router = inject(Router);
  private readonly fb = inject(NonNullableFormBuilder);

  protected readonly usd = formatUsd;
  protected readonly longDate = longDate;
  protected readonly features = planFeatures;
  private readonly mine = rxResource({ stream: () => this.api.mine() });
  /** "Your plan saved you $X this year", from the coverage actually given. */
  private readonly quotesApi = inject(PortalQuotesApi);
  private readonly savingsRead = rxResource({ stream: () => this.quotesApi.savings() });
  protected readonly savings = computed(() => (this.savingsRead.hasValue() && this.savingsRead.value().savingsCents > 0 ? this.savingsRead.value() : null));
  private readonly plansRead = rxResource({ stream: () => this.api.plans() });
  /** Only the first read shows as loading; a refresh after a payment keeps the page in place. */
  protected readonly loading = computed(() => this.mine.status() === 'loading');
  protected readonly agreements = linkedSignal<AgreementView[]>(() => (this.mine.hasValue() ? this.mine.value().agreements : []));
  protected readonly homes = computed<HomeChoice[]>(() => (this.mine.hasValue() ? this.mine.value().properties : []));
  protected readonly plans = computed<PlanView[]>(() => (this.plansRead.hasValue() ? this.plansRead.value().plans : []));
  protected readonly busy = signal<string | null>(null);
  protected readonly notice = signal<{ kind: 'ok' | 'info' | 'error'; text: string } | null>(null);
  protected readonly saveCardFor = signal<Record<string, boolean>>({});
  protected readonly openHomes = computed(() => this.homes().filter((h) => !h.covered));
  protected readonly current = computed(() => this.agreements().filter((a) => a.status !== 'pending'));

  protected readonly enrollForm = this.fb.group({
    propertyId: this.fb.control('', Validators.required),
    planId: this.fb.control('', Validators.required),
    systemsCount: this.fb.control(1, [Validators.required, Validators.min(1), Validators.max(20)]),
    autoRenew: this.fb.control(false),
  });
  protected readonly serverError = serverError;

  constructor() {
    const params = this.route.snapshot.queryParamMap;
    const checkout = params.get('checkout');
    const updateCard = params.get('update-card');
    void this.start(checkout, updateCard);
    // The first home without a plan is the one to enroll.
    effect(() => {
      const first = this.homes().find((p) => !p.covered);
      untracked(() => {
        if (first && !this.enrollForm.controls.propertyId.value) this.enrollForm.controls.propertyId.setValue(first.id);
      });
    });
    effect(() => {
      const e = this.mine.error();
      if (e) untracked(() => this.notice.set({ kind: 'error', text: toApiError(e).message }));
    });
  }

  private async start(checkout: string | null, updateCard: string | null) {
    if (checkout === 'canceled') {
      this.notice.set({ kind: 'info', text: 'Payment canceled. Nothing was charged and your agreement is unchanged.' });
      this.clearQuery();
    } else if (checkout?.startsWith('cs_')) {
      this.notice.set({ kind: 'info', text: 'Confirming your payment…' });
      this.api.checkoutReturn(checkout).subscribe({
        next: (r) => {
          if (r.state === 'paid') this.notice.set({ kind: 'ok', text: 'Payment received. Thank you! A receipt is on its way to your e-mail.' });
          else if (r.state === 'saved') this.notice.set({ kind: 'ok', text: 'Your card is saved for automatic renewal.' });
          else this.notice.set({ kind: 'info', text: 'The payment was not completed. Nothing was charged.' });
          this.clearQuery();
          this.reload();
        },
        error: (e: unknown) => this.notice.set({ kind: 'error', text: toApiError(e).message }),
      });
    }
    if (updateCard) {
      this.clearQuery();
      this.updateCard(updateCard);
    }
  }

  private clearQuery() {
    void this.router.navigate([], { queryParams: {}, replaceUrl: true });
  }

  private reload() {
    this.mine.reload();
  }

  protected coveredThrough(a: AgreementView) {
    return longDate(a.lastCoveredDay);
  }

  protected toggleSaveCard(id: string, on: boolean) {
    this.saveCardFor.update((m) => ({ ...m, [id]: on }));
  }

  protected renew(a: AgreementView) {
    if (this.busy()) return;
    this.busy.set(a.id);
    this.notice.set(null);
    this.api.renew(a.id, this.saveCardFor()[a.id] ?? false).subscribe({
      next: (r) => window.location.assign(r.checkoutUrl),
      error: (e: unknown) => {
        this.busy.set(null);
        this.notice.set({ kind: 'error', text: toApiError(e).message });
      },
    });
  }

  protected setAutoRenew(a: AgreementView, enabled: boolean) {
    if (this.busy()) return;
    this.busy.set(a.id);
    this.api.setAutoRenew(a.id, enabled).subscribe({
      next: (r) => {
        if (r.checkoutUrl) {
          window.location.assign(r.checkoutUrl);
          return;
        }
        this.busy.set(null);
        this.agreements.update((list) => list.map((x) => (x.id === a.id ? r.agreement : x)));
        this.notice.set({ kind: 'ok', text: enabled ? 'Automatic renewal is on.' : 'Automatic renewal is off. We will remind you before the agreement ends.' });
      },
      error: (e: unknown) => {
        this.busy.set(null);
        this.notice.set({ kind: 'error', text: toApiError(e).message });
        this.reload();
      },
    });
  }

  protected updateCard(id: string) {
    this.busy.set(id);
    this.api.updateCard(id).subscribe({
      next: (r) => window.location.assign(r.checkoutUrl),
      error: (e: unknown) => {
        this.busy.set(null);
        this.notice.set({ kind: 'error', text: toApiError(e).message });
      },
    });
  }

  protected priceFor(p: PlanView) {
    const systems = this.enrollForm.controls.systemsCount.value || 1;
    return p.yearlyPriceCents + p.additionalSystemCents * Math.max(systems - 1, 0);
  }

  protected enroll() {
    if (this.enrollForm.invalid || this.busy()) {
      this.enrollForm.markAllAsTouched();
      return;
    }
    this.busy.set('enroll');
    this.api.enroll(this.enrollForm.getRawValue()).subscribe({
      next: (r) => window.location.assign(r.checkoutUrl),
      error: (e: unknown) => {
        this.busy.set(null);
        applyServerErrors(this.enrollForm, e);
        this.notice.set({ kind: 'error', text: toApiError(e).message });
      },
    });
  }
}
