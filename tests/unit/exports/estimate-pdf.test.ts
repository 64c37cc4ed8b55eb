import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';
import { beforeAll, describe, expect, it } from 'vitest';
import { estimatePdf, money } from '../../../api/exports/estimate-pdf.js';
import { printedText } from '../../../api/exports/pdf-fonts.js';
import { pricedCheckout, run } from './estimates.js';

interface ReadPdf {
  pages: number;
  /** The text of every page, whitespace removed (line wrapping moves it). */
  text: string;
  info: Record<string, unknown>;
}

/** Opens the PDF the way a reader would, with pdfjs, and takes its text and metadata. */
async function readPdf(pdf: Buffer): Promise<ReadPdf> {
  const doc = await getDocument({ data: new Uint8Array(pdf), useSystemFonts: false, disableFontFace: true, isEvalSupported: false }).promise;
  let text = '';
  for (let i = 1; i <= doc.numPages; i++) {
    const content = await (await doc.getPage(i)).getTextContent();
    text += content.items.map((item) => ('str' in item ? item.str : '')).join('');
  }
  const { info } = await doc.getMetadata();
  const pages = doc.numPages;
  await doc.destroy();
  return { pages, text: squeeze(text), info: info as Record<string, unknown> };
}

const squeeze = (text: string) => text.replace(/\s+/g, '');
/** What a text looks like in the PDF: signs Fira Sans lacks are spelt out (→ as ->). */
const inPdf = (text: string) => squeeze(printedText(text));

const context = {
  estimateId: 'est_4kq7',
  createdAt: '2026-12-01T09:30:00Z',
  clientName: 'Kestrel & Finch Builders',
  siteAddress: 'Alder Row 12, Łódź Lane',
  projectName: 'Alder Row',
  stairName: 'House 12 main stair',
  ranBy: 'theo@harborlane.test',
};

describe('the estimate PDF', () => {
  // Priced by the engine as in bom-csv.test.ts: 472.90 EUR net, 20 % tax 94.58, gross 567.48;
  // named as a stored catalog's version 21 would be, to show where the PDF prints it.
  const priced = pricedCheckout();
  const checkout = { ...priced, pricing: { ...priced.pricing!, source: 'stored' as const, catalogVersion: 21 } };
  let pdf: Buffer;
  let read: ReadPdf;
  beforeAll(async () => {
    pdf = await estimatePdf(checkout, context);
    read = await readPdf(pdf);
  });

  it('opens in a PDF reader and holds the cautions in full, every check, and the totals', () => {
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect(read.pages).toBeGreaterThan(1);
    expect(checkout.cautions.length).toBeGreaterThan(3);
    for (const caution of checkout.cautions) expect(read.text).toContain(inPdf(caution.message));
    for (const check of checkout.checks) {
      expect(read.text).toContain(inPdf(check.message));
      if (check.suggestion) expect(read.text).toContain(inPdf(check.suggestion));
    }
    expect(read.text).toContain(squeeze('net472.90 EUR'));
    expect(read.text).toContain(squeeze('tax 20 %94.58 EUR'));
    expect(read.text).toContain(squeeze('gross567.48 EUR'));
    // By hand: 3 reels × 39.00 EUR = 117.00 EUR on the strip line.
    expect(read.text).toContain(squeeze('39.00 EUR117.00 EUR'));
  });

  it('names the client, site, project, stair, estimate and catalog version, in Fira Sans', () => {
    for (const value of [context.clientName, context.siteAddress, context.projectName, context.stairName, context.estimateId, context.ranBy, 'catalog version 21', `engine ${checkout.engineVersion}`]) {
      expect(read.text).toContain(squeeze(value));
    }
    expect(read.info.Title).toBe('Estimate: House 12 main stair');
    expect(read.info.CreationDate).toBe('D:20261201093000Z');
    // The fonts are embedded, not referenced: their names sit in the font dictionaries.
    expect(pdf.includes('FiraSans')).toBe(true);
    expect(pdf.includes('/FontFile2')).toBe(true);
  });

  it('renders the same estimate and context to the same bytes', async () => {
    expect((await estimatePdf(checkout, context)).equals(pdf)).toBe(true);
  });

  it('shows a price-free estimate unpriced, with its wiring schedule, pixel runs and cut plan', async () => {
    const corridor = run('quaysideCorridor');
    const read = await readPdf(await estimatePdf(corridor));
    expect(read.text).toContain(squeeze('Not priced'));
    expect(read.text).not.toContain('gross');
    for (const caution of corridor.cautions) expect(read.text).toContain(inPdf(caution.message));
    expect(read.text).toContain(squeeze('Pixel runs and data'));
    expect(read.text).toContain(squeeze(`${corridor.pixels.rail!.pixels}`));

    const stair = run('alderRowTownhouse');
    const stairText = (await readPdf(await estimatePdf(stair))).text;
    expect(stairText).toContain(squeeze('Reels and cut plan'));
    // By hand: five 850 mm pieces from a 5000 mm reel leave 5000 − 5 × 850 = 750 mm.
    expect(stairText).toContain(squeeze('850 + 850 + 850 + 850 + 850750'));
  });

  it('writes amounts with the currency’s minor-unit digits', () => {
    expect(money(372.48, 'EUR')).toBe('372.48 EUR');
    expect(money(0.9, 'EUR')).toBe('0.90 EUR');
    expect(money(1200, 'JPY')).toBe('1200 JPY'); // ISO 4217: the yen has no minor unit
  });
});
