import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';

/** A state as an icon and a word, never colour alone; the status components choose both. */
@Component({
  selector: 'sw-status-badge',
  imports: [MatIconModule],
  template: `<span class="status"><mat-icon [svgIcon]="icon()" aria-hidden="true" />{{ label() }}</span>`,
  styles: `
    .status {
      display: inline-flex;
      gap: 4px;
      align-items: center;
      font-weight: 700;
    }
    mat-icon {
      width: 18px;
      height: 18px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StatusBadge {
  readonly icon = input.required<string>();
  readonly label = input.required<string>();
}
