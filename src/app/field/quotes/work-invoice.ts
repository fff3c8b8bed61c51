import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { catchError, debounceTime, firstValueFrom, map, of, switchMap } from 'rxjs';
import { formatUsd } from '../../../../shared/money';
import type { InvoiceView } from '../../../../shared/schemas/billing';
import type { FieldVisit } from '../../../../shared/schemas/field';
import type { DirectInvoice, QuoteOptionView } from '../../../../shared/schemas/pricebook';
import { toApiError } from '../../core/api-errors';
import { QuoteOptionTable } from '../../ui/quote-option-table';
import { LineSearch } from './line-search';
import { addLine, emptyOption, optionInputs, type DraftOption, type PickedLine } from './quote-draft';
import { QuotesApi } from './quotes-api';

/** Invoicing work done without a quote, such as a diagnostic fee or a small repair, from price-book lines. */
@Component({
  selector: 'sw-work-invoice',
  imports: [MatButtonModule, MatIconModule, LineSearch, QuoteOptionTable],
  template: `
    <details class="block option" [open]="open()" (toggle)="open.set($any($event.target).open)">
      <summary><h2>Invoice work without a quote</h2></summary>
      @if (issued(); as inv) {
        <p role="status" class="ok">
          Invoice {{ inv.number }} issued for {{ usd(inv.totalCents) }}. The homeowner has the pay-online link by e-mail and in their portal, or can pay now on this device below.
        </p>
      } @else {
        <ul class="lines" aria-label="Invoice lines">
          @for (l of draft().lines; track l.key) {
            <li>
              <div class="what">
                <strong>{{ l.description }}</strong><span class="detail">{{ l.sku }} × {{ l.quantity }}</span>
              </div>
              <button mat-icon-button type="button" (click)="remove(l.key)" [attr.aria-label]="'Remove ' + l.description"><mat-icon svgIcon="close" aria-hidden="true" /></button>
            </li>
          } @empty {
            <li class="empty">No lines yet. Add the diagnostic fee or the repair from the price book.</li>
          }
        </ul>
        @if (preview(); as f) {
          @if (f.option; as o) {
            <sw-quote-option-table [option]="o" />
          }
          @if (f.error; as e) {
            <p role="alert" class="bad">{{ e }}</p>
          }
        }
        <sw-line-search [truckId]="truckId()" (picked)="add($event)" />
        <div class="actions">
          <button mat-flat-button type="button" class="big" (click)="issue()" [disabled]="busy() || !draft().lines.length">Issue the invoice</button>
        </div>
        @if (error(); as e) {
          <p role="alert" class="bad">{{ e }}</p>
        }
      }
    </details>
  `,
  styleUrl: './quote-builder.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class WorkInvoice {
  private readonly api = inject(QuotesApi);
  readonly visit = input.required<FieldVisit>();
  readonly truckId = input<string | null>(null);
  /** An invoice was issued for this visit. */
  readonly invoiced = output<InvoiceView>();

  protected readonly usd = (cents: number) => formatUsd(cents);
  protected readonly open = signal(false);
  protected readonly draft = signal<DraftOption>(emptyOption('Invoice'));
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly issued = signal<InvoiceView | null>(null);

  private readonly body = computed((): DirectInvoice | null => {
    const d = this.draft();
    if (!d.lines.length) return null;
    const v = this.visit();
    const equipmentId = v.equipment[0]?.id ?? null;
    return { customerId: v.customer.id, visitId: v.visit.id, equipmentId, lines: optionInputs([d], equipmentId)[0]!.lines, notes: '', sendPayLink: true };
  });

  protected readonly preview = toSignal(
    toObservable(this.body).pipe(
      debounceTime(300),
      switchMap((b) =>
        b
          ? this.api.previewInvoice(b).pipe(
              map((option) => ({ option: option as QuoteOptionView | null, error: null as string | null })),
              catchError((e: unknown) => of({ option: null, error: toApiError(e).message })),
            )
          : of(null),
      ),
    ),
    { initialValue: null },
  );

  protected add(line: PickedLine): void {
    this.draft.update((d) => addLine(d, line));
  }

  protected remove(key: string): void {
    this.draft.update((d) => ({ ...d, lines: d.lines.filter((l) => l.key !== key) }));
  }

  protected async issue(): Promise<void> {
    const b = this.body();
    if (!b) return;
    this.busy.set(true);
    this.error.set(null);
    try {
      const inv = await firstValueFrom(this.api.invoice(b));
      this.issued.set(inv);
      this.invoiced.emit(inv);
    } catch (e) {
      this.error.set(toApiError(e).message);
    } finally {
      this.busy.set(false);
    }
  }
}
