import type { BomLine, EstimateResult } from '../../shared/schemas/estimate.js';
import type { ExportContext } from './context.js';
import { writeCsv, type CsvRow } from '../../shared/tables/csv.js';

/**
 * The bill of materials as CSV, for the buyer: one row per line, then — when a catalog priced
 * the estimate — net, tax (with its rate) and gross, and the currency. Prices are major units as
 * the estimate gives them (already summed in minor units by the engine); the currency code is in
 * the price headers. Columns are listed in docs/exports.md.
 */

/** The catalog item a line lacks, in words: `missing driver: voltageV 24, ratingW 150`. */
export function missingNote(line: BomLine): string | undefined {
  if (!line.missing) return undefined;
  const fields = Object.entries(line.missing.fields).map(([k, v]) => `${k} ${String(v)}`);
  return `missing ${line.missing.kind}${fields.length ? `: ${fields.join(', ')}` : ''}`;
}

/** A line's note and what the catalog lacks for it, as one text. */
export function bomLineNote(line: BomLine): string | undefined {
  const parts = [line.note, missingNote(line)].filter((p): p is string => !!p);
  return parts.length ? parts.join('; ') : undefined;
}

/** The estimate's currency: the pricing's, else the answer's own (older answers). */
export function bomCurrency(result: EstimateResult): string | undefined {
  return result.pricing?.currency ?? result.currency;
}

export const BOM_COLUMNS = ['sku', 'category', 'description', 'quantity', 'unit', 'unit price', 'line total', 'note'] as const;

export function bomCsv(result: EstimateResult, _context: ExportContext = {}): string {
  const currency = bomCurrency(result);
  const money = (name: string) => (currency ? `${name} (${currency})` : name);
  const header = BOM_COLUMNS.map((c) => (c === 'unit price' || c === 'line total' ? money(c) : c));
  const rows: CsvRow[] = result.bom.map((line) => [
    line.sku,
    line.category,
    line.description,
    line.quantity,
    line.unit,
    line.unitPrice,
    line.lineTotal,
    bomLineNote(line),
  ]);
  const totals: CsvRow[] = [];
  const pricing = result.pricing;
  if (pricing) {
    const incomplete = pricing.complete ? undefined : `${pricing.unpricedLines} line${pricing.unpricedLines === 1 ? '' : 's'} not priced: totals cover the priced lines only`;
    totals.push(
      [],
      [null, null, 'net', null, null, null, pricing.net, incomplete],
      [null, null, `tax ${pricing.taxRatePercent} %`, null, null, null, pricing.tax, null],
      [null, null, 'gross', null, null, null, pricing.gross, null],
      [null, null, 'currency', null, pricing.currency, null, null, null],
    );
  }
  return writeCsv([header, ...rows, ...totals], { rectangular: true });
}
