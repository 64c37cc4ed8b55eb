/** The invented demo scenario (see DEVELOPERS.md); every name here is made up. */
export const demoOrganizations = [
  { slug: 'harbor-lane', name: 'Harbor Lane Lighting' },
  { slug: 'kestrel-finch', name: 'Kestrel & Finch Builders' },
  { slug: 'quayside-studio', name: 'Quayside Studio' },
] as const;

/**
 * Sign-in arrives with the accounts issue; until then the demo has organisations only and the
 * API is open. Printed at start so nobody hunts for a password that does not exist yet.
 */
export const DEMO_SIGN_IN_NOTE =
  'Demo organisations: harbor-lane, kestrel-finch, quayside-studio. Sign-in is not enabled yet; the API is open.';
