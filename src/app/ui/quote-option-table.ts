import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { formatUsd } from '../../../shared/money';
import type { QuoteOptionView } from '../../../shared/schemas/pricebook';

/** One option's lines with the plan's coverage written out on each, and its totals. */
@Component({
  selector: 'sw-quote-option-table',
  template: `
    <table class="coverage">
      <caption>
        {{
          caption()
        }}
      </caption>
      <thead class="sw-visually-hidden">
        <tr>
          <th scope="col">Line</th>
          <th scope="col">Amount</th>
        </tr>
      </thead>
      <tbody>
        @for (l of option().lines; track l.id) {
          <tr>
            <td>
              {{ l.description }}
              @if (l.quantity !== 1) {
                × {{ l.quantity }}
              }
              <br /><small>{{ l.reason }}</small>
            </td>
            <td class="num">
              @if (l.savingsCents) {
                <s [attr.aria-label]="'was ' + usd(l.grossCents)">{{ usd(l.grossCents) }}</s><br />
              }
              {{ usd(l.chargedCents) }}
            </td>
          </tr>
        }
      </tbody>
      <tfoot>
        <tr>
          <th scope="row">Subtotal</th>
          <td class="num">{{ usd(option().subtotalCents) }}</td>
        </tr>
        <tr>
          <th scope="row">Plan savings</th>
          <td class="num">−{{ usd(option().savingsCents) }}</td>
        </tr>
        <tr>
          <th scope="row">Sales tax</th>
          <td class="num">{{ usd(option().taxCents) }}</td>
        </tr>
        <tr class="total">
          <th scope="row">Total</th>
          <td class="num">{{ usd(option().totalCents) }}</td>
        </tr>
      </tfoot>
    </table>
  `,
  styles: `
    :host {
      display: block;
    }
    .coverage {
      width: 100%;
      border-collapse: collapse;
      margin: 8px 0;
    }
    caption {
      text-align: left;
      font-weight: 800;
      padding: 4px 0;
    }
    td,
    th {
      padding: 6px 4px;
      border-bottom: 1px solid var(--sw-teal-soft);
      text-align: left;
      vertical-align: top;
      overflow-wrap: anywhere;
    }
    small {
      color: var(--mat-sys-on-surface-variant);
    }
    .num {
      text-align: right;
      white-space: nowrap;
    }
    .total th,
    .total td {
      font-weight: 800;
      font-size: 1.1rem;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class QuoteOptionTable {
  readonly option = input.required<Pick<QuoteOptionView, 'lines' | 'subtotalCents' | 'savingsCents' | 'taxCents' | 'totalCents'>>();
  readonly caption = input('Coverage, line by line');
  protected readonly usd = (c: number) => formatUsd(c);
}
