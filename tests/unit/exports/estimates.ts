import { parse } from 'csv-parse/sync';
import { estimateRequestSchema, type EstimateResult } from '../../../shared/schemas/estimate.js';
import { estimateExamples, harborLaneCatalog } from '../../../shared/schemas/estimate-examples.js';
import { estimate } from '../../../shared/sizing/estimate/estimate.js';

/** A real engine answer for one of the demo requests. */
export function run(name: keyof typeof estimateExamples, patch: Record<string, unknown> = {}): EstimateResult {
  return estimate(estimateRequestSchema.parse({ ...estimateExamples[name], ...patch }));
}

/** Reads an export back the way a spreadsheet importer would: csv-parse, strict column count. */
export function readCsv(text: string): string[][] {
  return parse(text, { bom: true, relax_column_count: false });
}

export interface ParsedBlock {
  title: string;
  header: string[];
  /** Rows as objects by header, empty padding cells left out. */
  rows: Record<string, string>[];
}

/** Splits a block-structured CSV at its empty rows: title row, header row, then the rows. */
export function readBlocks(text: string): ParsedBlock[] {
  const records = readCsv(text);
  const blocks: string[][][] = [[]];
  for (const record of records) {
    if (record.every((cell) => cell === '')) blocks.push([]);
    else blocks.at(-1)!.push(record);
  }
  return blocks.map(([titleRow, headerRow, ...rows]) => {
    const header = headerRow.filter((h, i) => h !== '' || i === 0);
    return {
      title: titleRow[0],
      header,
      rows: rows.map((r) => Object.fromEntries(header.map((h, i) => [h, r[i]]))),
    };
  });
}

export function block(blocks: ParsedBlock[], title: string): ParsedBlock {
  const found = blocks.find((b) => b.title === title);
  if (!found) throw new Error(`no block "${title}" among ${blocks.map((b) => b.title).join(', ')}`);
  return found;
}

/**
 * Harbor Lane's checkout priced by the engine from the demo catalog with a 20 % tax rate; `without`
 * drops catalog items by SKU, leaving their lines unpriced.
 */
export function pricedCheckout(without: readonly string[] = []): EstimateResult {
  const catalog = { ...harborLaneCatalog, taxRatePercent: 20, items: harborLaneCatalog.items.filter((i) => !without.includes(i.sku)) };
  return run('harborLaneCheckout', { catalog });
}
