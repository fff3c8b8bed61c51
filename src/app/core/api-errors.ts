import { HttpErrorResponse, HttpInterceptorFn } from '@angular/common/http';
import { catchError, throwError } from 'rxjs';
import type { ApiErrorBody } from '../../../shared/schemas/errors';

/** One client error type for every failed API call, carrying per-field messages. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields: Record<string, string> = {},
  ) {
    super(message);
  }
}

export function toApiError(err: unknown): ApiError {
  if (err instanceof ApiError) return err;
  if (err instanceof HttpErrorResponse) {
    // A structural check, not zod, keeps the validator out of the initial bundle.
    const body = err.error as Partial<ApiErrorBody> | null;
    if (body?.error && typeof body.error.code === 'string' && typeof body.error.message === 'string') {
      return new ApiError(err.status, body.error.code, body.error.message, body.error.fields ?? {});
    }
    if (err.status === 0) return new ApiError(0, 'offline', 'We could not reach Seasonwell. Check your connection and try again.');
    return new ApiError(err.status, 'http_error', `The server answered ${err.status}. Please try again.`);
  }
  return new ApiError(0, 'unknown', err instanceof Error ? err.message : 'Something went wrong.');
}

export const apiErrors: HttpInterceptorFn = (req, next) => next(req).pipe(catchError((err: unknown) => throwError(() => toApiError(err))));
