import { minorUnitDigits } from '../../shared/schemas/catalog.js';
import type { EstimateCheck, EstimateResult } from '../../shared/schemas/estimate.js';
import { bomCurrency, bomLineNote } from './bom-csv.js';
import { contextLines, createdAtIso, type ExportContext } from './context.js';
import { conductorLabel, dataGaps, flightOfTread, pixelRuns } from './estimate-facts.js';
import { FONT_FAMILY, pdfmakeWithFonts, textRuns } from './pdf-fonts.js';

/**
 * The printable estimate: what an installer takes to site and a client keeps — who and where,
 * the stair in figures, the wiring schedule, supply, cable, reels and cut plan, the priced bill of
 * materials, every check with what to change, and the cautions in full. Plain A4, Fira Sans, the
 * console's deep blue-green for headings. Rendered with pdfmake on the server; the same estimate
 * and context give the same bytes (the creation date is the context's).
 */

// pdfmake's document definition is plain JSON-like data; these names keep the builders readable.
type Node = Record<string, unknown> | string;
type Cell = Record<string, unknown>;

const INK = '#1d2b2d';
const HEADING = '#13585f'; // the console palette's primary seed
const MUTED = '#5b6b6d';
const STATUS_COLOUR = { pass: '#27676e', warn: '#8a5a00', fail: '#b3261e' } as const;

/** Text in the font subsets that hold it (see pdf-fonts.ts). */
const txt = (text: string, style: Record<string, unknown> = {}): Cell => ({ text: textRuns(text), ...style });

/** A number rounded to at most `digits` decimals, without trailing zeros. */
export function num(value: number | null | undefined, digits = 3): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '–';
  return String(Number(value.toFixed(digits)));
}

/** An amount in a currency, with the currency's minor-unit digits: `300.60 EUR`. */
export function money(amount: number | undefined, currency: string | undefined): string {
  if (amount === undefined) return '';
  const digits = currency ? minorUnitDigits(currency) : 2;
  return `${amount.toFixed(digits)}${currency ? ` ${currency}` : ''}`;
}

const heading = (text: string): Node => ({ ...txt(text), style: 'h2', headlineLevel: 1 });
const note = (text: string): Node => ({ ...txt(text), style: 'note' });

/** A table with a header row that repeats on every page it runs over. */
function table(header: string[], rows: (string | Cell)[][], widths?: (string | number)[], alignRight: number[] = []): Node {
  const cell = (value: string | Cell, column: number): Cell => {
    const base = typeof value === 'string' ? txt(value) : value;
    return alignRight.includes(column) ? { alignment: 'right', ...base } : base;
  };
  return {
    table: {
      headerRows: 1,
      keepWithHeaderRows: 1,
      dontBreakRows: true,
      widths: widths ?? header.map(() => 'auto'),
      body: [header.map((h, i) => ({ ...cell(h, i), style: 'th' })), ...rows.map((r) => r.map(cell))],
    },
    layout: 'lightHorizontalLines',
    style: 'table',
  };
}

/** Two columns of label and value. */
function facts(pairs: [string, string][]): Node {
  return {
    table: { widths: [130, '*'], body: pairs.map(([label, value]) => [txt(label, { color: MUTED }), txt(value)]) },
    layout: 'noBorders',
    style: 'table',
  };
}

function titleBlock(result: EstimateResult, context: ExportContext): Node[] {
  const kind = result.treads.length ? 'Stair lighting estimate' : 'Lighting estimate';
  const title = context.stairName ? `${kind}: ${context.stairName}` : kind;
  const meta = [
    context.estimateId && `estimate ${context.estimateId}`,
    createdAtIso(context) && `run ${createdAtIso(context)!.slice(0, 16).replace('T', ' ')} UTC`,
    `engine ${result.engineVersion}`,
    result.pricing?.catalogVersion != null && `catalog version ${result.pricing.catalogVersion}`,
  ].filter((x): x is string => typeof x === 'string');
  const who = contextLines(context).filter(([label]) => ['client', 'site', 'project', 'stair', 'run by'].includes(label));
  return [{ ...txt(title), style: 'h1' }, note(meta.join(' · ')), ...(who.length ? [facts(who)] : [])];
}

