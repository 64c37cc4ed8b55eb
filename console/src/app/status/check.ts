/** The outcome of one health check, as the status page shows it. */
export type Check<T> =
  | { state: 'checking' }
  | { state: 'healthy'; value: T }
  | { state: 'unavailable'; reason: string };

export type CheckState = Check<unknown>['state'];

export const CHECKING = { state: 'checking' } as const satisfies Check<never>;
