import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { Router } from '@angular/router';
import { toApiError } from '../api-errors';
import { AuthApi } from '../auth/auth-api';
import { Session } from '../session';
import { firstValueFrom } from 'rxjs';

const ROLE_WORDS = { homeowner: 'Homeowner', technician: 'Technician', office: 'Office', owner: 'Owner' } as const;

@Component({
  selector: 'sw-profile',
  imports: [MatButtonModule, MatIconModule],
  template: `
    <section class="sw-page profile">
      <h1>Your profile</h1>
      <p class="sw-lead">Your name, sign-in address and password.</p>
      @if (session.user(); as u) {
        <dl>
          <dt>Name</dt>
          <dd>{{ u.name }}</dd>
          <dt>E-mail</dt>
          <dd>{{ u.email }}</dd>
          <dt>Role</dt>
          <dd>{{ roleWord(u.role) }}</dd>
        </dl>
        <h2>Signed in somewhere else?</h2>
        <p>Signing out everywhere ends your sessions on every phone and computer, this one included.</p>
        @if (problem(); as p) {
          <p class="problem" role="alert"><mat-icon svgIcon="status-alert" aria-hidden="true" />{{ p }}</p>
        }
        <button mat-stroked-button type="button" (click)="everywhere()" [disabled]="busy()"><mat-icon svgIcon="logout" />Sign out everywhere</button>
      }
    </section>
  `,
  styles: `
    .profile {
      max-width: 560px;
    }
    dl {
      display: grid;
      grid-template-columns: max-content 1fr;
      gap: 4px 16px;
      margin: 0 0 24px;
    }
    dt {
      font-weight: 700;
    }
    dd {
      margin: 0;
      overflow-wrap: anywhere;
    }
    h2 {
      font-size: 1.1rem;
    }
    .problem {
      color: var(--sw-alert);
      display: flex;
      gap: 8px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Profile {
  protected readonly session = inject(Session);
  private readonly api = inject(AuthApi);
  private readonly router = inject(Router);
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected roleWord = (r: keyof typeof ROLE_WORDS) => ROLE_WORDS[r];

  protected async everywhere(): Promise<void> {
    this.busy.set(true);
    try {
      await firstValueFrom(this.api.signOutEverywhere());
      await this.router.navigateByUrl('/');
    } catch (err) {
      this.problem.set(toApiError(err).message);
    } finally {
      this.busy.set(false);
    }
  }
}
