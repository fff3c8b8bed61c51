import { ChangeDetectionStrategy, Component, computed, effect, inject, signal, untracked } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar, MatSnackBarModule } from '@angular/material/snack-bar';
import { MatTableModule } from '@angular/material/table';
import { formatUsd } from '../../../../shared/money';
import { RENEWAL_VIEWS, RENEWAL_VIEW_LABELS } from '../../../../shared/renewal-views';
import type { RenewalBoard, RenewalRow, RenewalView } from '../../../../shared/schemas/plans';
import { toApiError } from '../../core/api-errors';
import { applyServerErrors, serverError } from '../../core/form-errors';
import { localCopy } from '../../core/resource-state';
import { urlFilters } from '../../core/url-filters';
import { AgreementStatusBadge } from '../../ui/status/agreement-status';
import { RenewalsApi } from './renewals-api';
import { DayPipe } from '../../ui/dates';
import { formatTermDay, termLastDay } from '../../../../shared/agreement-terms';

/** Renewals: who is due in 30/60/90 days, past due, lapsed or just renewed, with totals, CSV and notices. */
@Component({
  selector: 'sw-renewals',
  imports: [
    DayPipe,
    ReactiveFormsModule,
    MatButtonModule,
    MatCheckboxModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatSelectModule,
    MatSnackBarModule,
    MatTableModule,
    AgreementStatusBadge,
  ],
  templateUrl: './renewals.html',
  styleUrl: './renewals.scss',
  host: { class: 'sw-dense' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Renewals {
  /** The term's last covered day, written as every screen writes it (the row holds the exclusive end). */
  protected lastDay = (endsOn: string) => formatTermDay(termLastDay({ startsOn: endsOn, endsOn }));
  private readonly api = inject(RenewalsApi);
  private readonly snack = inject(MatSnackBar);
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly usd = formatUsd;
  protected readonly views = RENEWAL_VIEWS.map((v) => ({ v, label: RENEWAL_VIEW_LABELS[v] }));
  protected readonly columns = ['select', 'customer', 'plan', 'status', 'ends', 'price', 'auto', 'notice', 'actions'];
  private readonly url = urlFilters();
  protected readonly view = signal<RenewalView>(asView(this.url.read('view')));
  private readonly read = rxResource({ params: () => this.view(), stream: ({ params }) => this.api.board(params) });
  protected readonly board = localCopy<RenewalBoard>(this.read, true);
  protected readonly loading = this.read.isLoading;
  protected readonly selected = signal<ReadonlySet<string>>(new Set());
  protected readonly sending = signal(false);
  protected readonly renewing = signal<RenewalRow | null>(null);
  protected readonly serverError = serverError;
  protected readonly rows = computed(() => this.board()?.rows ?? []);
  protected readonly allSelected = computed(() => this.rows().length > 0 && this.rows().every((r) => this.selected().has(r.agreementId)));
  protected readonly csvHref = computed(() => this.api.csvUrl(this.view()));
  protected readonly manualForm = this.fb.group({ method: this.fb.control<'check' | 'cash'>('check', Validators.required), reference: this.fb.control('') });

  constructor() {
    this.url.keep(() => ({ view: this.view() }));
    effect(() => {
      const e = this.read.error();
      if (e) untracked(() => this.snack.open(toApiError(e).message, 'Close'));
    });
  }

  protected load(view: RenewalView) {
    this.selected.set(new Set());
    if (view === this.view()) this.read.reload();
    else this.view.set(view);
  }

  protected toggle(id: string, on: boolean) {
    const next = new Set(this.selected());
    if (on) next.add(id);
    else next.delete(id);
    this.selected.set(next);
  }

  protected toggleAll(on: boolean) {
    this.selected.set(on ? new Set(this.rows().map((r) => r.agreementId)) : new Set());
  }

  protected send(ids: string[]) {
    if (!ids.length || this.sending()) return;
    this.sending.set(true);
    this.api.sendNotices(ids).subscribe({
      next: (r) => {
        this.sending.set(false);
        this.snack.open(`${r.queued} renewal notice${r.queued === 1 ? '' : 's'} queued.`, 'Close', { duration: 4000 });
        this.load(this.view());
      },
      error: (e: unknown) => {
        this.sending.set(false);
        this.snack.open(toApiError(e).message, 'Close');
      },
    });
  }

  protected sendSelected() {
    this.send([...this.selected()]);
  }

  protected startManual(row: RenewalRow) {
    this.renewing.set(row);
    this.manualForm.reset({ method: 'check', reference: '' });
  }

  protected recordManual() {
    const row = this.renewing();
    if (!row || this.manualForm.invalid || this.sending()) return;
    this.sending.set(true);
    const { method, reference } = this.manualForm.getRawValue();
    this.api.manualRenewal(row.agreementId, method, reference).subscribe({
      next: (r) => {
        this.sending.set(false);
        this.renewing.set(null);
        this.snack.open(`${row.customerName} renewed through ${r.agreement.lastCoveredDay}. Invoice ${r.invoice.number} paid.`, 'Close', { duration: 5000 });
        this.load(this.view());
      },
      error: (e: unknown) => {
        this.sending.set(false);
        applyServerErrors(this.manualForm, e);
        this.snack.open(toApiError(e).message, 'Close');
      },
    });
  }
}

const asView = (v: string | null): RenewalView => ((RENEWAL_VIEWS as readonly string[]).includes(v ?? '') ? (v as RenewalView) : 'due30');
