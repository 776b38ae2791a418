import { HttpErrorResponse, HttpInterceptorFn } from '@angular/common/http';
import { inject } from '@angular/core';
import { Router } from '@angular/router';
import { catchError, throwError } from 'rxjs';
import { SessionStore } from '../auth/session-store';
import { Notifier } from '../notifier';
import { HANDLES_OWN_ERRORS, SESSION_ENDS_ON_401, readApiError } from './api-error';

/**
 * One place for failures nobody else handles: a 401 means the session ended (back to sign in),
 * any other error without field messages is shown in a snack bar. Field errors belong to the form
 * that sent them, and requests marked HANDLES_OWN_ERRORS are left to their caller (except a 401
 * on a request also marked SESSION_ENDS_ON_401).
 */
export const errorInterceptor: HttpInterceptorFn = (req, next) => {
  const session = inject(SessionStore);
  const notifier = inject(Notifier);
  const router = inject(Router);
  return next(req).pipe(
    catchError((err: unknown) => {
      const ownErrors = req.context.get(HANDLES_OWN_ERRORS);
      const sessionEnded = err instanceof HttpErrorResponse && err.status === 401 && req.context.get(SESSION_ENDS_ON_401);
      if (err instanceof HttpErrorResponse && (!ownErrors || sessionEnded)) {
        const apiError = readApiError(err);
        if (err.status === 401) {
          const wasSignedIn = session.signedIn();
          session.clear();
          if (wasSignedIn) notifier.info('Your session has ended. Sign in again to carry on.');
          const next = router.url.startsWith('/sign-in') ? undefined : router.url;
          void router.navigate(['/sign-in'], { queryParams: next ? { next } : {} });
        } else if (Object.keys(apiError.fields).length === 0) {
          notifier.error(apiError.message);
        }
      }
      return throwError(() => err);
    }),
  );
};
