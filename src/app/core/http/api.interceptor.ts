import { HttpErrorResponse, HttpInterceptorFn } from '@angular/common/http';
import { inject } from '@angular/core';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router } from '@angular/router';
import { catchError, throwError } from 'rxjs';
import { AuthService } from '../auth/auth.service';
import { INLINE_ERRORS, toApiFailure } from './api-error';

/**
 * Every API call: sends the session cookie; a 401 outside sign-in means the
 * session ended, so go to sign-in; other failures show the server's message
 * in a snack bar unless the caller shows them beside its form.
 */
export const apiInterceptor: HttpInterceptorFn = (req, next) => {
  const auth = inject(AuthService);
  const router = inject(Router);
  const snackBar = inject(MatSnackBar);
  const request = req.url.startsWith('/api/') ? req.clone({ withCredentials: true }) : req;

  return next(request).pipe(
    catchError((err: unknown) => {
      if (err instanceof HttpErrorResponse) {
        const inline = req.context.get(INLINE_ERRORS);
        // Sign-in and the public invitation routes answer 401 for a wrong password, not for an ended session.
        if (err.status === 401 && !req.url.startsWith('/api/auth/') && !req.url.startsWith('/api/invitations/')) {
          auth.clear();
          void router.navigate(['/sign-in'], { queryParams: { returnUrl: router.url } });
          snackBar.open('Your session has ended. Sign in again to carry on.', 'OK', { duration: 6000 });
        } else if (!inline) {
          snackBar.open(toApiFailure(err).message, 'Dismiss', { duration: 8000 });
        }
      }
      return throwError(() => err);
    }),
  );
};
