import { ErrorHandler, Injectable, Injector, inject } from '@angular/core';
import { toApiError } from './api-errors';

/**
 * Shows every uncaught error in a snack bar and still logs it: nothing is swallowed. The snack bar
 * loads with the first error, keeping Material's overlay out of the first chunk.
 */
@Injectable()
export class AppErrorHandler implements ErrorHandler {
  private readonly injector = inject(Injector);

  handleError(error: unknown): void {
    console.error(error);
    const message = toApiError((error as { rejection?: unknown })?.rejection ?? error).message;
    import('@angular/material/snack-bar')
      .then(({ MatSnackBar }) => this.injector.get(MatSnackBar).open(message, 'Dismiss', { duration: 8000 }))
      .catch((err: unknown) => console.error(err));
  }
}
