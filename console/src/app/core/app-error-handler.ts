import { ErrorHandler, Injectable, Injector, inject } from '@angular/core';
import { MatSnackBar } from '@angular/material/snack-bar';

import { problemMessage } from './problem-details.js';

// Long enough to read a two-line detail; the Dismiss action closes it sooner.
const ERROR_SNACKBAR_DURATION_MS = 8000;

/** Logs every uncaught error as Angular does, and tells the user what went wrong in a snackbar. */
@Injectable()
export class AppErrorHandler extends ErrorHandler {
  private readonly injector = inject(Injector);

  override handleError(error: unknown): void {
    super.handleError(error);
    // Looked up per error, not injected: the snackbar's own dependencies can need an ErrorHandler.
    const snackBar = this.injector.get(MatSnackBar);
    snackBar.open(problemMessage(error), 'Dismiss', { duration: ERROR_SNACKBAR_DURATION_MS });
  }
}
