import { ChangeDetectionStrategy, Component, DestroyRef, ElementRef, computed, effect, inject, signal, viewChild } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import SignaturePad from 'signature_pad';
import type { CompletionAnswers } from '../../../../shared/visit-completion';

export interface CompleteVisitData {
  /** Checklist items with no result, as "Outdoor unit: Clean the condenser coil". */
  unfinished: string[];
  /** The household's name, offered as the signer's. */
  householdName: string;
}

/** Asks once before a visit is closed: what was skipped and why, and the homeowner's signature for a repair. */
@Component({
  selector: 'sw-complete-visit-dialog',
  imports: [FormsModule, MatButtonModule, MatCheckboxModule, MatDialogModule, MatFormFieldModule, MatInputModule],
  template: `
    <h2 mat-dialog-title>Complete this visit?</h2>
    <mat-dialog-content>
      <p>The homeowner is e-mailed a summary, and the record is locked.</p>
      @if (data.unfinished.length) {
        <h3 id="unfinished-title">Not ticked on the checklist ({{ data.unfinished.length }})</h3>
        <ul aria-labelledby="unfinished-title" class="unfinished">
          @for (item of data.unfinished; track item) {
            <li>{{ item }}</li>
          }
        </ul>
        <mat-form-field appearance="outline" class="wide">
          <mat-label>Why were these skipped?</mat-label>
          <textarea matInput rows="2" maxlength="1000" [ngModel]="reason()" (ngModelChange)="reason.set($event)"></textarea>
          <mat-hint>For example: no attic access, homeowner declined</mat-hint>
        </mat-form-field>
      }
      <mat-checkbox [ngModel]="repair()" (ngModelChange)="repair.set($event)">A repair was done on this visit</mat-checkbox>
      @if (repair()) {
        <p id="sign-title">Homeowner's signature for the repair</p>
        <canvas #pad class="pad" width="600" height="200" role="img" aria-labelledby="sign-title"></canvas>
        <div class="sign-row">
          <button mat-button type="button" (click)="clearSignature()">Clear signature</button>
          <mat-form-field appearance="outline">
            <mat-label>Signed by</mat-label>
            <input matInput maxlength="120" [ngModel]="signedBy()" (ngModelChange)="signedBy.set($event)" autocomplete="off" />
          </mat-form-field>
        </div>
      }
      @if (missing(); as m) {
        <p class="missing" role="status">{{ m }}</p>
      }
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button mat-button type="button" mat-dialog-close>Back to the visit</button>
      <button mat-flat-button type="button" [disabled]="!!missing()" (click)="confirm()">Complete visit</button>
    </mat-dialog-actions>
  `,
  styles: `
    .wide {
      width: 100%;
    }
    .unfinished {
      margin: 0 0 12px;
      padding-left: 20px;
    }
    .pad {
      display: block;
      width: 100%;
      max-width: 600px;
      aspect-ratio: 3 / 1;
      border: 2px solid var(--mat-sys-outline);
      border-radius: 8px;
      touch-action: none;
      background: var(--mat-sys-surface);
    }
    .sign-row {
      display: flex;
      flex-wrap: wrap;
      gap: 8px;
      align-items: center;
      margin-top: 8px;
    }
    .missing {
      color: var(--mat-sys-on-surface-variant);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CompleteVisitDialog {
  protected readonly data = inject<CompleteVisitData>(MAT_DIALOG_DATA);
  private readonly ref = inject<MatDialogRef<CompleteVisitDialog, CompletionAnswers>>(MatDialogRef);
  private readonly canvas = viewChild<ElementRef<HTMLCanvasElement>>('pad');
  private pad: SignaturePad | null = null;

  protected readonly reason = signal('');
  protected readonly repair = signal(false);
  protected readonly signedBy = signal(this.data.householdName.replace(/ household$/i, ''));
  /** The drawn signature as a PNG data URL, once the homeowner has signed. */
  protected readonly signature = signal<string | null>(null);

  protected readonly missing = computed(() => {
    if (this.data.unfinished.length && !this.reason().trim()) return 'Say why the unticked items were skipped.';
    if (this.repair() && !this.signature()) return 'Ask the homeowner to sign for the repair.';
    if (this.repair() && !this.signedBy().trim()) return 'Name who signed.';
    return null;
  });

  constructor() {
    effect((onCleanup) => {
      const el = this.canvas()?.nativeElement;
      if (!el) return;
      try {
        const pad = new SignaturePad(el);
        pad.addEventListener('endStroke', () => this.signatureDrawn(pad.isEmpty() ? null : pad.toDataURL('image/png')));
        this.pad = pad;
        onCleanup(() => pad.off());
      } catch {
        // A browser without canvas drawing cannot take a signature; the dialog keeps saying so.
        this.pad = null;
      }
    });
    inject(DestroyRef).onDestroy(() => this.pad?.off());
  }

  protected signatureDrawn(image: string | null): void {
    this.signature.set(image);
  }

  protected clearSignature(): void {
    this.pad?.clear();
    this.signature.set(null);
  }

  protected confirm(): void {
    if (this.missing()) return;
    const image = this.signature();
    this.ref.close({
      skippedReason: this.reason().trim(),
      repairDone: this.repair(),
      ...(this.repair() && image ? { signature: { image, signedBy: this.signedBy().trim() } } : {}),
    });
  }
}
