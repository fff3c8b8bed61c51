import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { MatSnackBar, MatSnackBarModule } from '@angular/material/snack-bar';
import { MatTableModule } from '@angular/material/table';
import type { StaffMember } from '../../../../shared/schemas/auth';
import { toApiError } from '../../core/api-errors';
import { applyServerErrors, messageFor } from '../../core/form-errors';
import { errorMessage, localCopy } from '../../core/resource-state';
import { StaffApi } from './staff-api';
import { firstValueFrom } from 'rxjs';

const ROLE_WORDS: Record<StaffMember['role'], string> = { technician: 'Technician', office: 'Office', owner: 'Owner' };

/** The owner's staff list: invite, change role, turn an account off, end its sessions. */
@Component({
  selector: 'sw-staff-list',
  host: { class: 'sw-dense' },
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatSelectModule, MatSlideToggleModule, MatSnackBarModule, MatTableModule],
  template: `
    <section class="sw-page">
      <h1>Staff</h1>
      <p class="sw-lead">Invite technicians and office staff, change their roles, or disable an account.</p>
      <h2>Invite someone</h2>
      <form [formGroup]="form" (ngSubmit)="invite()" class="invite" novalidate>
        <mat-form-field appearance="outline">
          <mat-label>Name</mat-label>
          <input matInput formControlName="name" autocomplete="off" />
          @if (form.controls.name.invalid) {
            <mat-error>{{ error('name') }}</mat-error>
          }
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>E-mail address</mat-label>
          <input matInput formControlName="email" type="email" autocomplete="off" />
          @if (form.controls.email.invalid) {
            <mat-error>{{ error('email') }}</mat-error>
          }
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>Role</mat-label>
          <mat-select formControlName="role">
            <mat-option value="technician">Technician</mat-option>
            <mat-option value="office">Office</mat-option>
          </mat-select>
          @if (form.controls.role.invalid) {
            <mat-error>{{ error('role') }}</mat-error>
          }
        </mat-form-field>
        <button mat-flat-button type="submit" [disabled]="busy()"><mat-icon svgIcon="mail" />Send invitation</button>
      </form>
      @if (problem(); as p) {
        <p class="problem" role="alert"><mat-icon svgIcon="status-alert" aria-hidden="true" />{{ p }}</p>
      }

      <table mat-table [dataSource]="staff() ?? []" aria-label="Staff members">
        <ng-container matColumnDef="name">
          <th mat-header-cell *matHeaderCellDef>Name</th>
          <td mat-cell *matCellDef="let m">
            {{ m.name }}<br /><small>{{ m.email }}</small>
          </td>
        </ng-container>
        <ng-container matColumnDef="role">
          <th mat-header-cell *matHeaderCellDef>Role</th>
          <td mat-cell *matCellDef="let m">
            @if (m.role === 'owner') {
              Owner
            } @else {
              <mat-select [value]="m.role" (valueChange)="setRole(m, $event)" [aria-label]="'Role of ' + m.name">
                <mat-option value="technician">Technician</mat-option>
                <mat-option value="office">Office</mat-option>
              </mat-select>
            }
          </td>
        </ng-container>
        <ng-container matColumnDef="status">
          <th mat-header-cell *matHeaderCellDef>Status</th>
          <td mat-cell *matCellDef="let m">
            @if (m.disabled) {
              <span class="status"><mat-icon svgIcon="status-alert" aria-hidden="true" />Turned off</span>
            } @else if (m.invitedPending) {
              <span class="status"><mat-icon svgIcon="mail" aria-hidden="true" />Invited</span>
            } @else {
              <span class="status"><mat-icon svgIcon="status-ok" aria-hidden="true" />Active</span>
            }
          </td>
        </ng-container>
        <ng-container matColumnDef="disabled">
          <th mat-header-cell *matHeaderCellDef>Turned off</th>
          <td mat-cell *matCellDef="let m">
            @if (m.role !== 'owner') {
              <mat-slide-toggle [checked]="m.disabled" (change)="setDisabled(m, $event.checked)" [aria-label]="'Turn off ' + m.name" />
            }
          </td>
        </ng-container>
        <ng-container matColumnDef="sessions">
          <th mat-header-cell *matHeaderCellDef>Sessions</th>
          <td mat-cell *matCellDef="let m">
            <button mat-button type="button" (click)="endSessions(m)"><mat-icon svgIcon="logout" />Sign out everywhere</button>
          </td>
        </ng-container>
        <tr mat-header-row *matHeaderRowDef="columns"></tr>
        <tr mat-row *matRowDef="let row; columns: columns"></tr>
      </table>
    </section>
  `,
  styles: `
    .invite {
      display: flex;
      flex-wrap: wrap;
      gap: 8px 12px;
      align-items: flex-start;
      margin-bottom: 16px;
    }
    .status {
      display: inline-flex;
      gap: 4px;
      align-items: center;
    }
    .problem {
      color: var(--sw-alert);
      display: flex;
      gap: 8px;
    }
    table {
      width: 100%;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StaffList {
  private readonly api = inject(StaffApi);
  private readonly snack = inject(MatSnackBar);
  protected readonly columns = ['name', 'role', 'status', 'disabled', 'sessions'];
  private readonly read = rxResource({ stream: () => this.api.list() });
  protected readonly staff = localCopy<StaffMember[]>(this.read, true);
  protected readonly busy = signal(false);
  private readonly inviteProblem = signal<string | null>(null);
  private readonly loadError = errorMessage(this.read);
  protected readonly problem = computed(() => this.inviteProblem() ?? this.loadError());
  protected readonly roleWords = ROLE_WORDS;
  protected readonly form = inject(NonNullableFormBuilder).group({
    name: ['', [Validators.required]],
    email: ['', [Validators.required, Validators.email]],
    role: ['technician' as 'technician' | 'office', [Validators.required]],
  });

  protected error(field: 'name' | 'email' | 'role'): string {
    return messageFor(this.form, field, { required: 'This is needed.', email: 'Enter a valid e-mail address.' });
  }

  private reload(): void {
    this.read.reload();
  }

  protected async invite(): Promise<void> {
    this.inviteProblem.set(null);
    if (this.form.invalid) return this.form.markAllAsTouched();
    this.busy.set(true);
    try {
      const res = await firstValueFrom(this.api.invite(this.form.getRawValue()));
      this.snack.open(`Invitation sent to ${res.email}.`, 'OK', { duration: 4000 });
      this.form.reset();
      this.reload();
    } catch (err) {
      this.inviteProblem.set(applyServerErrors(this.form, err));
    } finally {
      this.busy.set(false);
    }
  }

  private async change(m: StaffMember, run: () => Promise<unknown>, done: string): Promise<void> {
    try {
      await run();
      this.snack.open(done, 'OK', { duration: 4000 });
    } catch (err) {
      this.snack.open(toApiError(err).message, 'OK', { duration: 6000 });
    }
    this.reload();
    void m;
  }

  protected setRole(m: StaffMember, role: 'technician' | 'office'): Promise<void> {
    return this.change(m, () => firstValueFrom(this.api.update(m.id, { role })), `${m.name} is now ${ROLE_WORDS[role].toLowerCase()}.`);
  }
  protected setDisabled(m: StaffMember, disabled: boolean): Promise<void> {
    return this.change(m, () => firstValueFrom(this.api.update(m.id, { disabled })), disabled ? `${m.name} is turned off and signed out.` : `${m.name} can sign in again.`);
  }
  protected endSessions(m: StaffMember): Promise<void> {
    return this.change(m, () => firstValueFrom(this.api.signOutEverywhere(m.id)), `${m.name} is signed out everywhere.`);
  }
}
