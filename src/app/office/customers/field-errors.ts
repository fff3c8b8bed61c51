import type { AbstractControl, FormGroup } from '@angular/forms';
import { ApiError } from '../../core/api-errors';

/**
 * Puts the server's per-field messages on the matching controls ("property.zip" → the zip control
 * of the property group), so each shows under its own field. Returns the message for the rest.
 */
export function applyServerErrors(form: FormGroup, err: unknown, aliases: Record<string, string> = {}): string | null {
  if (!(err instanceof ApiError)) return err instanceof Error ? err.message : 'Something went wrong.';
  let unplaced = false;
  for (const [key, message] of Object.entries(err.fields)) {
    const path = aliases[key] ?? key;
    const control: AbstractControl | null = form.get(path);
    if (control) {
      control.setErrors({ server: message });
      control.markAsTouched();
    } else unplaced = true;
  }
  return Object.keys(err.fields).length && !unplaced ? null : err.message;
}

export function serverError(control: AbstractControl | null): string | null {
  const e = control?.errors?.['server'];
  return typeof e === 'string' ? e : null;
}
