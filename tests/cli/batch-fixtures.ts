import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { alderRowCornerUnit, alderRowTownhouse, alderRowTreadPixels, alderRowWithRail, quaysideCorridor } from '../../shared/schemas/estimate-examples.js';
import { requestToRow, stairRowColumns } from '../../shared/schemas/stair-row.js';
import { writeCsv } from '../../shared/tables/csv.js';

/** One stair of a test batch: its reference and its request (valid or not). */
export interface BatchItem {
  ref?: string;
  request: unknown;
}

const EXAMPLES: readonly object[] = [alderRowTownhouse, alderRowCornerUnit, quaysideCorridor, alderRowWithRail, alderRowTreadPixels];

/**
 * `count` stairs from the documented examples (varied in width and treads so rows differ), with
 * bad rows among them: a word where a number goes, an unknown field, a negative width, a missing
 * block, an out-of-range voltage drop limit. Every 37th row has no reference.
 */
export function batchItems(count: number): BatchItem[] {
  return Array.from({ length: count }, (_, i) => {
    const base = structuredClone(EXAMPLES[i % EXAMPLES.length]) as Record<string, Record<string, unknown>>;
    const ref = i % 37 === 36 ? undefined : `Plot ${i + 1}`;
    if (base.staircase && typeof base.staircase.treadWidthMm === 'number') base.staircase.treadWidthMm = 700 + (i % 9) * 50;
    switch (i % 50) {
      case 11:
        return { ref, request: { ...base, staircase: { ...base.staircase, treads: 'fourteen' } } };
      case 23:
        return { ref, request: { ...base, cable: { maxDropPercnt: 4 } } };
      case 31:
        return { ref, request: { ...base, staircase: { ...base.staircase, treadWidthMm: -900 } } };
      case 40: {
        const { staircase: _missing, ...rest } = base;
        return { ref, request: rest };
      }
      case 47:
        return { ref, request: { ...base, cable: { maxDropPercent: 250 } } };
      default:
        return { ref, request: base };
    }
  });
}

export function tempDir(): string {
  return mkdtempSync(path.join(tmpdir(), 'treadwise-batch-'));
}

/** The items as a stair-row CSV (columns from the requests, rows by requestToRow, the shared writer). */
export function writeStairCsv(file: string, items: readonly BatchItem[]): void {
  const flat = items.map((item) => requestToRow(item.request, item.ref));
  // The schema's columns, then any a row adds (a misspelt field is a column of its own in a file).
  const columns = stairRowColumns(items.map((i) => i.request));
  for (const row of flat) for (const key of Object.keys(row)) if (!columns.includes(key)) columns.push(key);
  const rows = flat.map((row) => columns.map((c) => row[c]));
  writeFileSync(file, writeCsv([columns, ...rows]));
}

export function writeNdjson(file: string, items: readonly BatchItem[]): void {
  writeFileSync(file, items.map((i) => `${JSON.stringify(i)}\n`).join(''));
}
