import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { formatPhone, phoneHref } from '../../../shared/phone';
import { Session } from '../core/session';

/** A phone number as a tap-to-call link, written in the company's national format. */
@Component({
  selector: 'sw-phone-link',
  template: `@if (href(); as h) {
      <a [href]="h" [class]="linkClass()"><ng-content />{{ prefix() }}{{ text() }}</a>
    } @else {
      {{ number() }}
    }`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PhoneLink {
  private readonly session = inject(Session);
  /** The stored number, E.164. */
  readonly number = input.required<string>();
  /** Words before the number inside the link, such as "Call ". */
  readonly prefix = input('');
  readonly linkClass = input('');
  protected readonly text = computed(() => formatPhone(this.number(), this.session.country()));
  protected readonly href = computed(() => phoneHref(this.number(), this.session.country()));
}
