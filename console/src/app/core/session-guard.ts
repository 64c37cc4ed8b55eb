import { inject } from '@angular/core';
import { type CanActivateFn, Router } from '@angular/router';

import { Auth } from './auth.js';

/** Lets signed-in users through (restoring a stored sign-in first); sends others to sign in. */
export const requireSession: CanActivateFn = async (_route, state) => {
  const auth = inject(Auth);
  const router = inject(Router); // before the await: inject() only works synchronously
  if (auth.signedIn() || (await auth.restore())) return true;
  return router.createUrlTree(['/sign-in'], { queryParams: { next: state.url } });
};
