import type { EstimateInput, EstimateResult } from '../../shared/schemas/estimate.js';
import { estimate } from '../../shared/sizing/estimate/estimate.js';
import type { PricingCatalog } from './catalog.js';

interface CatalogSource {
  pricingCatalog(organizationId: string): Promise<PricingCatalog | null>;
}

/**
 * Runs an estimate the way the API prices it: with the request's inline catalog when it sends one,
 * else with the organisation's stored catalog (active items) unless the request opts out — and
 * says in `pricing` which catalog and which version priced it.
 */
export function createPricedEstimates(catalog: CatalogSource, time: <T>(operation: string, work: () => T) => T = (_op, work) => work()) {
  return {
    /** The input the engine runs on: the stored catalog attached when it applies. */
    async prepare(organizationId: string, input: EstimateInput): Promise<{ input: EstimateInput; stored: PricingCatalog | null }> {
      if (input.catalog || input.useStoredCatalog === false) return { input, stored: null };
      const stored = await catalog.pricingCatalog(organizationId);
      return { input: stored ? { ...input, catalog: stored.catalog } : input, stored };
    },

    /** Marks a result priced by a stored catalog with its version. */
    label(result: EstimateResult, stored: PricingCatalog | null): EstimateResult {
      if (stored && result.pricing) {
        result.pricing.source = 'stored';
        result.pricing.catalogVersion = stored.version;
      }
      return result;
    },

    async run(organizationId: string, input: EstimateInput): Promise<EstimateResult> {
      const prepared = await this.prepare(organizationId, input);
      return this.label(
        time('estimate', () => estimate(prepared.input)),
        prepared.stored,
      );
    },
  };
}

export type PricedEstimates = ReturnType<typeof createPricedEstimates>;
