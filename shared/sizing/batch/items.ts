import { checkInput, type FieldError } from '../../schemas/check-input.js';
import type { BatchDetail, EstimateBatchItemResult, EstimateBatchSummary } from '../../schemas/estimate-batch.js';
import { estimateRequestSchema, type EstimateInput, type EstimateResult } from '../../schemas/estimate.js';
import { SizingInputError } from '../../tables/errors.js';
import { MAX_ANSWER_BYTES } from '../../tables/limits.js';

/**
 * One stair of a batch, from check to answer. The synchronous batch route, background batch jobs
 * and `treadwise batch --local` all size items through these functions, so the same row gives
 * the same answer (or the same problem) wherever it runs.
 */

export interface ItemProblem {
  code: string;
  detail: string;
  errors?: FieldError[];
}

/** An item after its own validation: the parsed request, or the problem it answers. */
export type CheckedItem =
  | { index: number; ref: string | null; input: EstimateInput }
  | { index: number; ref: string | null; problem: ItemProblem };

/** Validates one item with the schema POST /v1/estimates uses; a bad one becomes its problem. */
export function checkBatchItem(index: number, ref: string | null, request: unknown): CheckedItem {
  const checked = checkInput(estimateRequestSchema, request);
  if (checked.ok) return { index, ref, input: checked.data };
  return { index, ref, problem: { code: 'validation_failed', detail: 'The request does not match the schema.', errors: checked.errors } };
}

/** A sized item: headline figures, the ids of failing and warning checks, the total; `full` adds the estimate. */
export function okBatchItem(index: number, ref: string | null, result: EstimateResult, detail: BatchDetail): EstimateBatchItemResult {
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

export function errorBatchItem(index: number, ref: string | null, problem: ItemProblem): EstimateBatchItemResult {
  return { index, ref, status: 'error', problem };
}

const utf8 = new TextEncoder();

/**
 * Sizes one checked item with `run` (the engine, with whatever catalog prices it). The engine's
 * refusal and an answer over the single-estimate ceiling become the item's problem; any other
 * fault is the caller's to log and answer (see `internalErrorItem`), so one item never fails a batch.
 */
export function sizeBatchItem(item: CheckedItem, detail: BatchDetail, run: (input: EstimateInput) => EstimateResult): EstimateBatchItemResult {
  if ('problem' in item) return errorBatchItem(item.index, item.ref, item.problem);
  try {
    const result = run(item.input);
    if (detail === 'full') {
      const bytes = utf8.encode(JSON.stringify(result)).length;
      if (bytes > MAX_ANSWER_BYTES) {
        return errorBatchItem(item.index, item.ref, {
          code: 'answer_too_large',
          detail: `This item's estimate would be ${bytes} bytes, over the ${MAX_ANSWER_BYTES}-byte ceiling. Size it in parts.`,
        });
      }
    }
    return okBatchItem(item.index, item.ref, result, detail);
  } catch (err) {
    if (err instanceof SizingInputError) {
      return errorBatchItem(item.index, item.ref, {
        code: 'validation_failed',
        detail: 'The engine cannot size this input.',
        errors: [{ path: err.path.join('.'), message: err.message }],
      });
    }
    throw err;
  }
}

/** The answer for an item that hit a fault of ours: the batch goes on. */
export function internalErrorItem(index: number, ref: string | null): EstimateBatchItemResult {
  return errorBatchItem(index, ref, { code: 'internal_error', detail: 'Something went wrong on our side sizing this item.' });
}

/** Counts over answered items; check ids by how many items they fail in, most first. */
export function summarizeBatch(items: Iterable<EstimateBatchItemResult>): EstimateBatchSummary {
  const tally = new BatchTally();
  for (const item of items) tally.add(item);
  return tally.summary();
}

/** The same counts kept as items arrive, for batches too large to hold (jobs, the CLI's stream). */
export class BatchTally {
  private failing = new Map<string, number>();
  private count = 0;
  private ok = 0;
  private withFailingChecks = 0;

  add(item: EstimateBatchItemResult): void {
    this.count++;
    if (item.status !== 'ok') return;
    this.ok++;
    if (item.failingChecks.length) this.withFailingChecks++;
    for (const id of new Set(item.failingChecks)) this.failing.set(id, (this.failing.get(id) ?? 0) + 1);
  }

  summary(): EstimateBatchSummary {
    return {
      items: this.count,
      ok: this.ok,
      failed: this.count - this.ok,
      withFailingChecks: this.withFailingChecks,
      failingChecks: [...this.failing.entries()].map(([id, n]) => ({ id, items: n })).sort((a, b) => b.items - a.items || a.id.localeCompare(b.id)),
    };
  }
}
