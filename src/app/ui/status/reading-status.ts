import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { ReadingStatus } from '../../../../shared/schemas/field';

const WORDS: Record<ReadingStatus, string> = { ok: 'In range', watch: 'Check', alert: 'Out of range' };

/** A reading's status as an icon and a word, never colour alone. */
@Component({
  selector: 'sw-reading-status',
  imports: [MatIconModule],
  template: `<mat-icon [svgIcon]="'status-' + status()" aria-hidden="true" /><span>{{ word() }}</span>`,
  styles: `
    :host {
      display: inline-flex;
      align-items: center;
      gap: 4px;
      font-weight: 700;
      white-space: nowrap;
    }
    :host(.ok) {
      color: var(--sw-ok);
    }
    :host(.watch) {
      color: var(--sw-watch);
    }
    :host(.alert) {
      color: var(--sw-alert);
    }
    mat-icon {
      width: 20px;
      height: 20px;
    }
  `,
  host: { '[class]': 'status()' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReadingStatusMark {
  readonly status = input.required<ReadingStatus>();
  readonly label = input<string>();
  protected readonly word = computed(() => this.label() ?? WORDS[this.status()]);
}