function summaryBlock(result: EstimateResult): Node[] {
  const s = result.summary;
  const onTreads = s.treads > 0;
  const pairs: [string, string][] = [
    ['layout', result.layout],
    ...(onTreads ? [['treads (lit)', `${s.treads} (${s.litTreads})`] as [string, string]] : []),
    ['controllers', String(s.controllers)],
    ['total load', `${num(s.totalLoadW, 1)} W`],
    ['drivers', String(s.driverCount)],
    ...(onTreads ? [['longest lead', `${num(s.longestRunM, 2)} m`] as [string, string]] : []),
    ...(s.longestFeederM !== undefined ? [['longest feeder', `${num(s.longestFeederM, 2)} m`] as [string, string]] : []),
    ['worst drop, driver to strip', `${num(s.worstDropPercent, 2)} %`],
    ['motion sensors', String(s.motionSensors)],
    ['reels', String(s.reels)],
    ['checks', `${s.checks.pass} pass, ${s.checks.warn} warn, ${s.checks.fail} fail`],
  ];
  if (result.pricing) pairs.push(['total (gross)', money(result.pricing.gross, result.pricing.currency)]);
  return [heading('At a glance'), facts(pairs)];
}

function treadBlock(result: EstimateResult, context: ExportContext): Node[] {
  if (result.treads.length === 0 && (result.landings ?? []).length === 0) return [];
  const flightOf = flightOfTread(result, context);
  const out: Node[] = [heading('Wiring schedule')];
  if (result.treads.length) {
    out.push(
      table(
        ['tread', 'flight', 'ctrl / out', 'strip mm', 'W', 'A', 'cable', 'lead m', 'conductor', 'drop %', 'from driver %'],
        result.treads.map((t) => [
          String(t.index),
          flightOf(t.index)?.toString() ?? '–',
          `${t.controller ?? '–'} / ${t.output ?? '–'}`,
          num(t.stripLengthMm, 0),
          num(t.powerW, 2),
          num(t.currentA, 3),
          t.cableKind,
          num(t.cableLengthM, 2),
          conductorLabel(t),
          num(t.dropPercent, 2),
          num(t.pathDropPercent, 2),
        ]),
        undefined,
        [0, 3, 4, 5, 7, 9, 10],
      ),
    );
  }
  const landings = result.landings ?? [];
  if (landings.length) {
    out.push(
      note('Lit landings'),
      table(
        ['landing', 'after tread', 'ctrl / out', 'strip mm', 'W', 'A', 'lead m', 'conductor', 'drop %'],
        landings.map((l) => [
          String(l.landing),
          String(l.belowTread),
          `${l.controller ?? '–'} / ${l.output ?? '–'}`,
          num(l.stripLengthMm, 0),
          num(l.powerW, 2),
          num(l.currentA, 3),
          num(l.cableLengthM, 2),
          conductorLabel(l),
          num(l.dropPercent, 2),
        ]),
      ),
    );
  }
  return out;
}

function supplyBlock(result: EstimateResult): Node[] {
  const out: Node[] = [heading('Drivers and circuits')];
  out.push(
    table(
      ['rail', 'feeds', 'load W', 'needs W', 'drivers', 'loading %'],
      result.drivers.map((d) => [
        `${num(d.voltageV)} V`,
        d.loads.join(', '),
        num(d.loadW, 1),
        num(d.requiredRatingW, 1),
        d.drivers.map((g) => `${g.count} × ${num(g.ratingW)} W${g.sku ? ` ${g.sku}` : ''}`).join(', ') || 'none available',
        num(d.loadingPercent, 1),
      ]),
    ),
  );
  if (result.circuits.length) {
    out.push(
      note('One driver per circuit; driver outputs are never paralleled.'),
      table(
        ['circuit', 'feeds', 'load', 'driver', 'loading %', 'fuses A', 'protected by', 'worst drop %'],
        result.circuits.map((c) => [
          String(c.circuit),
          c.name,
          `${num(c.loadW, 1)} W, ${num(c.currentA, 2)} A at ${num(c.voltageV)} V`,
          c.driver ? `${num(c.driver.ratingW)} W${c.driver.sku ? ` ${c.driver.sku}` : ''}` : 'none fits',
          c.driver ? num(c.driver.loadingPercent, 1) : '–',
          c.fusesA.map((f) => (f === null ? 'none fits' : num(f))).join(', '),
          c.protectedBy,
          num(c.worstPathDropPercent, 2),
        ]),
      ),
    );
  }
  if (result.feeder.runs.length) {
    out.push(
      note(`Feeders (each ${num(result.feeder.lengthM, 2)} m off the run, plus its distance along it)`),
      table(
        ['circuit', 'to', 'count', 'A', 'length m', 'conductor', 'drop %', 'to farthest strip %', 'fuse A'],
        result.feeder.runs.map((f) => [
          String(f.circuit),
          f.to === 'controller' ? `controller ${f.controller ?? '–'}${f.powerInput ? `, input ${f.powerInput}` : ''}` : `feed point ${f.feedPoint ?? '–'}`,
          String(f.count),
          num(f.currentA, 2),
          num(f.lengthM, 2),
          conductorLabel(f),
          num(f.dropPercent, 2),
          num(f.pathDropPercent, 2),
          f.fuseA === null ? 'none fits' : num(f.fuseA),
        ]),
      ),
    );
  }
  return out;
}

