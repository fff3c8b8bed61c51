import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { MatTableModule } from '@angular/material/table';
import { firstValueFrom } from 'rxjs';
import type { StockRow } from '../../../../shared/schemas/pricebook';
import { applyServerErrors, serverError } from '../../core/form-errors';
import { errorMessage } from '../../core/resource-state';
import { OfficeQuotesApi } from '../quotes/office-quotes-api';

const ALIASES = { 'lines.0.itemId': 'itemId', 'lines.0.quantity': 'quantity', lines: 'itemId' };

/** What each truck and the shop carry, the parts below their minimum, and recording restocks and transfers. */
@Component({
  selector: 'sw-restock-list',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatInputModule, MatProgressBarModule, MatSelectModule, MatSlideToggleModule, MatTableModule],
  templateUrl: './restock-list.html',
  styles: `
    :host {
      display: block;
      padding: 16px;
    }
    .progress {
      height: 4px;
    }
    .table-wrap {
      overflow: auto;
      height: calc(var(--mat-table-header-container-height, 56px) + 12 * var(--mat-table-row-item-container-height, 52px));
    }
    // Fixed columns: the header keeps its place when the rows arrive.
    table {
      width: 100%;
      min-width: 720px;
      table-layout: fixed;
    }
    .mat-column-location {
      width: 10%;
    }
    .mat-column-sku {
      width: 19%;
    }
    .mat-column-quantity,
    .mat-column-minimum,
    .mat-column-shortBy {
      width: 9%;
    }
    .mat-column-act {
      width: 11%;
    }
    .num {
      text-align: right;
    }
    .filters,
    .row {
      display: flex;
      flex-wrap: wrap;
      gap: 0 12px;
      align-items: center;
    }
    form {
      border: 1px solid var(--sw-teal-soft);
      border-radius: var(--sw-radius);
      padding: 8px 12px;
      margin: 12px 0;
    }
    h2 {
      font-size: 1.15rem;
      font-weight: 800;
    }
    .ok {
      color: var(--sw-ok);
      font-weight: 700;
    }
    .bad {
      color: var(--sw-alert);
      font-weight: 700;
    }
  `,
  host: { class: 'sw-dense' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RestockList {
  private readonly api = inject(OfficeQuotesApi);
  protected readonly columns = ['location', 'sku', 'name', 'quantity', 'minimum', 'shortBy', 'act'];
  protected readonly locationId = signal('');
  protected readonly belowOnly = signal(true);
  protected readonly locations = rxResource({ stream: () => this.api.locations() });
  protected readonly list = rxResource({
    params: () => ({ locationId: this.locationId() || undefined, belowMinimum: this.belowOnly() }),
    stream: ({ params }) => this.api.stock(params),
  });
  private readonly everything = rxResource({ stream: () => this.api.stock({}) });
  protected readonly rows = computed(() => (this.list.hasValue() ? this.list.value() : []));
  protected readonly places = computed(() => (this.locations.hasValue() ? this.locations.value() : []));
  /** Each part carried anywhere, once, for the forms. */
  protected readonly parts = computed(() => {
    const all = this.everything.hasValue() ? this.everything.value() : [];
    return [...new Map(all.map((r) => [r.itemId, r])).values()].sort((a, b) => a.sku.localeCompare(b.sku));
  });
  protected readonly error = errorMessage(this.list);
  protected readonly message = signal<{ kind: 'ok' | 'bad'; text: string } | null>(null);
  protected readonly busy = signal(false);
  protected readonly err = (form: FormGroup, name: string) => serverError(form.get(name));

  protected readonly restock = new FormGroup({
    locationId: new FormControl('', { nonNullable: true }),
    itemId: new FormControl('', { nonNullable: true }),
    quantity: new FormControl('1', { nonNullable: true }),
    note: new FormControl('', { nonNullable: true }),
  });
  protected readonly transfer = new FormGroup({
    fromLocationId: new FormControl('', { nonNullable: true }),
    toLocationId: new FormControl('', { nonNullable: true }),
    itemId: new FormControl('', { nonNullable: true }),
    quantity: new FormControl('1', { nonNullable: true }),
    note: new FormControl('', { nonNullable: true }),
  });

  protected fill(r: StockRow): void {
    this.restock.setValue({ locationId: r.locationId, itemId: r.itemId, quantity: String(r.shortBy || 1), note: '' });
    document.getElementById('restock-form')?.scrollIntoView({ block: 'center' });
  }

  protected async saveRestock(): Promise<void> {
    const v = this.restock.getRawValue();
    await this.run(
      this.restock,
      () => firstValueFrom(this.api.restock({ locationId: v.locationId, note: v.note, lines: [{ itemId: v.itemId, quantity: Number(v.quantity) }] })),
      'Restock recorded.',
    );
  }

  protected async saveTransfer(): Promise<void> {
    const v = this.transfer.getRawValue();
    await this.run(
      this.transfer,
      () =>
        firstValueFrom(
          this.api.transfer({ fromLocationId: v.fromLocationId, toLocationId: v.toLocationId, note: v.note, lines: [{ itemId: v.itemId, quantity: Number(v.quantity) }] }),
        ),
      'Transfer recorded.',
    );
  }

  private async run(form: FormGroup, call: () => Promise<unknown>, done: string): Promise<void> {
    this.busy.set(true);
    this.message.set(null);
    try {
      await call();
      this.message.set({ kind: 'ok', text: done });
      form.patchValue({ quantity: '1', note: '' });
      this.list.reload();
      this.everything.reload();
    } catch (e) {
      const text = applyServerErrors(form, e, ALIASES);
      this.message.set({ kind: 'bad', text: text ?? 'Check the values marked below.' });
    } finally {
      this.busy.set(false);
    }
  }
}
