/** One entry of the console's side navigation. */
export interface Destination {
  path: string;
  label: string;
  /** A name registered by provideConsoleIcons, e.g. `tw:status`. */
  icon: string;
}

export const DESTINATIONS: readonly Destination[] = [
  { path: '/status', label: 'Status', icon: 'tw:status' },
];
