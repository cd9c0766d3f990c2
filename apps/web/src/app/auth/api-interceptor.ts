import { HttpErrorResponse, type HttpInterceptorFn } from '@angular/common/http';
import { inject } from '@angular/core';
import { Router } from '@angular/router';
import { catchError, throwError } from 'rxjs';
import { Session } from './session';

// Calls whose 401 is an answer for the caller, not a lost session.
const ownsItsUnauthorized = ['/api/auth/me', '/api/auth/login'];

/**
 * When the server says 401 to any other API call, the session has ended: forget the user and go to the
 * sign-in page with the current URL to come back to. The error still reaches the caller.
 */
export const apiInterceptor: HttpInterceptorFn = (req, next) => {
  const session = inject(Session);
  const router = inject(Router);
  return next(req).pipe(
    catchError((err: unknown) => {
      const path = req.url.split('?')[0] ?? req.url;
      if (err instanceof HttpErrorResponse && err.status === 401 && !ownsItsUnauthorized.includes(path)) {
        session.forget();
        const here = router.url;
        const returnUrl = here.startsWith('/sign-in') ? undefined : here;
        void router.navigate(['/sign-in'], { queryParams: returnUrl ? { returnUrl } : {} });
      }
      return throwError(() => err);
    }),
  );
};
