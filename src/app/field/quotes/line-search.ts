import { ChangeDetectionStrategy, Component, inject, input, output, signal } from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { catchError, combineLatest, debounceTime, map, of, startWith, switchMap } from 'rxjs';
import { formatUsd } from '../../../../shared/money';
import { ITEM_CATEGORY_LABELS } from '../../../../shared/pricebook';
import { toApiError } from '../../core/api-errors';
import type { PickedLine } from './quote-draft';
import { QuotesApi } from './quotes-api';

interface Hit {
  id: string;
  title: string;
  detail: string;
  line: PickedLine;
}

/** Finds lines for a quote or an invoice: in the price book, its flat-rate tasks, or this truck's stock. */
@Component({
  selector: 'sw-line-search',
  imports: [ReactiveFormsModule, MatButtonModule, MatButtonToggleModule, MatFormFieldModule, MatIconModule, MatInputModule],
  template: `
    <div class="search">
      <mat-button-toggle-group [value]="where()" (change)="where.set($event.value)" [attr.aria-label]="'Search in'">
        <mat-button-toggle value="book">Price book</mat-button-toggle>
        <mat-button-toggle value="tasks">Flat-rate tasks</mat-button-toggle>
        @if (truckId()) {
          <mat-button-toggle value="truck">My truck</mat-button-toggle>
        }
      </mat-button-toggle-group>
      <mat-form-field appearance="outline" class="wide">
        <mat-label>{{ label() }}</mat-label>
        <input matInput [formControl]="query" autocomplete="off" />
        <mat-icon matSuffix svgIcon="search" aria-hidden="true" />
      </mat-form-field>
      @if (result().error; as e) {
        <p role="alert" class="bad">{{ e }}</p>
      }
      <ul class="hits" [attr.aria-label]="label() + ' results'">
        @for (h of result().hits; track h.id) {
          <li>
            <div>
              <strong>{{ h.title }}</strong>
              <div class="detail">{{ h.detail }}</div>
            </div>
            <button mat-stroked-button type="button" (click)="picked.emit(h.line)" [attr.aria-label]="'Add ' + h.title">Add</button>
          </li>
        } @empty {
          @if (!result().loading) {
            <li class="empty">
              {{ where() === 'truck' ? 'Nothing on your truck matches. Try the price book, or find a replacement below.' : 'Nothing matches. Try part of the name or the SKU.' }}
            </li>
          }
        }
      </ul>
    </div>
  `,
  styles: `
    .wide {
      width: 100%;
      margin-top: 8px;
    }
    mat-button-toggle-group {
      flex-wrap: wrap;
    }
    .hits {
      list-style: none;
      padding: 0;
      margin: 0;
      display: grid;
      gap: 6px;
    }
    .hits li {
      display: flex;
      justify-content: space-between;
      align-items: center;
      gap: 8px;
      padding: 6px 0;
      border-bottom: 1px solid var(--sw-teal-soft);
    }
    .hits button {
      min-height: 44px;
      flex: none;
    }
    .detail {
      font-size: 0.9rem;
      color: var(--mat-sys-on-surface-variant);
      overflow-wrap: anywhere;
    }
    .empty {
      color: var(--mat-sys-on-surface-variant);
    }
    .bad {
      color: var(--sw-alert);
      font-weight: 700;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LineSearch {
  private readonly api = inject(QuotesApi);
  /** This technician's truck; null hides the truck search. */
  readonly truckId = input<string | null>(null);
  readonly picked = output<PickedLine>();

  protected readonly where = signal<'book' | 'tasks' | 'truck'>('book');
  protected readonly query = new FormControl('', { nonNullable: true });
  protected readonly label = () => ({ book: 'Search the price book', tasks: 'Search flat-rate tasks', truck: 'Search your truck' })[this.where()];

  protected readonly result = toSignal(
    combineLatest([toObservable(this.where), this.query.valueChanges.pipe(startWith(''), debounceTime(250))]).pipe(
      switchMap(([where, q]) =>
        this.search(where, q.trim()).pipe(
          map((hits) => ({ hits, loading: false, error: null as string | null })),
          catchError((e: unknown) => of({ hits: [] as Hit[], loading: false, error: toApiError(e).message })),
          startWith({ hits: [] as Hit[], loading: true, error: null as string | null }),
        ),
      ),
    ),
    { initialValue: { hits: [] as Hit[], loading: true, error: null as string | null } },
  );

  private search(where: 'book' | 'tasks' | 'truck', q: string) {
    if (where === 'truck') {
      const truck = this.truckId();
      if (!truck) return of([]);
      return this.api.stock({ locationId: truck, q }).pipe(
        map((rows) =>
          rows.map((r): Hit => ({
            id: `${r.locationId}:${r.itemId}`,
            title: r.name,
            detail: `${r.sku} · ${r.quantity} on your truck`,
            line: { source: 'item', refId: r.itemId, sku: r.sku, description: r.name, quantity: 1, stockLocationId: r.locationId, from: `On your truck (${r.quantity} there)` },
          })),
        ),
      );
    }
    if (where === 'tasks') {
      return this.api.tasks().pipe(
        map((tasks) =>
          tasks
            .filter((t) => !q || `${t.sku} ${t.name}`.toLowerCase().includes(q.toLowerCase()))
            .slice(0, 20)
            .map((t): Hit => ({
              id: t.id,
              title: t.name,
              detail: `${t.sku} · ${formatUsd(t.priceCents)} · ${t.components.map((c) => c.name).join(', ')}`,
              line: { source: 'task', refId: t.id, sku: t.sku, description: t.name, quantity: 1, stockLocationId: null, from: null },
            })),
        ),
      );
    }
    return this.api.items({ q, pageSize: 20 }).pipe(
      map((page) =>
        page.items.map((i): Hit => ({
          id: i.id,
          title: i.name,
          detail: `${i.sku} · ${ITEM_CATEGORY_LABELS[i.category]} · ${formatUsd(i.unitCents)}${i.unit === 'each' ? '' : ` a ${i.unit}`}`,
          line: { source: 'item', refId: i.id, sku: i.sku, description: i.name, quantity: 1, stockLocationId: null, from: i.kind === 'part' ? 'Price book' : null },
        })),
      ),
    );
  }
}
