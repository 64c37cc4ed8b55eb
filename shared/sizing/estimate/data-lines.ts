import type { ControllerProfile } from '../../schemas/controller.js';
import type { DataLinePart } from '../../schemas/catalog.js';
import type { TraceEntry } from '../trace.js';
import { round } from '../trace.js';

/**
 * Unbuffered one-wire data (800 / 400 kbit/s NRZ) is kept to about 1–2 m between a sender and
 * the next pixel (team handbook, "Data lines", from memory); 2 m is the default limit both for
 * the controller's output (profile `maxDataLeadM`) and for a pixel's output into the next tread
 * (block `maxDataLinkM`).
 */
export const DEFAULT_MAX_UNBUFFERED_DATA_M = 2;
/** Where the rail's data lead starts: a controller beside the rail's start (Treadwise assumption). */
export const DEFAULT_RAIL_DATA_LEAD_M = 0.5;
/** A pixel reads logic high from 0.7 × VDD (WS2812B datasheet, VIH). */
export const LOGIC_HIGH_FRACTION = 0.7;
/** Pixel ICs on 12 V / 24 V strip run from about 5 V on the strip (from memory). */
export const PIXEL_IC_MAX_VDD_V = 5;

export const DATA_LINE_REFERENCE =
  'each pixel regenerates the data, so every gap is checked on its own; unbuffered one-wire data kept to about 1–2 m (team handbook, from memory)';

/** One stretch of data cable between a sender (controller output or pixel) and the next pixel. */
export interface DataGap {
  kind: 'lead' | 'link';
  run: 'rail' | 'treads';
  controller: number | null;
  output: number | null;
  /** Tread the gap leads into (tread pixels); null on a rail. */
  tread: number | null;
  lengthM: number;
  limitM: number;
  withinLimit: boolean;
}

export interface DataLines {
  /** false for a clocked (data + clock) run: the one-wire rule does not apply. */
  oneWire: boolean;
  gaps: DataGap[];
  overLimit: DataGap[];
  /** The gap nearest its limit (or furthest over it), null when there is none. */
  worst: DataGap | null;
  /** Pixel logic high threshold, V, and the controller's data logic, when the profile states it. */
  logicHighV: number;
  dataLogicV: number | null;
  levelShiftersNeeded: number;
  dataOutputsUsed: number;
}

export function gap(
  kind: DataGap['kind'],
  run: DataGap['run'],
  lengthM: number,
  limitM: number,
  at: { controller?: number | null; output?: number | null; tread?: number | null },
): DataGap {
  return {
    kind,
    run,
    controller: at.controller ?? null,
    output: at.output ?? null,
    tread: at.tread ?? null,
    lengthM,
    limitM,
    withinLimit: lengthM <= limitM + 1e-9,
  };
}

/** Gaps gathered by the layout, judged together. */
export function dataLines(gaps: DataGap[], protocol: string, stripVoltageV: number, profile: ControllerProfile, dataOutputsUsed: number): DataLines {
  const oneWire = protocol !== 'clocked';
  const overLimit = oneWire ? gaps.filter((g) => !g.withinLimit) : [];
  let worst: DataGap | null = null;
  for (const g of gaps) if (!worst || g.lengthM / g.limitM > worst.lengthM / worst.limitM) worst = g;
  const logicHighV = LOGIC_HIGH_FRACTION * Math.min(stripVoltageV, PIXEL_IC_MAX_VDD_V);
  const dataLogicV = profile.dataLogicV ?? null;
  const levelShiftersNeeded = dataLogicV !== null && dataLogicV < logicHighV - 1e-9 ? dataOutputsUsed : 0;
  return { oneWire, gaps, overLimit, worst, logicHighV, dataLogicV, levelShiftersNeeded, dataOutputsUsed };
}

export function maxDataLeadM(profile: ControllerProfile): number {
  return profile.maxDataLeadM ?? DEFAULT_MAX_UNBUFFERED_DATA_M;
}