function pixelBlock(result: EstimateResult): Node[] {
  const runs = pixelRuns(result);
  if (runs.length === 0) return [];
  const gaps = dataGaps(result);
  return [
    heading('Pixel runs and data'),
    table(
      ['run', 'pixels', 'length m', 'voltage', 'protocol', 'outputs', 'refresh Hz', 'power W', 'brightness %', 'feed points'],
      runs.map((r) => [r.run, String(r.pixels), num(r.lengthM, 2), `${num(r.voltageV)} V`, r.protocol, String(r.dataOutputs), num(r.maxRefreshHz, 1), num(r.powerW, 1), num(r.brightnessPercent), String(r.feedPoints)]),
    ),
    ...(gaps.length
      ? [
          note('Data gaps (each unbuffered one-wire gap is checked on its own)'),
          table(
            ['run', 'gap', 'ctrl / out', 'into tread', 'length m', 'limit m', 'within'],
            gaps.map((g) => [g.run, g.kind, `${g.controller ?? '–'} / ${g.output ?? '–'}`, g.tread?.toString() ?? '–', num(g.lengthM, 2), num(g.limitM, 2), g.withinLimit ? 'yes' : 'NO']),
          ),
        ]
      : []),
  ];
}

function cableBlock(result: EstimateResult): Node[] {
  const out: Node[] = [heading('Cable')];
  if (result.cables.length) {
    out.push(
      table(
        ['use', 'cores', 'conductor', 'runs', 'total m', 'to order m'],
        result.cables.map((c) => [c.use, String(c.cores), conductorLabel(c), String(c.runs), num(c.totalLengthM, 2), String(c.orderLengthM)]),
      ),
    );
  }
  const { placements, sensorCableM } = result.sensors;
  if (placements.length) {
    out.push(
      note(`Sensor cable${sensorCableM !== undefined ? `: ${num(sensorCableM, 2)} m in total` : ''}`),
      table(
        ['sensor', 'flight', 'tread', 'cable m'],
        placements.map((p) => [p.role, p.flight?.toString() ?? '–', p.tread?.toString() ?? '–', num(p.cableLengthM, 2)]),
      ),
    );
  }
  return out;
}

function reelBlock(result: EstimateResult): Node[] {
  const { treads, rail } = result.reels;
  if (!treads && !rail) return [];
  const out: Node[] = [heading('Reels and cut plan')];
  if (treads) {
    out.push(
      note(
        `${treads.reels} reel${treads.reels === 1 ? '' : 's'} of ${num(treads.reelLengthMm, 0)} mm${treads.sku ? ` (${treads.sku})` : ''}, ` +
          `${num(treads.totalWasteMm, 0)} mm left over${treads.provenOptimal ? '; no plan uses fewer reels' : ''}.`,
      ),
      table(
        ['reel', 'pieces mm', 'left over mm'],
        treads.plan.map((p) => [String(p.reel), p.piecesMm.map((mm) => num(mm, 0)).join(' + '), num(p.wasteMm, 0)]),
        [40, '*', 70],
      ),
    );
    if (treads.unplaceableTreads.length) out.push(note(`Longer than a reel (needs a joint): treads ${treads.unplaceableTreads.join(', ')}.`));
  }
  if (rail) {
    out.push(note(`Rail: ${rail.reels} reel${rail.reels === 1 ? '' : 's'} of ${num(rail.reelLengthMm, 0)} mm${rail.sku ? ` (${rail.sku})` : ''} for ${num(rail.lengthM, 2)} m, ${rail.joints} joint${rail.joints === 1 ? '' : 's'}.`));
  }
  return out;
}

