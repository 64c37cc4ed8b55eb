import type { Logger } from 'pino';
import type {
  BatchDetail,
  EstimateBatchItemResult,
  EstimateBatchSummary,
} from '../../shared/schemas/estimate-batch.js';
import type { EstimateInput, EstimateResult } from '../../shared/schemas/estimate.js';
import { SizingInputError } from '../../shared/tables/errors.js';
import { MAX_ANSWER_BYTES } from '../../shared/tables/limits.js';
import type { PricingCatalog } from './catalog.js';
import { createPricedEstimates } from './priced-estimates.js';

/** An item after its own validation: the parsed request, or the problem it answers. */
export type CheckedItem =
  | { index: number; ref: string | null; input: EstimateInput }
  | { index: number; ref: string | null; problem: { code: string; detail: string; errors?: { path: string; message: string }[] } };

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

function okItem(index: number, ref: string | null, result: EstimateResult, detail: BatchDetail): EstimateBatchItemResult {
  return {
    index,
    ref,
    status: 'ok',
    layout: result.layout,
    summary: result.summary,
    failingChecks: result.checks.filter((c) => c.status === 'fail').map((c) => c.id),
    warningChecks: result.checks.filter((c) => c.status === 'warn').map((c) => c.id),
    ...(result.bomTotal !== undefined ? { bomTotal: result.bomTotal } : {}),
    ...(result.currency !== undefined ? { currency: result.currency } : {}),
    ...(detail === 'full' ? { result } : {}),
  };
}

export function summarize(items: EstimateBatchItemResult[]): EstimateBatchSummary {
  const failing = new Map<string, number>();
  let ok = 0;
  let withFailingChecks = 0;
  for (const item of items) {
    if (item.status !== 'ok') continue;
    ok++;
    if (item.failingChecks.length) withFailingChecks++;
    for (const id of new Set(item.failingChecks)) failing.set(id, (failing.get(id) ?? 0) + 1);
  }
  return {
    items: items.length,
    ok,
    failed: items.length - ok,
    withFailingChecks,
    failingChecks: [...failing.entries()].map(([id, n]) => ({ id, items: n })).sort((a, b) => b.items - a.items || a.id.localeCompare(b.id)),
  };
}

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
    if ('problem' in item) {
      answers.push({ index: item.index, ref: item.ref, status: 'error', problem: item.problem });
      continue;
    }
    try {
      const result = await priced.run(organizationId, item.input);
      const bytes = detail === 'full' ? Buffer.byteLength(JSON.stringify(result)) : 0;
      if (bytes > MAX_ANSWER_BYTES) {
        answers.push({
          index: item.index,
          ref: item.ref,
          status: 'error',
          problem: { code: 'answer_too_large', detail: `This item's estimate would be ${bytes} bytes, over the ${MAX_ANSWER_BYTES}-byte ceiling. Size it in parts.` },
        });
        continue;
      }
      answers.push(okItem(item.index, item.ref, result, detail));
    } catch (err) {
      if (err instanceof SizingInputError) {
        answers.push({
          index: item.index,
          ref: item.ref,
          status: 'error',
          problem: { code: 'validation_failed', detail: 'The engine cannot size this input.', errors: [{ path: err.path.join('.'), message: err.message }] },
        });
        continue;
      }
      // A fault of ours in one item: logged, answered as that item's problem, the batch goes on.
      deps.logger.error({ err, index: item.index }, 'batch item failed');
      answers.push({ index: item.index, ref: item.ref, status: 'error', problem: { code: 'internal_error', detail: 'Something went wrong on our side sizing this item.' } });
    }
  }
  return answers;
}
