import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { VISIT_STATUS_LABELS, type VisitStatus } from '../../../../shared/visits';

const ICONS: Record<VisitStatus, string> = {
  requested: 'bell',
  scheduled: 'calendar',
  on_the_way: 'truck',
  on_site: 'wrench',
  done: 'status-ok',
  canceled: 'close',
  no_show: 'status-watch',
};

/** A visit status as an icon and a word, never colour alone. */
@Component({
  selector: 'sw-visit-status',
  imports: [MatIconModule],
  template: `<span class="status" [class]="'status s-' + status()"><mat-icon [svgIcon]="icon()" aria-hidden="true" />{{ label() }}</span>`,
  styles: `
    .status {
      display: inline-flex;
      align-items: center;
      gap: 4px;
      font-size: 0.8125rem;
      font-weight: 600;
    }
    mat-icon {
      width: 16px;
      height: 16px;
    }
    .s-canceled,
    .s-no_show {
      color: var(--mat-sys-error);
    }
    .s-done {
      color: var(--mat-sys-primary);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class VisitStatusMark {
  readonly status = input.required<VisitStatus>();
  protected readonly icon = computed(() => ICONS[this.status()]);
  protected readonly label = computed(() => VISIT_STATUS_LABELS[this.status()]);
}
