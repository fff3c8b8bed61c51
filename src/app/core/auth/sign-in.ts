import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { AuthApi } from './auth-api';
import { applyServerErrors, messageFor } from '../form-errors';
import { firstValueFrom } from 'rxjs';

/** Homeowners sign in with their e-mail address; we mail them a one-time link. */
@Component({
  selector: 'sw-sign-in',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatInputModule, MatIconModule, RouterLink],
  template: `
    <section class="card">
      @if (sentTo(); as address) {
        <h1>Check your e-mail</h1>
        <p class="notice" role="status">
          <mat-icon svgIcon="mail" aria-hidden="true" /><span>{{ message() }}</span>
        </p>
        <p>
          We sent it to <strong>{{ address }}</strong> if that address has a portal account. Open the link on this device, then press “Sign me in”.
        </p>
        <div class="row"><button mat-stroked-button type="button" (click)="sentTo.set(null)">Use another address</button></div>
      } @else {
        <h1>Sign in to your home portal</h1>
        <p class="sw-lead">We e-mail you a link; no password needed.</p>
        <p>No password needed: enter the e-mail address your heating and cooling company has for you, and we will send you a sign-in link.</p>
        <form [formGroup]="form" (ngSubmit)="submit()" novalidate>
          <mat-form-field appearance="outline">
            <mat-label>E-mail address</mat-label>
            <input matInput formControlName="email" type="email" autocomplete="email" inputmode="email" />
            @if (form.controls.email.invalid) {
              <mat-error>{{ error('email') }}</mat-error>
            }
          </mat-form-field>
          @if (problem(); as p) {
            <p class="problem" role="alert">
              <mat-icon svgIcon="status-alert" aria-hidden="true" /><span>{{ p }}</span>
            </p>
          }
          <div class="row">
            <button mat-flat-button type="submit" [disabled]="busy()">Send me a sign-in link</button>
            <a mat-button routerLink="/staff/sign-in" [queryParams]="{ returnUrl: returnUrl() }">Staff sign-in</a>
          </div>
        </form>
      }
    </section>
  `,
  styleUrl: './auth-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SignIn {
  private readonly api = inject(AuthApi);
  readonly returnUrl = input<string | undefined>();
  protected readonly form = inject(NonNullableFormBuilder).group({ email: ['', [Validators.required, Validators.email]] });
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly sentTo = signal<string | null>(null);
  protected readonly message = signal('');

  protected error(field: 'email'): string {
    return messageFor(this.form, field, { required: 'Enter your e-mail address.', email: 'Enter a valid e-mail address, like name@example.com.' });
  }

  protected async submit(): Promise<void> {
    this.problem.set(null);
    if (this.form.invalid) return this.form.markAllAsTouched();
    this.busy.set(true);
    try {
      const email = this.form.controls.email.value.trim();
      const back = this.returnUrl();
      // The e-mailed link opens a new page; remember where the homeowner was going.
      if (back) sessionStorage.setItem('sw.returnUrl', back);
      const res = await firstValueFrom(this.api.requestLink(email));
      this.message.set(res.message);
      this.sentTo.set(email);
    } catch (err) {
      this.problem.set(applyServerErrors(this.form, err));
    } finally {
      this.busy.set(false);
    }
  }
}
