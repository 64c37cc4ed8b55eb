import { OPTION_POSITIONS, type KitChoices } from '../../schemas/estimate-options.js';

/** What the ranking reads of one passing design. */
export interface Rankable {
  /** The catalog holds an item for every line (no `missing` part). */
  fillable: boolean;
  netMinor: number;
  unpricedLines: number;
  warnings: number;
  choices: KitChoices;
}

export const RANKED_BY =
  'kits the catalog can fill completely first (no missing part), then net total (integer minor units; gross follows it, one tax rate on the whole), then fewer unpriced lines, then fewer warnings, then strip SKU, controller SKU, controller position and driver position (bottom, middle, top)';

const placeOrder = (p: KitChoices['driverPosition']) => (p === 'given' ? -1 : OPTION_POSITIONS.indexOf(p));
const text = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);

/** Fillable kits first, then cheapest; the tie-break ends on the choices themselves, so the order never depends on search order. */
export function compareDesigns(a: Rankable, b: Rankable): number {
  return (
    Number(!a.fillable) - Number(!b.fillable) ||
    a.netMinor - b.netMinor ||
    a.unpricedLines - b.unpricedLines ||
    a.warnings - b.warnings ||
    text(a.choices.stripSku, b.choices.stripSku) ||
    text(a.choices.controllerSku, b.choices.controllerSku) ||
    placeOrder(a.choices.controllerPosition) - placeOrder(b.choices.controllerPosition) ||
    placeOrder(a.choices.driverPosition) - placeOrder(b.choices.driverPosition)
  );
}
