/** Message when the flights do not add up to the stair's treads, else null (for schema refines). */
export function flightsMismatch(stair: { treads: number; flights?: readonly { treads: number }[] | undefined }): string | null {
  if (!stair.flights || stair.flights.length === 0) return null;
  const total = stair.flights.reduce((sum, f) => sum + f.treads, 0);
  return total === stair.treads ? null : `flights hold ${total} treads but the stair has ${stair.treads}`;
}
