import { HttpErrorResponse, type HttpInterceptorFn, type HttpRequest } from '@angular/common/http';
import { inject } from '@angular/core';
import { catchError, from, switchMap, throwError } from 'rxjs';

import { ANONYMOUS } from './anonymous.js';
import { Auth } from './auth.js';

function withBearer<T>(req: HttpRequest<T>, token: string | null): HttpRequest<T> {
  return token ? req.clone({ setHeaders: { Authorization: `Bearer ${token}` } }) : req;
}

/** Adds the access token to API calls, and after a 401 refreshes the session once and retries. */
export const authInterceptor: HttpInterceptorFn = (req, next) => {
  if (req.context.get(ANONYMOUS) || !req.url.startsWith('/v1/')) return next(req);
  const auth = inject(Auth);
  const token = auth.accessToken();
  return next(withBearer(req, token)).pipe(
    catchError((error: unknown) => {
      if (!(error instanceof HttpErrorResponse) || error.status !== 401 || !token) return throwError(() => error);
      return from(auth.refresh()).pipe(
        switchMap((renewed) => (renewed ? next(withBearer(req, auth.accessToken())) : throwError(() => error))),
      );
    }),
  );
};
