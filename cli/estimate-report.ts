import type { components } from '../openapi/api-types.js';
import { fields, money, num, table, type Paint } from './style.js';

export type EstimateResponse = components['schemas']['EstimateResponse'];
type Check = components['schemas']['EstimateCheck'];
type Sized = { crossSectionMm2?: number | null; awg?: number | null };

const size = (s: Sized) => (s.crossSectionMm2 != null ? `${num(s.crossSectionMm2)} mm²` : s.awg != null ? `AWG ${s.awg}` : '—');
const where = (controller: number | null, output: number | null) => (controller === null ? '—' : `${controller}/${output ?? '—'}`);

const ORDER: Record<Check['status'], number> = { fail: 0, warn: 1, pass: 2 };

/** The estimate as a terminal report: headline, treads, supply, cable, checks, BOM and cautions. */
export function estimateReport(e: EstimateResponse, paint: Paint): string {
  const s = e.summary;
  const sections: string[] = [];
  const mark = (status: Check['status']) => ({ pass: paint.pass('PASS'), warn: paint.warn('WARN'), fail: paint.fail('FAIL') })[status];

  sections.push(
    fields([
      ['Estimate', `${e.layout}, engine ${e.engineVersion}`],
      ['Treads', `${s.litTreads} lit of ${s.treads}`],
      ['Load', `${num(s.totalLoadW, 1)} W on ${s.controllers} controller${s.controllers === 1 ? '' : 's'}, ${s.driverCount} driver${s.driverCount === 1 ? '' : 's'}`],
      ['Worst drop', `${num(s.worstDropPercent)} % (longest run ${num(s.longestRunM)} m)`],
      ['Checks', `${paint.pass(`${s.checks.pass} pass`)}, ${paint.warn(`${s.checks.warn} warn`)}, ${paint.fail(`${s.checks.fail} fail`)}`],
    ]),
  );

  if (e.treads.length) {
    sections.push(
      paint.bold('Treads') +
        '\n' +
        table(
          ['tread', 'strip mm', 'W', 'A', 'ctrl/out', 'cable', 'm', 'size', 'drop %'],
          e.treads.map((t) => [String(t.index), num(t.stripLengthMm, 0), num(t.powerW), num(t.currentA, 3), where(t.controller, t.output), t.cableKind, num(t.cableLengthM), size(t), num(t.pathDropPercent ?? t.dropPercent)]),
          [0, 1, 2, 3, 6, 8],
        ),
    );
  }

  const supply = e.circuits.map((c) => {
    const driver = c.driver ? `${num(c.driver.ratingW, 0)} W driver at ${num(c.driver.loadingPercent, 1)} %${c.driver.sku ? ` (${c.driver.sku})` : ''}` : paint.fail('no driver fits');
    const fuses = c.fusesA.filter((f): f is number => f !== null);
    return `circuit ${c.circuit} (${c.name}): ${num(c.voltageV)} V, ${num(c.loadW, 1)} W, ${num(c.currentA)} A → ${driver}; ${c.protectedBy}${fuses.length ? `, fuse ${fuses.map((f) => `${num(f)} A`).join(', ')}` : ''}`;
  });
  const feeders = e.feeder.runs.map((r) => `feeder ${num(r.voltageV)} V → ${r.to}${r.controller !== null ? ` ${r.controller}` : ''}: ${num(r.lengthM)} m, ${size(r)}, drop ${num(r.dropPercent)} % (end to end ${num(r.pathDropPercent)} %)`);
  sections.push(paint.bold('Drivers and circuits') + '\n' + [...supply, ...feeders].map((l) => `  ${l}`).join('\n'));

  const pixelRuns = [e.pixels.rail, e.pixels.treads].filter((r): r is NonNullable<typeof r> => r !== null);
  if (pixelRuns.length) {
    sections.push(
      paint.bold('Pixels') +
        '\n' +
        pixelRuns
          .map((p) => `  ${p.run}: ${p.pixels} pixels, ${p.dataOutputs} data output(s) of ${p.pixelsPerOutput}, ${num(p.maxRefreshHz, 1)} Hz, ${num(p.fullWhiteCurrentA)} A / ${num(p.powerW, 1)} W, ${p.feedPoints} feed point(s)`)
          .join('\n'),
    );
  }

  if (e.cables.length) {
    sections.push(paint.bold('Cable') + '\n' + table(['use', 'size', 'cores', 'runs', 'total m', 'order m'], e.cables.map((c) => [c.use, size(c), String(c.cores), String(c.runs), num(c.totalLengthM), num(c.orderLengthM)]), [2, 3, 4, 5]));
  }

  const checks = [...e.checks].sort((a, b) => ORDER[a.status] - ORDER[b.status]);
  sections.push(
    paint.bold('Checks') +
      '\n' +
      checks
        .map((c) => {
          const line = `  ${mark(c.status)}  ${c.id}: ${c.message}`;
          return c.suggestion && c.status !== 'pass' ? `${line}\n        → ${c.suggestion}` : line;
        })
        .join('\n'),
  );

  if (e.bom.length) {
    const priced = e.bom.some((l) => l.unitPrice !== undefined);
    const header = priced ? ['qty', 'unit', 'sku', 'description', 'each', 'total'] : ['qty', 'unit', 'sku', 'description'];
    const rows = e.bom.map((l) => {
      const row = [String(l.quantity), l.unit, l.sku ?? '—', l.description];
      return priced ? [...row, l.unitPrice !== undefined ? money(l.unitPrice) : '—', l.lineTotal !== undefined ? money(l.lineTotal) : paint.warn('unpriced')] : row;
    });
    let bom = paint.bold('Bill of materials') + '\n' + table(header, rows, priced ? [0, 4, 5] : [0]);
    if (e.pricing) {
      const p = e.pricing;
      const source = p.source === 'stored' ? `stored catalog v${p.catalogVersion}` : 'catalog in the request';
      bom += `\n${fields([
        ['Net', money(p.net, p.currency)],
        [`Tax ${num(p.taxRatePercent)} %`, money(p.tax, p.currency)],
        ['Gross', money(p.gross, p.currency)],
      ])}\n${p.complete ? `Priced from the ${source}.` : paint.warn(`Priced from the ${source}; ${p.unpricedLines} line(s) without a price (the catalog lacks them).`)}`;
    } else if (e.bomTotal !== undefined) {
      bom += `\nTotal ${money(e.bomTotal, e.currency)}`;
    }
    sections.push(bom);
  }

  if (e.cautions.length) sections.push(paint.bold('Cautions') + '\n' + e.cautions.map((c) => `  ! ${c.message}`).join('\n'));
  return sections.join('\n\n');
}

/** Exit code 3 when any check fails: the design needs changes before anything is bought. */
export const hasFailingCheck = (e: EstimateResponse) => e.checks.some((c) => c.status === 'fail');
