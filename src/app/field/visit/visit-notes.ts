import { ChangeDetectionStrategy, Component, DestroyRef, PendingTasks, effect, inject, input, output, untracked } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatDialog } from '@angular/material/dialog';
import { firstValueFrom } from 'rxjs';
import { unfinishedItems, type CompletionAnswers } from '../../../../shared/visit-completion';
import type { CompleteVisitDialog, CompleteVisitData } from './complete-visit-dialog';
import type { ChecklistSection, CompletedVisit, FieldVisit } from '../../../../shared/schemas/field';
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
  private readonly dialog = inject(MatDialog);
  private readonly pendingTasks = inject(PendingTasks);

  /** The visit as last loaded from the server. */
  readonly visit = input.required<FieldVisit>();
  readonly locked = input(false);
  /** The checklist as last saved; defaults to the loaded one. */
  readonly checklist = input<ChecklistSection[] | null>(null);
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

  /** Asks first: what on the checklist is open and why, and the homeowner's signature for a repair. */
  protected async complete(): Promise<void> {
    const p = this.visit();
    const id = p.visit.id;
    const data: CompleteVisitData = { unfinished: p.visit.reason === 'tune_up' ? unfinishedItems(this.checklist() ?? p.checklist) : [], householdName: p.customer.name };
    // The dialog, with its signature pad, loads when it is first asked for.
    const loaded = this.pendingTasks.add();
    const { CompleteVisitDialog: dialog } = await import('./complete-visit-dialog').finally(loaded);
    const answers = await firstValueFrom(
      this.dialog.open<CompleteVisitDialog, CompleteVisitData, CompletionAnswers>(dialog, { data, maxWidth: '640px', width: '100%', disableClose: true }).afterClosed(),
    );
    if (!answers) return;
    void this.saves.run(
      id,
      'notes',
      async () => {
        const res = await firstValueFrom(this.api.complete(id, { ...this.form.getRawValue(), ...answers }));
        // Nothing typed on this phone is waiting any more: the visit is closed.
        for (const part of this.drafts.pending(id)) this.drafts.clear(id, part);
        this.completed.emit(res);
      },
      'Visit completed. The homeowner has been sent a summary.',
      this.form,
    );
  }
}
