import { ChangeDetectionStrategy, Component, input } from '@angular/core';

/** The Seasonwell mark: a warm arc over a cool arc, the two seasons a plan looks after. */
@Component({
  selector: 'sw-logo',
  template: `
    <svg [attr.width]="size()" [attr.height]="size()" viewBox="0 0 64 64" role="img" aria-label="Seasonwell">
      <rect width="64" height="64" rx="16" fill="#1d4e5f" />
      <path d="M14 30a18 18 0 0 1 36 0" fill="none" stroke="#f0a04b" stroke-width="7" stroke-linecap="round" />
      <path d="M50 34a18 18 0 0 1-36 0" fill="none" stroke="#9fd6dc" stroke-width="7" stroke-linecap="round" />
      <circle cx="32" cy="32" r="4.5" fill="#fff" />
    </svg>
  `,
  styles: ':host { display: inline-flex; }',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Logo {
  readonly size = input(32);
}
