import { minorUnitDigits, type Catalog } from '../../schemas/catalog.js';
import type { CartLine, EstimatePricing, EstimateResult } from '../../schemas/estimate.js';
import type { KitDesign } from '../../schemas/estimate-options.js';

/** Which catalog priced the kits: the request's own, or the organisation's stored one at a version. */
export interface PricingSource {
  source: EstimatePricing['source'];
  catalogVersion: number | null;
}

/** A design's price in integer minor units, so ranking and the budget never compare floats. */
export interface KitPrice {
  pricing: EstimatePricing;
  netMinor: number;
  grossMinor: number;
  cart: CartLine[];
  unpriced: KitDesign['unpriced'];
  /** No line names a part the catalog lacks. */
  fillable: boolean;
}

/** The engine's pricing of one sized candidate (it always prices against an attached catalog), labelled with its source. */
export function priceOf(result: EstimateResult, catalog: Catalog, source: PricingSource): KitPrice {
  if (!result.pricing || !result.cart) throw new Error('a candidate is always sized with its catalog attached');
  const scale = 10 ** minorUnitDigits(catalog.currency);
  const unpriced: KitDesign['unpriced'] = [];
  for (const l of result.bom) {
    if (l.lineTotal !== undefined) continue;
    const line: KitDesign['unpriced'][number] = { category: l.category, description: l.description, quantity: l.quantity };
    if (l.note !== undefined) line.note = l.note;
    if (l.missing !== undefined) line.missing = l.missing;
    unpriced.push(line);
  }
  return {
    pricing: { ...result.pricing, source: source.source, catalogVersion: source.catalogVersion },
    netMinor: Math.round(result.pricing.net * scale),
    grossMinor: Math.round(result.pricing.gross * scale),
    cart: result.cart,
    unpriced,
    fillable: unpriced.every((l) => l.missing === undefined),
  };
}
