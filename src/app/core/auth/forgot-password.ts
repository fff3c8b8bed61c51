import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { AuthApi } from './auth-api';
import { applyServerErrors, messageFor } from '../form-errors';
import { firstValueFrom } from 'rxjs';

@Component({
  selector: 'sw-forgot-password',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatInputModule, MatIconModule, RouterLink],
  template: `
    <section class="card">
      <h1>Forgot your password?</h1>
      <p class="sw-lead">We e-mail staff a link to choose a new password.</p>
      @if (message(); as m) {
        <p class="notice" role="status">
          <mat-icon svgIcon="mail" aria-hidden="true" /><span>{{ m }}</span>
        </p>
        <p><a routerLink="/staff/sign-in">Back to staff sign-in</a></p>
      } @else {
        <p>Enter your staff e-mail address and we will send you a link to set a new one.</p>
        <form [formGroup]="form" (ngSubmit)="submit()" novalidate>
          <mat-form-field appearance="outline">
            <mat-label>E-mail address</mat-label>
            <input matInput formControlName="email" type="email" autocomplete="username" />
            @if (form.controls.email.invalid) {
              <mat-error>{{ error() }}</mat-error>
            }
          </mat-form-field>
          @if (problem(); as p) {
            <p class="problem" role="alert">
              <mat-icon svgIcon="status-alert" aria-hidden="true" /><span>{{ p }}</span>
            </p>
          }
          <div class="row"><button mat-flat-button type="submit" [disabled]="busy()">Send the link</button></div>
        </form>
      }
    </section>
  `,
  styleUrl: './auth-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ForgotPassword {
  private readonly api = inject(AuthApi);
  protected readonly form = inject(NonNullableFormBuilder).group({ email: ['', [Validators.required, Validators.email]] });
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly message = signal<string | null>(null);

  protected error(): string {
    return messageFor(this.form, 'email', { required: 'Enter your e-mail address.', email: 'Enter a valid e-mail address.' });
  }

  protected async submit(): Promise<void> {
    this.problem.set(null);
    if (this.form.invalid) return this.form.markAllAsTouched();
    this.busy.set(true);
    try {
      this.message.set((await firstValueFrom(this.api.forgotPassword(this.form.controls.email.value.trim()))).message);
    } catch (err) {
      this.problem.set(applyServerErrors(this.form, err));
    } finally {
      this.busy.set(false);
    }
  }
}
