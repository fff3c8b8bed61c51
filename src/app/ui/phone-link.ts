import { ChangeDetectionStrategy, Component, PendingTasks, computed, inject, input, signal } from '@angular/core';
import { Session } from '../core/session';

type PhoneFormats = typeof import('../../../shared/phone');

// libphonenumber-js and its metadata for every country (about 28 kB gzip) load in a chunk of their
// own, requested as soon as a page with phone numbers is evaluated: beside the page's data request,
// not before the page itself. Until they are here a number reads as stored (E.164), already a link.
const formats = signal<PhoneFormats | null>(null);
let loading: Promise<void> | null = null;
function loadFormats(): Promise<void> {
  loading ??= import('../../../shared/phone').then((m) => formats.set(m));
  return loading;
}
// Evaluated with the first page that shows numbers, before that page asks for its data.
void loadFormats();

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
  protected readonly text = computed(() => formats()?.formatPhone(this.number(), this.session.country()) ?? this.number());
  protected readonly href = computed(() => {
    const f = formats();
    if (f) return f.phoneHref(this.number(), this.session.country());
    return /^\+\d{7,15}$/.test(this.number()) ? `tel:${this.number()}` : null;
  });

  constructor() {
    // The app is not stable (tests, whenStable) until the formats are in.
    if (!formats()) void loadFormats().finally(inject(PendingTasks).add());
  }
}
