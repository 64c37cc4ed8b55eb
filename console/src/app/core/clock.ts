import { InjectionToken } from '@angular/core';

/** The console's idea of "now", injectable so tests can fix it. */
export const CLOCK = new InjectionToken<() => Date>('CLOCK', {
  providedIn: 'root',
  factory: () => () => new Date(),
});
