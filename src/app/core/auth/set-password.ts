import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { Router, RouterLink } from '@angular/router';
import { AuthApi } from './auth-api';
import { applyServerErrors, messageFor } from '../form-errors';
import { homeFor } from './return-url';
import { firstValueFrom } from 'rxjs';

/** From an invitation or a reset e-mail: choose a password (12+ characters, not a common one). */
@Component({
  selector: 'sw-set-password',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatInputModule, MatIconModule, RouterLink],
  template: `
    <section class="card">
      <h1>Choose your password</h1>
      <p>Use at least 12 characters. A few unrelated words are easy to remember and hard to guess.</p>
      <form [formGroup]="form" (ngSubmit)="submit()" novalidate>
        <mat-form-field appearance="outline">
          <mat-label>New password</mat-label>
          <input matInput formControlName="password" type="password" autocomplete="new-password" />
          @if (form.controls.password.invalid) {
            <mat-error>{{ error('password') }}</mat-error>
          }
        </mat-form-field>
        @if (problem(); as p) {
          <p class="problem" role="alert">
            <mat-icon svgIcon="status-alert" aria-hidden="true" /><span>{{ p }}</span>
          </p>
          <p><a routerLink="/forgot-password">Ask for a new link</a></p>
        }
        <div class="row"><button mat-flat-button type="submit" [disabled]="busy() || !token()">Save password and sign in</button></div>
      </form>
    </section>
  `,
  styleUrl: './auth-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SetPassword {
  private readonly api = inject(AuthApi);
  private readonly router = inject(Router);
  readonly token = input<string | undefined>();
  protected readonly form = inject(NonNullableFormBuilder).group({ password: ['', [Validators.required, Validators.minLength(12)]] });
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);

  protected error(field: 'password'): string {
    return messageFor(this.form, field, { required: 'Choose a password.', minlength: 'Use at least 12 characters.' });
  }

  protected async submit(): Promise<void> {
    this.problem.set(null);
    const token = this.token();
    if (this.form.invalid || !token) return this.form.markAllAsTouched();
    this.busy.set(true);
    try {
      const user = await firstValueFrom(this.api.setPassword(token, this.form.controls.password.value));
      await this.router.navigateByUrl(homeFor(user.role), { replaceUrl: true });
    } catch (err) {
      this.problem.set(applyServerErrors(this.form, err));
    } finally {
      this.busy.set(false);
    }
  }
}
