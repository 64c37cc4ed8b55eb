import { inject } from '@angular/core';
import { type CanActivateFn, Router } from '@angular/router';

import { Auth } from './auth.js';
import { type Capability, roleMay } from './capabilities.js';

/** Keeps a role away from a page whose every call the API would refuse it. */
export function requireRole(capability: Capability): CanActivateFn {
  return () => roleMay(inject(Auth).role(), capability) || inject(Router).createUrlTree(['/not-allowed']);
}
