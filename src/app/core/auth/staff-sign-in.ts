import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { Router, RouterLink } from '@angular/router';
import { AuthApi } from './auth-api';
import { applyServerErrors, messageFor } from '../form-errors';
import { afterSignIn } from './return-url';
import { firstValueFrom } from 'rxjs';

@Component({
  selector: 'sw-staff-sign-in',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatInputModule, MatIconModule, RouterLink],
  template: `
    <section class="card">
      <h1>Staff sign-in</h1>
      <p class="sw-lead">For the office, technicians and the owner.</p>
      <form [formGroup]="form" (ngSubmit)="submit()" novalidate>
        <mat-form-field appearance="outline">
          <mat-label>E-mail address</mat-label>
          <input matInput formControlName="email" type="email" autocomplete="username" />
          @if (form.controls.email.invalid) {
            <mat-error>{{ error('email') }}</mat-error>
          }
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>Password</mat-label>
          <input matInput formControlName="password" type="password" autocomplete="current-password" />
          @if (form.controls.password.invalid) {
            <mat-error>{{ error('password') }}</mat-error>
          }
        </mat-form-field>
        @if (problem(); as p) {
          <p class="problem" role="alert">
            <mat-icon svgIcon="status-alert" aria-hidden="true" /><span>{{ p }}</span>
          </p>
        }
        <div class="row">
          <button mat-flat-button type="submit" [disabled]="busy()">Sign in</button>
          <a mat-button routerLink="/forgot-password">Forgot password?</a>
        </div>
      </form>
      <p><a routerLink="/sign-in">Homeowner? Sign in with an e-mailed link</a></p>
    </section>
  `,
  styleUrl: './auth-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StaffSignIn {
  private readonly api = inject(AuthApi);
  private readonly router = inject(Router);
  readonly returnUrl = input<string | undefined>();
  protected readonly form = inject(NonNullableFormBuilder).group({
    email: ['', [Validators.required, Validators.email]],
    password: ['', [Validators.required]],
  });
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);

  protected error(field: 'email' | 'password'): string {
    return messageFor(this.form, field, { required: field === 'email' ? 'Enter your e-mail address.' : 'Enter your password.', email: 'Enter a valid e-mail address.' });
  }

  protected async submit(): Promise<void> {
    this.problem.set(null);
    if (this.form.invalid) return this.form.markAllAsTouched();
    this.busy.set(true);
    try {
      const { email, password } = this.form.getRawValue();
      const user = await firstValueFrom(this.api.staffSignIn(email.trim(), password));
      await this.router.navigateByUrl(afterSignIn(user.role, this.returnUrl()));
    } catch (err) {
      this.problem.set(applyServerErrors(this.form, err));
    } finally {
      this.busy.set(false);
    }
  }
}
