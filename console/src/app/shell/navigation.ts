import type { Role } from '../core/api-types.js';
import { type Capability, roleMay } from '../core/capabilities.js';

/** One entry of the console's side navigation. */
export interface Destination {
  path: string;
  label: string;
  /** A name registered by provideConsoleIcons, e.g. `tw:status`. */
  icon: string;
  /** Shown only to roles that may do this; absent: every signed-in user. */
  needs?: Capability;
}

export const DESTINATIONS: readonly Destination[] = [
  { path: '/keys', label: 'Keys', icon: 'tw:key', needs: 'keys:manage' },
  { path: '/projects', label: 'Projects', icon: 'tw:stair', needs: 'projects:read' },
  { path: '/catalog', label: 'Catalog', icon: 'tw:catalog', needs: 'catalog:read' },
  { path: '/status', label: 'Status', icon: 'tw:status' },
];

export function destinationsFor(role: Role | null): Destination[] {
  return DESTINATIONS.filter((d) => !d.needs || roleMay(role, d.needs));
}
