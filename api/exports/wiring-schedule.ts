import type { EstimateResult } from '../../shared/schemas/estimate.js';
import { contextLines, type ExportContext } from './context.js';
import { writeCsv, type CsvCell, type CsvRow } from '../../shared/tables/csv.js';
import { dataGaps, flightOfTread, pixelRuns } from './estimate-facts.js';

/**
 * The wiring schedule of an estimate as CSV, for the installer: blocks one after another, each
 * a title row, a header row (units in brackets) and its rows, with an empty row between blocks.
 * Only the blocks the answer has data for are written. The columns are listed in docs/exports.md.
 */

export interface CsvBlock {
  title: string;
  header: readonly string[];
  rows: readonly CsvRow[];
}

function estimateBlock(result: EstimateResult, context: ExportContext): CsvBlock {
  return {
    title: 'Estimate',
    header: ['field', 'value'],
    rows: [
      ...contextLines(context),
      ['engine version', result.engineVersion],
      ['layout', result.layout],
      ...(result.pricing?.catalogVersion != null ? [['catalog version', result.pricing.catalogVersion] as CsvRow] : []),
    ],
  };
}

function treadBlock(result: EstimateResult, context: ExportContext): CsvBlock | null {
  if (result.treads.length === 0) return null;
  const flightOf = flightOfTread(result, context);
  const withPixels = result.treads.some((t) => t.pixels !== undefined);
  return {
    title: 'Treads',
    header: [
      'tread',
      'flight',
      'controller',
      'output',
      'strip length (mm)',
      ...(withPixels ? ['pixels'] : []),
      'power (W)',
      'current (A)',
      'cable',
      'lead length (m)',
      'conductor (mm²)',
      'conductor (AWG)',
      'drop (%)',
      'drop from driver (%)',
    ],
    rows: result.treads.map((t) => [
      t.index,
      flightOf(t.index),
      t.controller,
      t.output,
      t.stripLengthMm,
      ...(withPixels ? [t.pixels ?? null] : []),
      t.powerW,
      t.currentA,
      t.cableKind,
      t.cableLengthM,
      t.crossSectionMm2,
      t.awg,
      t.dropPercent,
      t.pathDropPercent,
    ]),
  };
}

function landingBlock(result: EstimateResult): CsvBlock | null {
  const landings = result.landings ?? [];
  if (landings.length === 0) return null;
  return {
    title: 'Lit landings',
    header: ['landing', 'below tread', 'controller', 'output', 'strip length (mm)', 'power (W)', 'current (A)', 'lead length (m)', 'conductor (mm²)', 'conductor (AWG)', 'drop (%)'],
    rows: landings.map((l) => [l.landing, l.belowTread, l.controller, l.output, l.stripLengthMm, l.powerW, l.currentA, l.cableLengthM, l.crossSectionMm2, l.awg, l.dropPercent]),
  };
}

function controllerBlock(result: EstimateResult): CsvBlock | null {
  const blocks = result.outputs.controllerTreads;
  if (blocks.length === 0) return null;
  return {
    title: 'Controllers',
    header: ['controller', 'first tread', 'last tread', 'at tread', 'current through (A)'],
    rows: blocks.map((c) => [c.controller, c.firstTread, c.lastTread, c.atTread, c.currentA]),
  };
}

function circuitBlock(result: EstimateResult): CsvBlock | null {
  if (result.circuits.length === 0) return null;
  return {
    title: 'Circuits',
    header: [
      'circuit',
      'feeds',
      'voltage (V)',
      'loads',
      'load (W)',
      'current (A)',
      'driver rating (W)',
      'driver SKU',
      'loading (%)',
      'driver current limit (A)',
      'driver position (m)',
      'feeders',
      'worst drop (%)',
      'fuses (A)',
      'protected by',
    ],
    rows: result.circuits.map((c) => [
      c.circuit,
      c.name,
      c.voltageV,
      c.loads.join('; '),
      c.loadW,
      c.currentA,
      c.driver?.ratingW ?? null,
      c.driver?.sku ?? null,
      c.driver?.loadingPercent ?? null,
      c.driver?.currentLimitA ?? null,
      c.driverPositionM,
      c.feeds,
      c.worstPathDropPercent,
      c.fusesA.map((f) => (f === null ? 'none fits' : f)).join('; '),
      c.protectedBy,
    ]),
  };
}

