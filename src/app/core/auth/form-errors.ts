import type { FormGroup } from '@angular/forms';
import { toApiError } from '../api-errors';

/** Puts each server field message on its control; returns the message for the rest. */
export function applyServerErrors(form: FormGroup, err: unknown): string | null {
  const e = toApiError(err);
  let placed = false;
  for (const [field, message] of Object.entries(e.fields)) {
    const control = form.get(field);
    if (control) {
      control.setErrors({ server: message });
      control.markAsTouched();
      placed = true;
    }
  }
  return placed ? null : e.message;
}

/** The message to show under a control: the server's, else the local one. */
export function messageFor(form: FormGroup, field: string, local: Record<string, string>): string {
  const c = form.get(field);
  if (!c?.errors) return '';
  if (c.errors['server']) return String(c.errors['server']);
  for (const key of Object.keys(c.errors)) if (local[key]) return local[key];
  return 'Please check this field.';
}
