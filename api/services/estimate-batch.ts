import type { Logger } from 'pino';
import type { BatchDetail, EstimateBatchItemResult } from '../../shared/schemas/estimate-batch.js';
import { internalErrorItem, sizeBatchItem, summarizeBatch, type CheckedItem } from '../../shared/sizing/batch/items.js';
import { estimate } from '../../shared/sizing/estimate/estimate.js';
import type { PricingCatalog } from './catalog.js';
import { createPricedEstimates } from './priced-estimates.js';

export type { CheckedItem };

/** Items sized between two yields to the event loop, so other requests keep being answered. */
const ITEMS_PER_SLICE = 20;

interface CatalogSource {
  pricingCatalog(organizationId: string): Promise<PricingCatalog | null>;
}

/** The stored catalog read once per batch: every item is priced from the same version. */
function readOnce(source: CatalogSource): CatalogSource {
  const seen = new Map<string, Promise<PricingCatalog | null>>();
  return {
    pricingCatalog(organizationId) {
      let found = seen.get(organizationId);
      if (!found) seen.set(organizationId, (found = source.pricingCatalog(organizationId)));
      return found;
    },
  };
}

/** Counts over the answered items (see shared/sizing/batch). */
export const summarize = summarizeBatch;

/**
 * Sizes a checked batch item by item, priced as POST /v1/estimates prices (the request's inline
 * catalog, else the organisation's stored one). An item the engine refuses, or whose own answer
 * would pass the single-estimate ceiling, answers its problem; the others are unaffected.
 * `stillWanted` is asked between slices: a client that has gone stops the work.
 */
export async function runBatch(
  deps: { catalog: CatalogSource; logger: Logger },
  organizationId: string,
  items: CheckedItem[],
  detail: BatchDetail,
  stillWanted: () => boolean = () => true,
): Promise<EstimateBatchItemResult[]> {
  const priced = createPricedEstimates(readOnce(deps.catalog));
  const answers: EstimateBatchItemResult[] = [];
  for (const item of items) {
    if (item.index > 0 && item.index % ITEMS_PER_SLICE === 0) {
      await new Promise((resolve) => setImmediate(resolve));
      if (!stillWanted()) break;
    }
    try {
      // The stored catalog is read once per batch (readOnce), so awaiting it per item costs nothing.
      const prepared = 'input' in item ? await priced.prepare(organizationId, item.input) : null;
      answers.push(sizeBatchItem(prepared ? { ...item, input: prepared.input } : item, detail, (input) => priced.label(estimate(input), prepared?.stored ?? null)));
    } catch (err) {
      // A fault of ours in one item: logged, answered as that item's problem, the batch goes on.
      deps.logger.error({ err, index: item.index }, 'batch item failed');
      answers.push(internalErrorItem(item.index, item.ref));
    }
  }
  return answers;
}
