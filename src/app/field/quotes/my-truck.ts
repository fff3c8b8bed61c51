import { ChangeDetectionStrategy, Component, computed, effect, inject } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Title } from '@angular/platform-browser';
import { of, switchMap } from 'rxjs';
import { ITEM_CATEGORY_LABELS } from '../../../../shared/pricebook';
import { errorMessage } from '../../core/resource-state';
import { QuotesApi } from './quotes-api';

/** The parts on the technician's truck: how many, the minimum to carry, and what is short. */
@Component({
  selector: 'sw-my-truck',
  imports: [MatButtonModule, MatProgressBarModule],
  template: `
    <section class="sw-page truck">
      <h1>{{ title() }}</h1>
      <p class="sw-lead">What is on the truck now and what it is short of. Parts leave it as you record them on a visit.</p>
      @if (error(); as e) {
        <p role="alert" class="bad">{{ e }}</p>
        <button mat-stroked-button type="button" (click)="read.reload()">Try again</button>
      } @else if (read.hasValue()) {
        @if (read.value(); as r) {
          @if (!r.truck) {
            <p>No truck is set up for you yet. Ask the office to add your truck and what it should carry.</p>
          } @else {
            <p>{{ short() }}</p>
            <ul class="stock" aria-label="Stock on your truck">
              @for (s of r.rows; track s.itemId) {
                <li [class.low]="s.belowMinimum">
                  <div>
                    <strong>{{ s.name }}</strong><span class="detail">{{ s.sku }} · {{ labels[s.category] }}</span>
                  </div>
                  <div class="count">
                    <span>{{ s.quantity }} on hand</span><span class="detail">minimum {{ s.minimum }}{{ s.belowMinimum ? ', ' + s.shortBy + ' short' : '' }}</span>
                  </div>
                </li>
              } @empty {
                <li>Your truck carries nothing yet. The office records restocks from the shop.</li>
              }
            </ul>
          }
        }
      } @else {
        <mat-progress-bar mode="indeterminate" aria-label="Loading your truck" />
      }
    </section>
  `,
  styles: `
    .truck {
      max-width: 760px;
    }
    .stock {
      list-style: none;
      padding: 0;
      margin: 0;
    }
    .stock li {
      display: flex;
      flex-wrap: wrap;
      justify-content: space-between;
      gap: 4px 12px;
      padding: 8px 0;
      border-bottom: 1px solid var(--sw-teal-soft);
      overflow-wrap: anywhere;
    }
    .stock li.low {
      border-left: 4px solid var(--sw-watch);
      padding-left: 8px;
    }
    .count {
      text-align: right;
      font-weight: 800;
    }
    .detail {
      display: block;
      font-weight: 400;
      font-size: 0.9rem;
      color: var(--mat-sys-on-surface-variant);
    }
    .bad {
      color: var(--sw-alert);
      font-weight: 700;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MyTruck {
  private readonly api = inject(QuotesApi);
  protected readonly labels = ITEM_CATEGORY_LABELS;
  protected readonly read = rxResource({
    stream: () =>
      this.api.locations().pipe(
        switchMap((ls) => {
          const truck = ls.find((l) => l.kind === 'truck') ?? null;
          return truck ? this.api.stock({ locationId: truck.id }).pipe(switchMap((rows) => of({ truck, rows }))) : of({ truck: null, rows: [] });
        }),
      ),
  });
  protected readonly error = errorMessage(this.read);
  protected readonly title = computed(() => {
    const t = this.read.hasValue() ? this.read.value()?.truck : null;
    return t ? `My truck: ${t.name}` : 'My truck';
  });
  private readonly pageTitle = inject(Title);
  private readonly named = effect(() => this.pageTitle.setTitle(`${this.title()} · Seasonwell`));
  protected readonly short = computed(() => {
    const rows = this.read.hasValue() ? (this.read.value()?.rows ?? []) : [];
    const low = rows.filter((r) => r.belowMinimum).length;
    return low ? `${low} part${low === 1 ? ' is' : 's are'} below the minimum; the office sees them on the restock list.` : 'Everything is at or above its minimum.';
  });
}
