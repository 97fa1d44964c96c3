import { ErrorHandler, Injectable, inject } from '@angular/core';
import { HttpErrorResponse } from '@angular/common/http';
import { MatSnackBar } from '@angular/material/snack-bar';

/**
 * The one place an uncaught error ends up. HTTP failures were already shown
 * by the interceptor; anything else is a fault in the page, so say so plainly.
 */
@Injectable()
export class AppErrorHandler implements ErrorHandler {
  private readonly snackBar = inject(MatSnackBar);

  handleError(error: unknown): void {
    console.error(error);
    if (error instanceof HttpErrorResponse) return;
    this.snackBar.open('Something went wrong in this page. Reload it if it stops responding.', 'Dismiss', { duration: 8000 });
  }
}
