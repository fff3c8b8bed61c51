import { ChangeDetectionStrategy, Component, computed, input, output, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatRadioModule } from '@angular/material/radio';
import { formatUsd } from '../../../shared/money';
import type { QuoteView } from '../../../shared/schemas/pricebook';
import { applyServerErrors, serverError } from '../core/form-errors';

/**
 * The homeowner approves one option with a typed name (the server records the time and the
 * address), or declines with a reason: on the technician's phone in the home, or in the portal.
 */
@Component({
  selector: 'sw-quote-approval',
  imports: [ReactiveFormsModule, MatButtonModule, MatCheckboxModule, MatFormFieldModule, MatInputModule, MatRadioModule],
  template: `
    <form [formGroup]="form" (ngSubmit)="approve()" class="approve" [attr.aria-label]="heading()">
      <h3>{{ heading() }}</h3>
      <mat-radio-group formControlName="optionId" aria-label="Option to approve" class="choices">
        @for (o of quote().options; track o.id) {
          <mat-radio-button [value]="o.id">{{ o.title }}: {{ usd(o.totalCents) }}</mat-radio-button>
        }
      </mat-radio-group>
      @if (err('optionId'); as e) {
        <p class="bad">{{ e }}</p>
      }
      <mat-form-field appearance="outline" class="wide">
        <mat-label>Type your full name</mat-label>
        <input matInput formControlName="typedName" autocomplete="name" />
        @if (err('typedName'); as e) {
          <mat-error>{{ e }}</mat-error>
        }
      </mat-form-field>
      <mat-checkbox formControlName="agreed">I approve this work and its price.</mat-checkbox>
      @if (err('agreed'); as e) {
        <p class="bad">{{ e }}</p>
      }
      <div class="actions">
        <button mat-flat-button type="submit" class="big" [disabled]="busy()">Approve {{ chosenTitle() }}</button>
        <button mat-button type="button" (click)="declining.set(!declining())">Decline the quote</button>
      </div>
    </form>
    @if (declining()) {
      <form [formGroup]="declineForm" (ngSubmit)="decline()" class="approve" aria-label="Decline the quote">
        <mat-form-field appearance="outline" class="wide">
          <mat-label>Why are you declining?</mat-label>
          <textarea matInput formControlName="reason" rows="2"></textarea>
          @if (declineErr(); as e) {
            <mat-error>{{ e }}</mat-error>
          }
        </mat-form-field>
        <button mat-stroked-button type="submit" [disabled]="busy()">Decline</button>
      </form>
    }
    @if (error(); as e) {
      <p role="alert" class="bad">{{ e }}</p>
    }
  `,
  styles: `
    .approve {
      border-top: 2px solid var(--sw-teal-soft);
      padding-top: 8px;
      margin-top: 12px;
    }
    h3 {
      font-size: 1.1rem;
      font-weight: 800;
      margin: 8px 0;
    }
    .choices {
      display: grid;
      gap: 6px;
      margin: 0 0 8px;
    }
    .wide {
      width: 100%;
      margin-top: 8px;
    }
    .actions {
      display: flex;
      flex-wrap: wrap;
      gap: 12px;
      align-items: center;
      margin: 12px 0;
    }
    .big {
      min-height: 52px;
      min-width: 160px;
      font-size: 1.05rem;
    }
    .bad {
      color: var(--sw-alert);
      font-weight: 700;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class QuoteApproval {
  readonly quote = input.required<QuoteView>();
  /** On the homeowner's own device rather than the technician's. */
  readonly portal = input(false);
  /** Sends the approval or the decline through the caller's API. */
  readonly submit = input.required<(kind: 'approve' | 'decline', body: Record<string, unknown>) => Promise<QuoteView>>();
  readonly decided = output<QuoteView>();

  protected readonly usd = (cents: number) => formatUsd(cents);
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly declining = signal(false);
  protected readonly heading = computed(() => (this.portal() ? 'Approve an option' : 'Approve here, on this phone'));
  protected readonly form = new FormGroup({
    optionId: new FormControl('', { nonNullable: true, validators: Validators.required }),
    typedName: new FormControl('', { nonNullable: true }),
    agreed: new FormControl(false, { nonNullable: true }),
  });
  protected readonly declineForm = new FormGroup({ reason: new FormControl('', { nonNullable: true }) });
  private readonly chosen = signal('');
  protected readonly chosenTitle = computed(() => this.quote().options.find((o) => o.id === this.chosen())?.title ?? '');

  constructor() {
    this.form.controls.optionId.valueChanges.subscribe((v) => this.chosen.set(v));
  }

  protected err(name: string): string | null {
    return serverError(this.form.get(name));
  }
  protected declineErr(): string | null {
    return serverError(this.declineForm.get('reason'));
  }

  protected approve(): void {
    if (!this.form.value.optionId) {
      this.form.controls.optionId.setErrors({ server: 'Choose the option you approve.' });
      return;
    }
    void this.run('approve', { revision: this.quote().revision, ...this.form.getRawValue(), agreed: this.form.value.agreed ? true : undefined }, this.form);
  }

  protected decline(): void {
    void this.run('decline', { revision: this.quote().revision, ...this.declineForm.getRawValue() }, this.declineForm);
  }

  private async run(kind: 'approve' | 'decline', body: Record<string, unknown>, form: FormGroup): Promise<void> {
    this.busy.set(true);
    this.error.set(null);
    try {
      const view = await this.submit()(kind, body);
      this.decided.emit(view);
    } catch (e) {
      this.error.set(applyServerErrors(form, e));
    } finally {
      this.busy.set(false);
    }
  }
}
