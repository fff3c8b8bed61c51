import type { AbstractControl } from '@angular/forms';
import { toApiError } from './api-errors';

/**
 * Puts per-field messages on the matching controls as a `server` error, so each shows in its own
 * `mat-error`. A key may be a dotted path ("property.zip") or be renamed through `aliases`
 * (the server's "yearlyPriceCents" is the form's "yearlyPrice"). Returns the keys no control took.
 */
export function applyFieldErrors(form: AbstractControl, fields: Record<string, string>, aliases: Record<string, string> = {}): string[] {
  const unplaced: string[] = [];
  for (const [key, message] of Object.entries(fields)) {
    const control = form.get(aliases[key] ?? key);
    if (control) {
      control.setErrors({ server: message });
      control.markAsTouched();
    } else unplaced.push(key);
  }
  return unplaced;
}

/**
 * Puts the server's field errors (`{ error: { code, message, fields } }`) on the form. Returns the
 * message to show above the form when some of it belongs to no field, else null.
 */
export function applyServerErrors(form: AbstractControl, err: unknown, aliases: Record<string, string> = {}): string | null {
  const e = toApiError(err);
  const keys = Object.keys(e.fields);
  const unplaced = applyFieldErrors(form, e.fields, aliases);
  return keys.length && !unplaced.length ? null : e.message;
}

/** The server's message on a control, if it has one. */
export function serverError(control: AbstractControl | null): string | null {
  const e = control?.errors?.['server'];
  return typeof e === 'string' ? e : null;
}

/** The message to show under a control: the server's, else the local one for its first error. */
export function messageFor(form: AbstractControl, field: string, local: Record<string, string>): string {
  const c = form.get(field);
  if (!c?.errors) return '';
  const server = serverError(c);
  if (server) return server;
  for (const key of Object.keys(c.errors)) if (local[key]) return local[key];
  return 'Please check this field.';
}