export function dataLinesTrace(prefix: string, lines: DataLines, profile: ControllerProfile, maxDataLinkM: number | undefined): TraceEntry {
  return {
    quantity: `${prefix}.longestDataGapM`,
    value: lines.worst ? round(lines.worst.lengthM, 3) : 0,
    unit: 'm',
    formula: 'every data gap (controller → first pixel of each output, pixel → pixel between treads) ≤ its unbuffered limit',
    inputs: {
      gaps: lines.gaps.length,
      overLimit: lines.overLimit.length,
      maxDataLeadM: maxDataLeadM(profile),
      maxDataLeadDefaulted: profile.maxDataLeadM === undefined,
      maxDataLinkM: maxDataLinkM ?? DEFAULT_MAX_UNBUFFERED_DATA_M,
      maxDataLinkDefaulted: maxDataLinkM === undefined,
      oneWire: lines.oneWire,
    },
    reference: DATA_LINE_REFERENCE,
  };
}

/** Bill-of-materials lines the data lines need: a differential pair per long gap, a level shifter per output. */
type DataLineBomLine = { category: 'data-line'; part: DataLinePart; description: string; quantity: number; unit: 'pcs' };

export function dataLineBomLines(lines: DataLines | null | undefined): DataLineBomLine[] {
  if (!lines) return [];
  const out: DataLineBomLine[] = [];
  if (lines.overLimit.length > 0) {
    out.push({
      category: 'data-line',
      part: 'differential-link',
      description: 'Differential data link for one-wire pixel data (transmitter + receiver pair), one per data gap over the unbuffered limit',
      quantity: lines.overLimit.length,
      unit: 'pcs',
    });
  }
  if (lines.levelShiftersNeeded > 0) {
    out.push({
      category: 'data-line',
      part: 'level-shifter',
      description: `Level shifter ${lines.dataLogicV} V → 5 V logic for one pixel data output`,
      quantity: lines.levelShiftersNeeded,
      unit: 'pcs',
    });
  }
  return out;
}

function defaultEntry(field: string, value: number | boolean, unit: string, reference: string): TraceEntry {
  return Object.freeze({ quantity: `default ${field}`, value, unit, formula: 'not given; default used', inputs: Object.freeze({}), reference }) as TraceEntry;
}

const BLOCK_DEFAULTS = {
  maxFeedCurrentA: defaultEntry('maxFeedCurrentA', 5, 'A', 'current one feed point pushes into the strip copper (common practice, from memory)'),
  maxDataLinkM: defaultEntry('maxDataLinkM', DEFAULT_MAX_UNBUFFERED_DATA_M, 'm', 'unbuffered one-wire data between pixels kept to about 1–2 m (team handbook, from memory)'),
  dataLeadM: defaultEntry('dataLeadM', DEFAULT_RAIL_DATA_LEAD_M, 'm', 'controller beside the rail’s start (Treadwise assumption, no published source)'),
  sizeForFullWhite: defaultEntry('sizeForFullWhite', false, '', 'sized for the brightness cap, which the controller must enforce (see the brightness-cap check)'),
} as const;

/** Defaults of the issue-8 fields of a pixel block (rail or tread pixels), for the estimate's list of defaults. */
export function pixelBlockDefaults(block: {
  maxFeedCurrentA?: number | undefined;
  maxDataLinkM?: number | undefined;
  dataLeadM?: number | undefined;
  lengthM?: number | undefined;
  brightnessPercent?: number | undefined;
  sizeForFullWhite?: boolean | undefined;
}): TraceEntry[] {
  const out: TraceEntry[] = [];
  if (block.maxFeedCurrentA === undefined) out.push(BLOCK_DEFAULTS.maxFeedCurrentA);
  // A rail block has a length; tread pixels have tread-to-tread links instead.
  if (block.lengthM !== undefined) {
    if (block.dataLeadM === undefined) out.push(BLOCK_DEFAULTS.dataLeadM);
  } else if (block.maxDataLinkM === undefined) out.push(BLOCK_DEFAULTS.maxDataLinkM);
  if (block.brightnessPercent !== undefined && block.brightnessPercent < 100 && block.sizeForFullWhite === undefined) out.push(BLOCK_DEFAULTS.sizeForFullWhite);
  return out;
}
