import type { Catalog } from '../../shared/schemas/catalog.js';
import type { BatchDetail, EstimateBatchItemResult } from '../../shared/schemas/estimate-batch.js';
import type { EstimateInput } from '../../shared/schemas/estimate.js';
import { csvRecordItem, ndjsonLineItem } from '../../shared/sizing/batch/input-items.js';
import { internalErrorItem, sizeBatchItem } from '../../shared/sizing/batch/items.js';
import { batchResultRow } from '../../shared/sizing/batch/result-row.js';
import { estimate } from '../../shared/sizing/estimate/estimate.js';
import { writeCsv } from '../../shared/tables/csv.js';

export type BatchFormat = 'csv' | 'ndjson';

/** A run of consecutive input rows, sized by one worker in one go (fewer messages than row by row). */
export interface ChunkTask {
  /** Index of the first row (0-based, header not counted). */
  first: number;
  input: { kind: 'csv'; header: string[]; records: string[][] } | { kind: 'ndjson'; lines: string[] };
  detail: BatchDetail;
  format: BatchFormat;
  /** Prices rows that carry no catalog of their own and do not opt out, as the stored catalog does on the API. */
  catalog: Catalog | null;
}

export interface ChunkResult {
  /** The rows as the results file holds them (CSV records without header or BOM, or NDJSON lines). */
  text: string;
  /** Each row's answer for the summary; with `detail=full` without its `result` (the file has it). */
  items: EstimateBatchItemResult[];
}

function withoutResult(item: EstimateBatchItemResult): EstimateBatchItemResult {
  if (item.status !== 'ok') return item;
  const { result: _result, ...rest } = item;
  return rest;
}

/** Attaches the catalog the way the API attaches the stored one (priced-estimates.ts `prepare`). */
function withCatalog(input: EstimateInput, catalog: Catalog | null): EstimateInput {
  if (!catalog || input.catalog || input.useStoredCatalog === false) return input;
  return { ...input, catalog };
}

/**
 * Checks, sizes and renders a chunk with the shared batch functions (the ones the API's batch
 * routes use), so each row's bytes are what the API's results route writes for it.
 */
export function sizeChunk(task: ChunkTask): ChunkResult {
  const count = task.input.kind === 'csv' ? task.input.records.length : task.input.lines.length;
  const answers: EstimateBatchItemResult[] = [];
  for (let i = 0; i < count; i++) {
    const index = task.first + i;
    const checked = task.input.kind === 'csv' ? csvRecordItem(index, task.input.header, task.input.records[i]!) : ndjsonLineItem(index, task.input.lines[i]!);
    try {
      answers.push(sizeBatchItem(checked, task.detail, (input) => estimate(withCatalog(input, task.catalog))));
    } catch {
      // A fault of the engine in one row: answered as that row's problem, the run goes on (as on the API).
      answers.push(internalErrorItem(checked.index, checked.ref));
    }
  }
  const text =
    task.format === 'csv'
      ? writeCsv(answers.map(batchResultRow), { byteOrderMark: false })
      : answers.map((a) => `${JSON.stringify(a)}\n`).join('');
  const items = task.detail === 'full' ? answers.map(withoutResult) : answers;
  return { text, items };
}
