/**
 * The plans the API starts with (migrations/0001, 0007, 0008). Plans are data and the API has no
 * route that lists them, so this is the console's copy; a plan it does not know is still shown,
 * and the API refuses an unknown one (`unknown_plan`).
 */
export const KNOWN_PLANS: ReadonlyArray<{ id: string; name: string; monthlyQuota: number }> = [
  { id: 'free', name: 'Free', monthlyQuota: 1_000 },
  { id: 'shop', name: 'Shop', monthlyQuota: 50_000 },
  { id: 'partner', name: 'Partner', monthlyQuota: 500_000 },
  { id: 'platform', name: 'Platform (internal)', monthlyQuota: 1_000_000_000 },
];

/** The plans to offer for an organisation: the known ones, and its own if the console does not know it. */
export function planChoices(currentPlanId: string): Array<{ id: string; name: string }> {
  const known = KNOWN_PLANS.map(({ id, name, monthlyQuota }) => ({ id, name: `${name} · ${monthlyQuota.toLocaleString('en')} units a month` }));
  return known.some((p) => p.id === currentPlanId) ? known : [...known, { id: currentPlanId, name: currentPlanId }];
}
