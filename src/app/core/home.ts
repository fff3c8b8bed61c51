import { ChangeDetectionStrategy, Component, effect, inject } from '@angular/core';
import { Router, RouterLink } from '@angular/router';
import { Session } from './session';

/** The front door: signed-in people go to their own area; others choose how to sign in. */
@Component({
  selector: 'sw-home',
  imports: [RouterLink],
  template: `
    <section class="sw-page hero">
      <h1>Heating and cooling, looked after all year</h1>
      <p class="sw-lead">Book a visit, see your equipment and its service history, and keep your maintenance plan up to date.</p>
      <div class="actions">
        <a class="sw-button sw-button-filled primary" routerLink="/sign-in">Homeowner sign-in</a>
        <a class="sw-button sw-button-outlined" routerLink="/staff/sign-in">Staff sign-in</a>
      </div>
      <aside class="emergency" role="note" aria-labelledby="emergency-title">
        <h2 id="emergency-title"><span aria-hidden="true">⚠</span> Smell gas, or a carbon monoxide alarm is sounding?</h2>
        <p>Do not book online. Leave the building now, then call your gas utility or emergency services from outside. Follow your local rules.</p>
      </aside>
    </section>
  `,
  styles: `
    .hero {
      padding-top: 48px;
    }
    .actions {
      display: flex;
      gap: 12px;
      flex-wrap: wrap;
      margin-bottom: 32px;
    }
    .primary {
      --sw-button-fill: var(--sw-ember);
      --sw-button-ink: var(--sw-on-ember);
    }
    .emergency {
      border-left: 6px solid var(--sw-alert);
      background: var(--sw-alert-soft);
      padding: 12px 16px;
      border-radius: 8px;
      max-width: 640px;
    }
    .emergency h2 {
      font-size: 1.05rem;
      margin: 0 0 4px;
      color: var(--sw-on-alert-soft);
    }
    .emergency p {
      margin: 0;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Home {
  private readonly session = inject(Session);
  private readonly router = inject(Router);

  constructor() {
    effect(() => {
      if (this.session.user()) void this.router.navigateByUrl(this.session.homePath());
    });
  }
}
