import { inject } from '@angular/core';
import { type CanActivateFn, Router } from '@angular/router';

import { Auth } from './auth.js';

/** Keeps everyone but the platform operator away from the operator's pages (the API refuses them anyway). */
export const requireOperator: CanActivateFn = () => inject(Auth).user()?.operator === true || inject(Router).createUrlTree(['/not-allowed']);