function bomBlock(result: EstimateResult): Node[] {
  const currency = bomCurrency(result);
  const rows = result.bom.map((line) => {
    const noteText = bomLineNote(line);
    const description: Cell = { stack: [txt(line.description), ...(noteText ? [txt(noteText, { style: 'note' })] : [])] };
    return [line.sku ?? '–', description, `${line.quantity} ${line.unit}`, money(line.unitPrice, currency), money(line.lineTotal, currency)];
  });
  const out: Node[] = [heading('Bill of materials'), table(['SKU', 'item', 'quantity', 'unit price', 'line total'], rows, [70, '*', 55, 65, 70], [2, 3, 4])];
  const pricing = result.pricing;
  if (pricing) {
    out.push({
      unbreakable: true,
      table: {
        widths: ['*', 90],
        body: [
          [txt('net', { alignment: 'right' }), txt(money(pricing.net, pricing.currency), { alignment: 'right' })],
          [txt(`tax ${num(pricing.taxRatePercent, 2)} %`, { alignment: 'right' }), txt(money(pricing.tax, pricing.currency), { alignment: 'right' })],
          [txt('gross', { alignment: 'right', bold: true }), txt(money(pricing.gross, pricing.currency), { alignment: 'right', bold: true })],
        ],
      },
      layout: 'noBorders',
      style: 'table',
    });
    if (!pricing.complete) out.push(note(`${pricing.unpricedLines} line${pricing.unpricedLines === 1 ? ' is' : 's are'} not priced: the totals cover the priced lines only.`));
  } else {
    out.push(note('Not priced: no catalog priced this estimate, so the bill shows quantities only.'));
  }
  return out;
}

function checkCell(check: EstimateCheck): Cell {
  return {
    stack: [
      txt(check.message),
      ...(check.suggestion ? [txt(`What to change: ${check.suggestion}`, { bold: true })] : []),
      txt(check.reference, { style: 'note' }),
    ],
  };
}

function checkBlock(result: EstimateResult): Node[] {
  return [
    heading('Checks'),
    table(
      ['status', 'check', 'finding'],
      result.checks.map((c) => [txt(c.status.toUpperCase(), { bold: true, color: STATUS_COLOUR[c.status] }), c.id, checkCell(c)]),
      [36, 95, '*'],
    ),
  ];
}

function cautionBlock(result: EstimateResult): Node[] {
  return [
    heading('Cautions'),
    note('Read before installing. Local wiring rules and licensed practice take precedence over every figure in this estimate.'),
    { ul: result.cautions.map((c) => txt(c.message, { margin: [0, 0, 0, 4] })), style: 'body' },
  ];
}

/** The document definition pdfmake renders (exported so its structure can be inspected). */
export function estimateDocument(result: EstimateResult, context: ExportContext = {}): Record<string, unknown> {
  const created = createdAtIso(context);
  const footerText = ['Treadwise', context.estimateId && `estimate ${context.estimateId}`].filter(Boolean).join(' · ');
  return {
    pageSize: 'A4',
    pageMargins: [40, 40, 40, 48],
    info: {
      title: context.stairName ? `Estimate: ${context.stairName}` : 'Stair lighting estimate',
      author: 'Treadwise',
      creator: 'Treadwise',
      producer: 'Treadwise',
      subject: context.clientName ?? '',
      ...(created ? { creationDate: new Date(created), modDate: new Date(created) } : {}),
    },
    content: [
      ...titleBlock(result, context),
      ...summaryBlock(result),
      ...treadBlock(result, context),
      ...supplyBlock(result),
      ...pixelBlock(result),
      ...cableBlock(result),
      ...reelBlock(result),
      ...bomBlock(result),
      ...checkBlock(result),
      ...cautionBlock(result),
    ],
    // A heading never ends a page: it moves to the next one with what it heads.
    pageBreakBefore: (node: { headlineLevel?: number }, followingOnPage: unknown[]) => node.headlineLevel === 1 && followingOnPage.length === 0,
    footer: (page: number, pages: number) => ({
      columns: [txt(footerText, { color: MUTED }), txt(`page ${page} of ${pages}`, { alignment: 'right', color: MUTED })],
      margin: [40, 16, 40, 0],
      fontSize: 7,
    }),
    defaultStyle: { font: FONT_FAMILY, fontSize: 9, color: INK, lineHeight: 1.15 },
    styles: {
      h1: { fontSize: 17, bold: true, color: HEADING, margin: [0, 0, 0, 2] },
      h2: { fontSize: 12, bold: true, color: HEADING, margin: [0, 14, 0, 5] },
      th: { bold: true, color: HEADING },
      table: { fontSize: 8, margin: [0, 2, 0, 6] },
      note: { fontSize: 7.5, color: MUTED, margin: [0, 2, 0, 2] },
      body: { fontSize: 9 },
    },
  };
}

export async function estimatePdf(result: EstimateResult, context: ExportContext = {}): Promise<Buffer> {
  return pdfmakeWithFonts().createPdf(estimateDocument(result, context)).getBuffer();
}