function feederBlock(result: EstimateResult): CsvBlock | null {
  if (result.feeder.runs.length === 0) return null;
  return {
    title: 'Feeders',
    header: [
      'circuit',
      'to',
      'controller',
      'power input',
      'feed point',
      'count',
      'current (A)',
      'length (m)',
      'conductor (mm²)',
      'conductor (AWG)',
      'cable rating (A)',
      'drop (V)',
      'drop (%)',
      'drop to farthest strip (%)',
      'fuse (A)',
      'protected by',
    ],
    rows: result.feeder.runs.map((f) => [
      f.circuit,
      f.to,
      f.controller,
      f.powerInput ?? null,
      f.feedPoint,
      f.count,
      f.currentA,
      f.lengthM,
      f.crossSectionMm2,
      f.awg,
      f.currentRatingA,
      f.dropV,
      f.dropPercent,
      f.pathDropPercent,
      f.fuseA,
      f.protectedBy,
    ]),
  };
}

function pixelRunBlock(result: EstimateResult): CsvBlock | null {
  const runs = pixelRuns(result);
  if (runs.length === 0) return null;
  return {
    title: 'Pixel runs',
    header: [
      'run',
      'pixels',
      'length (m)',
      'voltage (V)',
      'protocol',
      'data outputs',
      'pixels per output',
      'frame time (µs)',
      'max refresh (Hz)',
      'brightness (%)',
      'power (W)',
      'current (A)',
      'feed points',
      'max feed length (m)',
    ],
    rows: runs.map((r) => [
      r.run,
      r.pixels,
      r.lengthM,
      r.voltageV,
      r.protocol,
      r.dataOutputs,
      r.pixelsPerOutput,
      r.frameTimeUs,
      r.maxRefreshHz,
      r.brightnessPercent,
      r.powerW,
      r.fullWhiteCurrentA,
      r.feedPoints,
      r.maxFeedLengthM,
    ]),
  };
}

function dataOutputBlock(result: EstimateResult): CsvBlock | null {
  const rows = result.outputs.data;
  if (rows.length === 0) return null;
  return {
    title: 'Data outputs',
    header: ['controller', 'first output', 'last output', 'run', 'pixels per output', 'first tread', 'last tread'],
    rows: rows.map((d) => [d.controller, d.output, d.lastOutput, d.run, d.pixels, d.firstTread, d.lastTread]),
  };
}

function dataGapBlock(result: EstimateResult): CsvBlock | null {
  const gaps = dataGaps(result);
  if (gaps.length === 0) return null;
  return {
    title: 'Data runs',
    header: ['run', 'gap', 'controller', 'output', 'into tread', 'length (m)', 'limit (m)', 'within limit'],
    rows: gaps.map((g) => [g.run, g.kind, g.controller, g.output, g.tread, g.lengthM, g.limitM, g.withinLimit]),
  };
}

function sensorBlock(result: EstimateResult): CsvBlock | null {
  const { placements, sensorCableM } = result.sensors;
  if (placements.length === 0) return null;
  const total: CsvCell[] = ['total', null, null, sensorCableM ?? null];
  return {
    title: 'Sensor cable',
    header: ['sensor', 'flight', 'tread', 'cable length (m)'],
    rows: [...placements.map((p) => [p.role, p.flight, p.tread, p.cableLengthM ?? null]), ...(sensorCableM === undefined ? [] : [total])],
  };
}

function cableBlock(result: EstimateResult): CsvBlock | null {
  if (result.cables.length === 0) return null;
  return {
    title: 'Cable to order',
    header: ['use', 'cores', 'conductor (mm²)', 'conductor (AWG)', 'runs', 'total length (m)', 'order length (m)'],
    rows: result.cables.map((c) => [c.use, c.cores, c.crossSectionMm2, c.awg, c.runs, c.totalLengthM, c.orderLengthM]),
  };
}

/** The blocks of the schedule, in the order an installer works: treads, supply, data, sensors, cable. */
export function wiringScheduleBlocks(result: EstimateResult, context: ExportContext = {}): CsvBlock[] {
  return [
    estimateBlock(result, context),
    treadBlock(result, context),
    landingBlock(result),
    controllerBlock(result),
    circuitBlock(result),
    feederBlock(result),
    pixelRunBlock(result),
    dataOutputBlock(result),
    dataGapBlock(result),
    sensorBlock(result),
    cableBlock(result),
  ].filter((b): b is CsvBlock => b !== null);
}

/** Blocks as rows: title, header, rows, then an empty row before the next block. */
export function blockRows(blocks: readonly CsvBlock[]): CsvRow[] {
  return blocks.flatMap((block, i) => [...(i > 0 ? [[]] : []), [block.title], block.header, ...block.rows]);
}

export function wiringScheduleCsv(result: EstimateResult, context: ExportContext = {}): string {
  return writeCsv(blockRows(wiringScheduleBlocks(result, context)), { rectangular: true });
}
