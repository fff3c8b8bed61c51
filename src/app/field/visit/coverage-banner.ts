import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { Coverage } from '../../../../shared/coverage';
import { formatUsd } from '../../../../shared/money';

/** The household's agreement as it applies to this visit. */
@Component({
  selector: 'sw-coverage-banner',
  imports: [MatIconModule],
  template: `
    <section class="banner" [class.covered]="coverage().covered" aria-labelledby="coverage-title">
      <h2 id="coverage-title">
        <mat-icon [svgIcon]="coverage().covered ? 'shield' : 'info'" aria-hidden="true" />
        {{ coverage().covered ? 'Covered' : 'Not covered' }}: {{ coverage().planName ?? 'No plan' }}
        @if (coverage().hasAgreement) {
          <span class="status">({{ coverage().statusLabel }})</span>
        }
      </h2>
      @if (coverage().term; as term) {
        <p class="term">Term {{ term.label }} · {{ coverage().coveredThrough?.label }}</p>
      }
      @if (coverage().allowances.length) {
        <dl class="facts">
          @for (a of coverage().allowances; track a.season) {
            <div>
              <dt>{{ a.season === 'cooling' ? 'Cooling' : 'Heating' }} tune-ups</dt>
              <dd>{{ a.used }} of {{ a.included }} used, {{ a.left }} left{{ a.booked ? ', ' + a.booked + ' booked' : '' }}</dd>
            </div>
          }
          <div>
            <dt>Repair discount</dt>
            <dd>{{ discount() }}</dd>
          </div>
          <div>
            <dt>Diagnostic fee</dt>
            <dd>{{ fee() }}</dd>
          </div>
        </dl>
      }
      <ul class="notes">
        @for (n of coverage().notes; track n) {
          <li>{{ n }}</li>
        }
      </ul>
    </section>
  `,
  styles: `
    .banner {
      border: 2px solid var(--sw-watch);
      background: var(--sw-watch-soft);
      border-radius: var(--sw-radius);
      padding: 12px 16px;
      margin: 0 0 16px;
    }
    .banner.covered {
      border-color: var(--sw-ok);
      background: var(--sw-ok-soft);
    }
    h2 {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 6px;
      font-size: 1.2rem;
      font-weight: 800;
      margin: 0 0 4px;
    }
    h2 mat-icon {
      width: 24px;
      height: 24px;
    }
    .status {
      font-weight: 600;
    }
    .term {
      margin: 0 0 8px;
    }
    .facts {
      display: grid;
      grid-template-columns: repeat(auto-fill, minmax(150px, 1fr));
      gap: 8px 16px;
      margin: 0 0 8px;
    }
    dt {
      font-size: 0.85rem;
      color: var(--mat-sys-on-surface-variant);
    }
    dd {
      margin: 0;
      font-weight: 800;
      font-size: 1.05rem;
    }
    .notes {
      margin: 0;
      padding-left: 20px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CoverageBanner {
  readonly coverage = input.required<Coverage>();
  protected readonly discount = computed(() => {
    const bps = this.coverage().repairDiscountBps;
    return bps ? `${bps / 100} % off repairs` : 'None';
  });
  protected readonly fee = computed(() => {
    const f = this.coverage().diagnosticFee;
    if (!f.applies) return 'Not charged on a tune-up';
    return f.waived ? `Waived (${formatUsd(f.feeCents)})` : formatUsd(f.chargeCents);
  });
}
