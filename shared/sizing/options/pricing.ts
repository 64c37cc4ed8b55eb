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

/** Tax on a net total, rounded half up to the minor unit; the rate has at most two decimals. */
function taxMinor(netMinor: number, ratePercent: number): number {
  const basisPoints = Math.round(ratePercent * 100);
  return Math.floor((netMinor * basisPoints + 5000) / 10_000);
}

/** The BOM's priced lines as a basket takes them, one line per SKU and unit price. */
function cartOf(result: EstimateResult): CartLine[] {
  const lines = new Map<string, CartLine>();
  for (const l of result.bom) {
    if (l.sku === undefined || l.unitPrice === undefined || l.lineTotal === undefined) continue;
    const key = `${l.sku}\u0000${l.unitPrice}`;
    const known = lines.get(key);
    if (known) known.quantity += l.quantity;
    else lines.set(key, { sku: l.sku, quantity: l.quantity, unitPrice: l.unitPrice });
  }
  return [...lines.values()];
}

/**
 * Net, tax and gross of one sized candidate. The engine's own pricing and cart are taken when it
 * gives them; otherwise they are worked out here from its BOM total and the catalog's tax rate.
 */
export function priceOf(result: EstimateResult, catalog: Catalog, source: PricingSource): KitPrice {
  const scale = 10 ** minorUnitDigits(catalog.currency);
  const unpriced: KitDesign['unpriced'] = [];
  for (const l of result.bom) {
    if (l.lineTotal !== undefined) continue;
    const line: KitDesign['unpriced'][number] = { category: l.category, description: l.description, quantity: l.quantity };
    if (l.note !== undefined) line.note = l.note;
    if (l.missing !== undefined) line.missing = l.missing;
    unpriced.push(line);
  }
  const cart = result.cart ?? cartOf(result);
  if (result.pricing) {
    return {
      pricing: { ...result.pricing, source: source.source, catalogVersion: source.catalogVersion },
      netMinor: Math.round(result.pricing.net * scale),
      grossMinor: Math.round(result.pricing.gross * scale),
      cart,
      unpriced,
      fillable: unpriced.every((l) => l.missing === undefined),
    };
  }
  const netMinor = Math.round((result.bomTotal ?? 0) * scale);
  const rate = catalog.taxRatePercent ?? 0;
  const grossMinor = netMinor + taxMinor(netMinor, rate);
  return {
    pricing: {
      source: source.source,
      catalogVersion: source.catalogVersion,
      currency: catalog.currency,
      taxRatePercent: rate,
      net: netMinor / scale,
      tax: (grossMinor - netMinor) / scale,
      gross: grossMinor / scale,
      complete: unpriced.length === 0,
      unpricedLines: unpriced.length,
    },
    netMinor,
    grossMinor,
    cart,
    unpriced,
    fillable: unpriced.every((l) => l.missing === undefined),
  };
}
