import { ChangeDetectionStrategy, Component, DestroyRef, effect, inject, input, output, untracked } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { firstValueFrom } from 'rxjs';
import type { CompletedVisit, FieldVisit } from '../../../../shared/schemas/field';
import { FieldApi } from '../field-api';
import { VisitDrafts } from '../visit-drafts';
import { VisitSaves, textError } from './visit-save';

/** Findings and recommendations for the homeowner, and completing the visit. */
@Component({
  selector: 'sw-visit-notes',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule],
  templateUrl: './visit-notes.html',
  styleUrl: './visit-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class VisitNotes {
  private readonly api = inject(FieldApi);
  private readonly drafts = inject(VisitDrafts);

  /** The visit as last loaded from the server. */
  readonly visit = input.required<FieldVisit>();
  readonly locked = input(false);
  /** The visit's status word now, which may have moved on since it was loaded. */
  readonly statusLabel = input('');
  readonly completed = output<CompletedVisit>();

  protected readonly saves = new VisitSaves(this.drafts);
  protected readonly errorOf = (name: string) => textError(this.form.get(name));
  protected readonly form = new FormGroup({
    findings: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(4000)] }),
    recommendations: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(4000)] }),
  });

  constructor() {
    effect(() => {
      const p = this.visit();
      untracked(() => {
        const n = this.drafts.read<{ findings: string; recommendations: string }>(p.visit.id, 'notes');
        this.form.setValue(n ?? { findings: p.visit.findings, recommendations: p.visit.recommendations }, { emitEvent: false });
      });
    });
    effect(() => {
      if (this.locked()) this.form.disable({ emitEvent: false });
    });
    const sub = this.form.valueChanges.subscribe(() => {
      if (!this.locked()) this.drafts.write(this.visit().visit.id, 'notes', this.form.getRawValue());
    });
    inject(DestroyRef).onDestroy(() => sub.unsubscribe());
  }

  protected save(): void {
    const id = this.visit().visit.id;
    void this.saves.run(id, 'notes', () => firstValueFrom(this.api.saveNotes(id, this.form.getRawValue())), 'Findings saved.', this.form);
  }

  protected complete(): void {
    const id = this.visit().visit.id;
    void this.saves.run(
      id,
      'notes',
      async () => {
        const res = await firstValueFrom(this.api.complete(id, this.form.getRawValue()));
        // Nothing typed on this phone is waiting any more: the visit is closed.
        for (const part of this.drafts.pending(id)) this.drafts.clear(id, part);
        this.completed.emit(res);
      },
      'Visit completed. The homeowner has been sent a summary.',
      this.form,
    );
  }
}
