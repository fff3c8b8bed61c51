import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { Caution } from '../../../../shared/hvac';

/** A safety caution beside the work it applies to. */
@Component({
  selector: 'sw-caution-note',
  imports: [MatIconModule],
  template: `
    <aside class="caution" role="note" [attr.aria-label]="'Safety: ' + caution().title">
      <mat-icon svgIcon="warning" aria-hidden="true" />
      <div>
        <strong>{{ caution().title }}.</strong> {{ caution().text }}
      </div>
    </aside>
  `,
  styles: `
    .caution {
      display: flex;
      gap: 8px;
      align-items: flex-start;
      background: var(--sw-ember-soft);
      border-left: 6px solid var(--sw-ember);
      padding: 8px 12px;
      border-radius: 8px;
      margin: 4px 0 12px;
      font-size: 0.95rem;
    }
    mat-icon {
      flex: none;
      width: 22px;
      height: 22px;
      color: var(--sw-on-ember-soft);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CautionNote {
  readonly caution = input.required<Caution>();
}
