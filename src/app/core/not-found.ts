import { ChangeDetectionStrategy, Component } from '@angular/core';
import { RouterLink } from '@angular/router';

@Component({
  selector: 'sw-not-found',
  imports: [RouterLink],
  template: `
    <section class="sw-page">
      <h1>We could not find that page</h1>
      <p class="sw-lead">The link may be old, or the page has moved.</p>
      <a class="sw-button sw-button-filled" routerLink="/">Go to the start page</a>
    </section>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class NotFound {}
