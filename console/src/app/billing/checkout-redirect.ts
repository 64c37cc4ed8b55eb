import { DOCUMENT, InjectionToken, inject } from '@angular/core';

/** Sends the browser to another site (the payment provider's checkout page); a token so specs can catch it. */
export const LEAVE_FOR = new InjectionToken<(url: string) => void>('LEAVE_FOR', {
  providedIn: 'root',
  factory: () => {
    const location = inject(DOCUMENT).location;
    return (url: string) => location.assign(url);
  },
});
