import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { AuthApi } from './auth-api';
import { applyServerErrors, messageFor } from '../form-errors';
import { firstValueFrom } from 'rxjs';

/** The office opens a household's portal: by customer number, or by the e-mail on file. */
@Component({
  selector: 'sw-household-invite',
  host: { class: 'sw-dense' },
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatInputModule, MatIconModule],
  template: `
    <section class="card">
      <h1>Invite a household to the portal</h1>
      <p>Enter the customer number, the e-mail address on the household, or both (the e-mail then replaces the one on file for the sign-in).</p>
      <form [formGroup]="form" (ngSubmit)="submit()" novalidate>
        <mat-form-field appearance="outline">
          <mat-label>Customer number</mat-label>
          <input matInput formControlName="customerId" autocomplete="off" />
          @if (form.controls.customerId.invalid) {
            <mat-error>{{ error('customerId') }}</mat-error>
          }
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>E-mail address</mat-label>
          <input matInput formControlName="email" type="email" autocomplete="off" />
          @if (form.controls.email.invalid) {
            <mat-error>{{ error('email') }}</mat-error>
          }
        </mat-form-field>
        @if (problem(); as p) {
          <p class="problem" role="alert">
            <mat-icon svgIcon="status-alert" aria-hidden="true" /><span>{{ p }}</span>
          </p>
        }
        @if (sent(); as s) {
          <p class="notice" role="status">
            <mat-icon svgIcon="status-ok" aria-hidden="true" /><span>Invitation sent to {{ s }}.</span>
          </p>
        }
        <div class="row"><button mat-flat-button type="submit" [disabled]="busy()">Send invitation</button></div>
      </form>
    </section>
  `,
  styleUrl: './auth-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class HouseholdInvite {
  private readonly api = inject(AuthApi);
  protected readonly form = inject(NonNullableFormBuilder).group({ customerId: [''], email: ['', [Validators.email]] });
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly sent = signal<string | null>(null);

  protected error(field: 'customerId' | 'email'): string {
    return messageFor(this.form, field, { email: 'Enter a valid e-mail address.' });
  }

  protected async submit(): Promise<void> {
    this.problem.set(null);
    this.sent.set(null);
    const { customerId, email } = this.form.getRawValue();
    if (!customerId.trim() && !email.trim()) {
      this.form.controls.email.setErrors({ server: 'Enter a customer number or an e-mail address.' });
      return this.form.markAllAsTouched();
    }
    if (this.form.invalid) return this.form.markAllAsTouched();
    this.busy.set(true);
    try {
      const res = await firstValueFrom(
        this.api.inviteHousehold({ ...(customerId.trim() ? { customerId: customerId.trim() } : {}), ...(email.trim() ? { email: email.trim() } : {}) }),
      );
      this.sent.set(res.email);
      this.form.reset();
    } catch (err) {
      this.problem.set(applyServerErrors(this.form, err));
    } finally {
      this.busy.set(false);
    }
  }
}
