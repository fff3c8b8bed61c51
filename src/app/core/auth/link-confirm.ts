import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { Router, RouterLink } from '@angular/router';
import { toApiError } from '../api-errors';
import { AuthApi } from './auth-api';
import { afterSignIn } from './return-url';
import { firstValueFrom } from 'rxjs';

/**
 * The page the e-mailed link opens. It asks for one click, so mail scanners that fetch links
 * ahead of the homeowner do not use the link up.
 */
@Component({
  selector: 'sw-link-confirm',
  imports: [MatButtonModule, MatIconModule, RouterLink],
  template: `
    <section class="card">
      <h1>Sign in</h1>
      <p class="sw-lead">Confirm the sign-in link from your e-mail.</p>
      @if (!token()) {
        <p class="problem" role="alert"><mat-icon svgIcon="status-alert" aria-hidden="true" /><span>This link is not complete. Please open it again from the e-mail.</span></p>
      } @else {
        <p>Press the button to finish signing in on this device.</p>
        @if (problem(); as p) {
          <p class="problem" role="alert">
            <mat-icon svgIcon="status-alert" aria-hidden="true" /><span>{{ p }}</span>
          </p>
        }
        <div class="row">
          <button mat-flat-button type="button" (click)="confirm()" [disabled]="busy()">Sign me in</button>
        </div>
      }
      @if (problem() || !token()) {
        <div class="row"><a mat-stroked-button routerLink="/sign-in">Ask for a new link</a></div>
      }
    </section>
  `,
  styleUrl: './auth-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LinkConfirm {
  private readonly api = inject(AuthApi);
  private readonly router = inject(Router);
  readonly token = input<string | undefined>();
  readonly returnUrl = input<string | undefined>();
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);

  protected async confirm(): Promise<void> {
    const token = this.token();
    if (!token) return;
    this.busy.set(true);
    this.problem.set(null);
    try {
      const user = await firstValueFrom(this.api.confirmLink(token));
      sessionStorage.removeItem('sw.returnUrl');
      await this.router.navigateByUrl(afterSignIn(user.role, this.returnUrl() ?? sessionStorage.getItem('sw.returnUrl')), { replaceUrl: true });
    } catch (err) {
      this.problem.set(toApiError(err).message);
    } finally {
      this.busy.set(false);
    }
  }
}
