import { ErrorHandler, Injectable, inject } from '@angular/core';
import { MatSnackBar } from '@angular/material/snack-bar';
import { toApiError } from './api-errors';

/** Shows every uncaught error in a snack bar and still logs it: nothing is swallowed. */
@Injectable()
export class AppErrorHandler implements ErrorHandler {
  private readonly snackBar = inject(MatSnackBar);

  handleError(error: unknown): void {
    console.error(error);
    const message = toApiError((error as { rejection?: unknown })?.rejection ?? error).message;
    this.snackBar.open(message, 'Dismiss', { duration: 8000 });
  }
}
