import { signal } from '@angular/core';
import type { AbstractControl } from '@angular/forms';
import { toApiError } from '../../core/api-errors';
import { applyFieldErrors } from '../../core/form-errors';
import type { VisitDrafts } from '../visit-drafts';

export interface Flash {
  kind: 'ok' | 'kept' | 'bad';
  text: string;
}

/**
 * Saves the parts of a visit one at a time: the part is busy while it runs, then a line says what
 * happened. With no signal the draft stays on the phone; a refusal puts its field messages on the form.
 */
export class VisitSaves {
  readonly busy = signal<string | null>(null);
  readonly flash = signal<Record<string, Flash>>({});

  constructor(private readonly drafts: VisitDrafts) {}

  private setFlash(part: string, f: Flash | null): void {
    const next = { ...this.flash() };
    if (f) next[part] = f;
    else delete next[part];
    this.flash.set(next);
  }

  async run(visitId: string, part: string, work: () => Promise<unknown>, ok: string, form?: AbstractControl): Promise<boolean> {
    this.busy.set(part);
    this.setFlash(part, null);
    try {
      await work();
      this.drafts.clear(visitId, part);
      this.setFlash(part, { kind: 'ok', text: ok });
      return true;
    } catch (err) {
      const e = toApiError(err);
      if (e.status === 0 || e.status >= 500) this.setFlash(part, { kind: 'kept', text: 'No connection: kept on this phone. Try again when the signal is back.' });
      else {
        if (form) applyFieldErrors(form, e.fields);
        this.setFlash(part, { kind: 'bad', text: e.message });
      }
      return false;
    } finally {
      this.busy.set(null);
    }
  }
}

/** The message under a visit text field: the server's, else the length limit. */
export function textError(control: AbstractControl | null): string | null {
  const e = control?.errors;
  if (!e) return null;
  if (e['server']) return e['server'] as string;
  if (e['maxlength']) return `At most ${(e['maxlength'] as { requiredLength: number }).requiredLength} characters`;
  return null;
}
