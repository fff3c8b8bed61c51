import { ChangeDetectionStrategy, Component, computed, effect, inject, input, output, signal, untracked } from '@angular/core';
import { rxResource, toObservable, toSignal } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { catchError, debounceTime, firstValueFrom, map, of, startWith, switchMap } from 'rxjs';
import { formatUsd } from '../../../../shared/money';
import { OPTIONS_PER_QUOTE_MAX } from '../../../../shared/pricebook';
import type { FieldVisit } from '../../../../shared/schemas/field';
import { EDITABLE_QUOTE_STATUSES, QUOTE_STATUS_LABELS } from '../../../../shared/pricebook';
import type { QuoteApprove, QuoteCreate, QuoteDecline, QuoteOptionView, QuoteView } from '../../../../shared/schemas/pricebook';
import { toApiError } from '../../core/api-errors';
import { QuoteApproval } from '../../ui/quote-approval';
import { QuoteOptionTable } from '../../ui/quote-option-table';
import { LineSearch } from './line-search';
import { addLine, draftFrom, emptyOption, optionInputs, type DraftOption, type PickedLine } from './quote-draft';
import { QuotesApi } from './quotes-api';
import { ReplacementSearch } from './replacement-search';

/** The quote for the repair, built on the visit: options, lines with coverage, note, photos, send. */
@Component({
  selector: 'sw-quote-builder',
  imports: [
    ReactiveFormsModule,
    MatButtonModule,
    MatCheckboxModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatSelectModule,
    QuoteApproval,
    QuoteOptionTable,
    LineSearch,
    ReplacementSearch,
  ],
  templateUrl: './quote-builder.html',
  styleUrl: './quote-builder.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class QuoteBuilder {
  private readonly api = inject(QuotesApi);
  readonly visit = input.required<FieldVisit>();
  /** This technician's truck, for stock search and where parts come from. */
  readonly truckId = input<string | null>(null);
  readonly locked = input(false);
  /** The quote was approved here and its invoice issued: the invoice's id. */
  readonly invoiced = output<string>();

  protected readonly usd = (cents: number) => formatUsd(cents);
  protected readonly totals = (cents: number[]) => cents.map((c) => formatUsd(c)).join(' / ');
  protected readonly statusLabels = QUOTE_STATUS_LABELS;
  protected readonly maxOptions = OPTIONS_PER_QUOTE_MAX;

  private readonly existing = rxResource({
    params: () => this.visit().visit.id,
    stream: ({ params }) => this.api.quotesOf(params).pipe(switchMap((page) => (page.items[0] ? this.api.quote(page.items[0].id) : of(null)))),
  });
  /** The quote as the server last answered; null until the first save. */
  protected readonly saved = signal<QuoteView | null>(null);
  protected readonly options = signal<DraftOption[]>([emptyOption('Repair')]);
  protected readonly active = signal(0);
  protected readonly photoIds = signal<string[]>([]);
  protected readonly note = new FormControl('', { nonNullable: true });
  protected readonly email = new FormControl('', { nonNullable: true });
  protected readonly equipmentId = new FormControl<string | null>(null);
  protected readonly busy = signal<'save' | 'send' | 'revise' | null>(null);
  protected readonly message = signal<{ kind: 'ok' | 'bad'; text: string } | null>(null);
  protected readonly dirty = signal(false);

  protected readonly frozen = computed(() => {
    const q = this.saved();
    return !!q && !EDITABLE_QUOTE_STATUSES.includes(q.status);
  });
  protected readonly approved = computed(() => {
    const q = this.saved();
    if (!q?.approval) return null;
    return { ...q.approval, title: q.options.find((o) => o.id === q.approval!.optionId)?.title ?? '', invoiced: !!q.invoiceId };
  });
  protected readonly editable = computed(() => !this.frozen() && !this.locked());
  protected readonly optionTitles = computed(() => this.options().map((o, i) => o.title.trim() || `Option ${i + 1}`));
  protected readonly hasLines = computed(() => this.options().some((o) => o.lines.length));

  private readonly equipment = toSignal(this.equipmentId.valueChanges, { initialValue: null as string | null });
  private lastFigures: (QuoteOptionView | null)[] = [];
  /** The server's coverage and totals for what is on screen, worked out again as lines change. */
  protected readonly preview = toSignal(
    toObservable(computed(() => ({ options: this.options(), equipmentId: this.equipment() }))).pipe(
      debounceTime(300),
      switchMap(({ options }) => {
        const body = this.body(options);
        if (!body) return of({ figures: [] as (QuoteOptionView | null)[], error: null as string | null, loading: false });
        return this.api.preview(body).pipe(
          map((p) => {
            let n = 0;
            this.lastFigures = options.map((o) => (o.lines.length ? (p.options[n++] ?? null) : null));
            return { figures: this.lastFigures, error: null as string | null, loading: false };
          }),
          catchError((e: unknown) => of({ figures: [] as (QuoteOptionView | null)[], error: toApiError(e).message, loading: false })),
          startWith({ figures: this.lastFigures, error: null as string | null, loading: true }),
        );
      }),
    ),
    { initialValue: { figures: [] as (QuoteOptionView | null)[], error: null as string | null, loading: false } },
  );

  /** Each option's figures: the approved quote's own once frozen, else the live preview. */
  protected readonly figures = computed(() => (this.frozen() ? this.saved()!.options : this.preview().figures));

  constructor() {
    effect(() => {
      const q = this.existing.hasValue() ? this.existing.value() : null;
      if (q) untracked(() => this.load(q));
    });
    effect(() => {
      const on = this.editable();
      for (const c of [this.note, this.email, this.equipmentId]) {
        if (on) c.enable({ emitEvent: false });
        else c.disable({ emitEvent: false });
      }
    });
    effect(() => {
      const v = this.visit();
      untracked(() => {
        if (this.equipmentId.value === null && v.equipment[0]) this.equipmentId.setValue(v.equipment[0].id);
      });
    });
  }

  private load(q: QuoteView): void {
    this.saved.set(q);
    this.options.set(draftFrom(q));
    this.note.setValue(q.note);
    this.photoIds.set(q.photos.map((p) => p.id));
    if (q.equipmentId) this.equipmentId.setValue(q.equipmentId);
    this.active.set(0);
    this.dirty.set(false);
  }

  /** The lines of every option that has some, as the server takes them. */
  private body(options: DraftOption[]): QuoteCreate | null {
    const withLines = options.filter((o) => o.lines.length);
    if (!withLines.length) return null;
    return {
      visitId: this.visit().visit.id,
      equipmentId: this.equipmentId.value,
      note: this.note.value,
      photoIds: this.photoIds(),
      options: optionInputs(withLines, this.equipmentId.value),
      validDays: 30,
    };
  }

  private change(fn: (os: DraftOption[]) => DraftOption[]): void {
    this.options.update(fn);
    this.dirty.set(true);
    this.message.set(null);
  }

  protected addOption(): void {
    this.change((os) => [...os, emptyOption(os.length === 1 ? 'Replace' : `Option ${os.length + 1}`)]);
    this.active.set(this.options().length - 1);
  }

  protected removeOption(i: number): void {
    this.change((os) => os.filter((_, j) => j !== i));
    this.active.set(Math.max(0, Math.min(this.active(), this.options().length - 1)));
  }

  protected rename(i: number, field: 'title' | 'description', value: string): void {
    this.change((os) => os.map((o, j) => (j === i ? { ...o, [field]: value } : o)));
  }

  protected addTo(i: number, picked: PickedLine[]): void {
    this.change((os) => os.map((o, j) => (j === i ? picked.reduce(addLine, o) : o)));
  }

  protected setQuantity(i: number, key: string, quantity: number): void {
    if (!(quantity > 0)) return;
    this.change((os) => os.map((o, j) => (j === i ? { ...o, lines: o.lines.map((l) => (l.key === key ? { ...l, quantity } : l)) } : o)));
  }

  protected removeLine(i: number, key: string): void {
    this.change((os) => os.map((o, j) => (j === i ? { ...o, lines: o.lines.filter((l) => l.key !== key) } : o)));
  }

  protected togglePhoto(id: string, on: boolean): void {
    this.photoIds.update((ids) => (on ? [...ids, id] : ids.filter((x) => x !== id)));
    this.dirty.set(true);
  }

  /** Saves the draft: the first save creates it, later ones replace it at the revision read. */
  protected async save(): Promise<QuoteView | null> {
    const body = this.body(this.options());
    if (!body) {
      this.message.set({ kind: 'bad', text: 'Add at least one line to an option before saving.' });
      return null;
    }
    this.busy.set('save');
    try {
      const q = this.saved();
      const view = await firstValueFrom(q ? this.api.update(q.id, { ...body, revision: q.revision }) : this.api.create(body));
      this.load(view);
      this.message.set({ kind: 'ok', text: `Draft saved (revision ${view.revision}).` });
      return view;
    } catch (e) {
      const err = toApiError(e);
      this.message.set({
        kind: 'bad',
        text: err.code === 'revision_conflict' ? 'Someone changed this quote on another device. Reload the visit to see their version.' : err.message,
      });
      return null;
    } finally {
      this.busy.set(null);
    }
  }

  protected async send(): Promise<void> {
    const q = this.dirty() || !this.saved() ? await this.save() : this.saved();
    if (!q) return;
    this.busy.set('send');
    try {
      const view = await firstValueFrom(this.api.send(q.id, { revision: q.revision, email: this.email.value.trim() || null }));
      this.load(view);
      this.message.set({ kind: 'ok', text: `Quote sent to ${view.sentTo ?? 'the homeowner'}.` });
    } catch (e) {
      this.message.set({ kind: 'bad', text: toApiError(e).message });
    } finally {
      this.busy.set(null);
    }
  }

  protected async revise(): Promise<void> {
    const q = this.saved();
    if (!q) return;
    this.busy.set('revise');
    try {
      this.load(await firstValueFrom(this.api.revise(q.id, q.revision)));
      this.message.set({ kind: 'ok', text: 'A new revision is open; the approved one stays in the history.' });
    } catch (e) {
      this.message.set({ kind: 'bad', text: toApiError(e).message });
    } finally {
      this.busy.set(null);
    }
  }

  /** Approval or decline typed on this phone, in the home. */
  protected readonly decide = (kind: 'approve' | 'decline', body: Record<string, unknown>) => {
    const id = this.saved()!.id;
    return firstValueFrom(kind === 'approve' ? this.api.approve(id, body as QuoteApprove) : this.api.decline(id, body as QuoteDecline));
  };

  protected onDecided(view: QuoteView): void {
    this.load(view);
    if (view.invoiceId) this.invoiced.emit(view.invoiceId);
  }
}
