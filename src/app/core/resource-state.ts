import { computed, linkedSignal, type Resource, type Signal, type WritableSignal } from '@angular/core';
import { toApiError, type ApiError } from './api-errors';

/** What a failed read tells the reader, or null while it loads or once it has an answer. */
export function errorMessage(r: Resource<unknown>, say: (e: ApiError) => string = (e) => e.message): Signal<string | null> {
  return computed(() => {
    const e = r.error();
    return e ? say(toApiError(e)) : null;
  });
}

/**
 * The read's answer as a signal the page may change after a write (a saved record, a new status);
 * each fresh answer from the server replaces it. Null while nothing has loaded or the read failed,
 * where `value()` itself would throw. With `keep`, the last answer stays on screen while the read
 * loads for new parameters (another week, another season), so the page does not jump.
 */
export function localCopy<T>(r: Resource<T | undefined>, keep = false): WritableSignal<T | null> {
  return linkedSignal<T | undefined, T | null>({
    source: () => (r.hasValue() ? (r.value() as T) : undefined),
    computation: (v, prev) => v ?? (keep && !r.error() ? (prev?.value ?? null) : null),
  });
}
