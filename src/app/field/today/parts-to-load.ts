import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type { PartToLoad } from '../../../../shared/schemas/quotes';
import { errorMessage } from '../../core/resource-state';
import { QuotesApi } from '../quotes/quotes-api';

/**
 * Before the truck leaves: the parts today's approved repairs need that the truck does not hold
 * enough of, with how many are short and where the rest is (the shop, another truck).
 */
@Component({
  selector: 'sw-parts-to-load',
  imports: [MatIconModule, RouterLink],
  template: `
    <section class="load" aria-labelledby="load-h">
      <h2 id="load-h">Parts to load</h2>
      @if (error(); as e) {
        <p role="alert" class="error">{{ e }}</p>
      } @else if (!ready()) {
        <p role="status">Checking your truck against today's repairs…</p>
      } @else if (!parts().length) {
        <p><mat-icon svgIcon="status-ok" aria-hidden="true" /> Your truck has every part today's approved repairs need.</p>
      } @else {
        <ul aria-label="Parts to load">
          @for (p of parts(); track p.itemId) {
            <li>
              <p class="part">
                <strong>{{ p.short }} × {{ p.name }}</strong>
                <span class="sku">{{ p.sku }} · need {{ p.needed }}, {{ p.onTruck }} on your truck</span>
              </p>
              <p class="where">{{ whereLabel(p) }}</p>
              <p class="for">
                For
                @for (v of p.visits; track v.visitId; let last = $last) {
                  <a [routerLink]="['/field/visits', v.visitId]">{{ v.customerName }}</a>{{ last ? '' : ', ' }}
                }
              </p>
            </li>
          }
        </ul>
      }
    </section>
  `,
  styles: `
    .load {
      margin: 20px 0 0;
      padding: 12px 16px;
      border: 2px solid var(--sw-watch);
      border-radius: var(--sw-radius);
      background: var(--sw-card);
      min-height: 96px;
    }
    h2 {
      font-size: 1.2rem;
      font-weight: 800;
      margin: 0 0 8px;
    }
    ul {
      list-style: none;
      margin: 0;
      padding: 0;
      display: grid;
      gap: 10px;
    }
    p {
      margin: 0;
    }
    .part strong {
      font-size: 1.1rem;
    }
    .sku,
    .for {
      display: block;
      color: var(--mat-sys-on-surface-variant);
    }
    .where {
      font-weight: 700;
    }
    mat-icon {
      width: 20px;
      height: 20px;
      vertical-align: middle;
    }
    a {
      min-height: 24px;
      display: inline-block;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PartsToLoad {
  private readonly api = inject(QuotesApi);
  private readonly read = rxResource({ stream: () => this.api.partsToLoad() });
  protected readonly parts = computed(() => (this.read.hasValue() ? this.read.value().parts : []));
  protected readonly ready = computed(() => this.read.hasValue());
  protected readonly error = errorMessage(this.read);

  protected whereLabel(p: PartToLoad): string {
    if (!p.elsewhere.length) return 'Not in stock anywhere: order it.';
    return `Load from ${p.elsewhere.map((e) => `${e.name} (${e.quantity})`).join(', ')}`;
  }
}
