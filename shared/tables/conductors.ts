import { SizingInputError } from './errors.js';
/**
 * Copper conductor data the cable sizing reads: DC resistance at each table's reference
 * temperature and a current rating per size. Values are data, not code, so each row carries
 * its own source string (and `from memory` where a value was recalled, not looked up).
 */

export const CONDUCTOR_TABLE_IDS = [
  'iec60228-class5',
  'iec60228-class1-2',
  'iec60228-class5-tinned',
  'awg-solid',
  'nec-ch9-t8-stranded',
] as const;

export type ConductorTableId = (typeof CONDUCTOR_TABLE_IDS)[number];

/** Metric tables are keyed by nominal mm², AWG tables by gauge number (0 stands for 1/0). */
export type SizeSystem = 'metric' | 'awg';

export interface ConductorRow {
  /** Nominal mm² (metric) or gauge number (AWG). */
  readonly size: number;
  /** Cross-section in mm²; for AWG the ASTM B258 area, so a mm² minimum can be applied to it. */
  readonly areaMm2: number;
  /** One conductor, at the table's reference temperature. */
  readonly resistanceOhmPerKm: number;
  readonly resistanceSource: string;
  readonly currentRatingA: number;
  readonly currentRatingSource: string;
}

export interface ConductorTable {
  readonly id: ConductorTableId;
  readonly system: SizeSystem;
  readonly referenceTemperatureC: number;
  readonly reference: string;
  /** Ascending cross-section: the cable chooser relies on this order. */
  readonly rows: readonly ConductorRow[];
}

/** Annealed copper, 100 % IACS, at 20 °C (IEC 60028): 1/58 Ω·mm²/m. */
export const COPPER_RESISTIVITY_OHM_MM2_PER_M = 1 / 58;

const M_PER_KFT = 304.8;

/** ASTM B258: d = 0.127 mm × 92^((36 − n)/39); gauge 0 is 1/0. */
export function awgDiameterMm(awg: number): number {
  return 0.127 * 92 ** ((36 - awg) / 39);
}

export function awgAreaMm2(awg: number): number {
  const d = awgDiameterMm(awg);
  return (Math.PI * d * d) / 4;
}

// --- metric ---------------------------------------------------------------------------------

const METRIC_SIZES_MM2 = [0.5, 0.75, 1.0, 1.5, 2.5, 4, 6, 10, 16] as const;

/** IEC 60228 Table 3 (class 5) and Table 2 (class 1/2) maximum DC resistance at 20 °C, Ω/km. */
const IEC_60228_OHM_PER_KM: Record<'class5' | 'class1-2' | 'class5-tinned', readonly number[]> = {
  'class5': [39.0, 26.0, 19.5, 13.3, 7.98, 4.95, 3.3, 1.91, 1.21],
  'class1-2': [36.0, 24.5, 18.1, 12.1, 7.41, 4.61, 3.08, 1.83, 1.15],
  'class5-tinned': [40.1, 26.7, 20.0, 13.7, 8.21, 5.09, 3.39, 1.95, 1.24],
};

/** 10 and 16 mm² are recalled, not checked against the standard's text. */
function iecResistanceSource(sizeMm2: number): string {
  return sizeMm2 >= 10 ? 'IEC 60228, from memory' : 'IEC 60228';
}

/**
 * Flexible-cord ratings. Used for the solid/stranded table too: fixed-wiring ratings are
 * higher, so the cord figure errs on the safe side for a cable run along a stringer.
 */
const METRIC_CURRENT_RATING: Record<number, { a: number; source: string }> = {
  0.5: { a: 3, source: 'BS 7671 Appendix 4 Table 4F3A, from memory' },
  0.75: { a: 6, source: 'BS 7671 Appendix 4 Table 4F3A, from memory' },
  1: { a: 10, source: 'BS 7671 Appendix 4 Table 4F3A, from memory' },
  1.5: { a: 16, source: 'BS 7671 Appendix 4 Table 4F3A, from memory' },
  2.5: { a: 25, source: 'BS 7671 Appendix 4 Table 4F3A, from memory' },
  4: { a: 32, source: 'BS 7671 Appendix 4 Table 4F3A, from memory' },
  6: { a: 40, source: 'Treadwise conservative estimate beyond Table 4F3A, no published source' },
  10: { a: 55, source: 'Treadwise conservative estimate beyond Table 4F3A, no published source' },
  16: { a: 73, source: 'Treadwise conservative estimate beyond Table 4F3A, no published source' },
};

function metricRows(ohmPerKm: readonly number[]): ConductorRow[] {
  return METRIC_SIZES_MM2.map((size, i) => ({
    size,
    areaMm2: size,
    resistanceOhmPerKm: ohmPerKm[i]!,
    resistanceSource: iecResistanceSource(size),
    currentRatingA: METRIC_CURRENT_RATING[size]!.a,
    currentRatingSource: METRIC_CURRENT_RATING[size]!.source,
  }));
}

// --- AWG ------------------------------------------------------------------------------------

/** NEC Table 400.5(A)(1), column A (flexible cords), from memory. */
const NEC_400_5_RATING_A: Record<number, number> = { 18: 7, 16: 10, 14: 15, 12: 20, 10: 25, 8: 35, 6: 45, 4: 60, 2: 80 };

/**
 * Gauges the cord table lacks get a conservative figure: thinner than 18 AWG scales the 18 AWG
 * rating by cross-section (heat shed grows slower than area, so this underestimates); the
 * others take the next thinner listed gauge's rating.
 */
function awgCurrentRating(awg: number): { a: number; source: string } {
  const listed = NEC_400_5_RATING_A[awg];
  if (listed !== undefined) return { a: listed, source: 'NEC Table 400.5(A)(1), column A, from memory' };
  if (awg > 18) {
    const a = Math.floor((NEC_400_5_RATING_A[18]! * awgAreaMm2(awg) * 100) / awgAreaMm2(18)) / 100;
    return { a, source: 'Treadwise estimate: 18 AWG cord rating scaled by cross-section, no published source' };
  }
  let thinner = awg + 1;
  while (NEC_400_5_RATING_A[thinner] === undefined) thinner += 1;
  return {
    a: NEC_400_5_RATING_A[thinner]!,
    source: `Treadwise estimate: rating of ${thinner} AWG (NEC Table 400.5(A)(1), from memory), no published source`,
  };
}

function awgSolidRows(): ConductorRow[] {
  const rows: ConductorRow[] = [];
  for (let awg = 40; awg >= 0; awg -= 1) {
    const areaMm2 = awgAreaMm2(awg);
    const rating = awgCurrentRating(awg);
    rows.push({
      size: awg,
      areaMm2,
      resistanceOhmPerKm: (COPPER_RESISTIVITY_OHM_MM2_PER_M / areaMm2) * 1000,
      resistanceSource: 'ASTM B258 diameter, ρ = 1/58 Ω·mm²/m (IEC 60028)',
      currentRatingA: rating.a,
      currentRatingSource: rating.source,
    });
  }
  return rows;
}

/** NEC Chapter 9 Table 8, stranded uncoated copper at 75 °C, Ω/kft. */
const NEC_T8_STRANDED_OHM_PER_KFT: ReadonlyArray<readonly [awg: number, ohmPerKft: number, fromMemory: boolean]> = [
  [18, 7.95, false],
  [16, 4.99, false],
  [14, 3.14, false],
  [12, 1.98, false],
  [10, 1.24, true],
  [8, 0.778, true],
  [6, 0.491, true],
  [4, 0.308, true],
  [2, 0.194, true],
  [1, 0.154, true],
  [0, 0.122, true],
];

function necStrandedRows(): ConductorRow[] {
  return NEC_T8_STRANDED_OHM_PER_KFT.map(([awg, ohmPerKft, fromMemory]) => {
    const rating = awgCurrentRating(awg);
    return {
      size: awg,
      areaMm2: awgAreaMm2(awg),
      resistanceOhmPerKm: (ohmPerKft * 1000) / M_PER_KFT,
      resistanceSource: fromMemory ? 'NEC Chapter 9 Table 8, from memory' : 'NEC Chapter 9 Table 8',
      currentRatingA: rating.a,
      currentRatingSource: rating.source,
    };
  });
}

// --- the tables -----------------------------------------------------------------------------

export const CONDUCTOR_TABLES: Readonly<Record<ConductorTableId, ConductorTable>> = {
  'iec60228-class5': {
    id: 'iec60228-class5',
    system: 'metric',
    referenceTemperatureC: 20,
    reference: 'IEC 60228 class 5 (flexible), plain copper, max DC resistance at 20 °C',
    rows: metricRows(IEC_60228_OHM_PER_KM['class5']),
  },
  'iec60228-class1-2': {
    id: 'iec60228-class1-2',
    system: 'metric',
    referenceTemperatureC: 20,
    reference: 'IEC 60228 class 1/2 (solid/stranded), plain copper, max DC resistance at 20 °C',
    rows: metricRows(IEC_60228_OHM_PER_KM['class1-2']),
  },
  'iec60228-class5-tinned': {
    id: 'iec60228-class5-tinned',
    system: 'metric',
    referenceTemperatureC: 20,
    reference: 'IEC 60228 class 5 (flexible), tinned copper, max DC resistance at 20 °C',
    rows: metricRows(IEC_60228_OHM_PER_KM['class5-tinned']),
  },
  'awg-solid': {
    id: 'awg-solid',
    system: 'awg',
    referenceTemperatureC: 20,
    reference: 'ASTM B258 solid copper wire, ρ = 1/58 Ω·mm²/m at 20 °C (IEC 60028)',
    rows: awgSolidRows(),
  },
  'nec-ch9-t8-stranded': {
    id: 'nec-ch9-t8-stranded',
    system: 'awg',
    referenceTemperatureC: 75,
    reference: 'NEC Chapter 9 Table 8, stranded uncoated copper at 75 °C',
    rows: necStrandedRows(),
  },
};

// ---- lookups shared by the request schemas and the engine ------------------------------------

/** A conductor size as the API names it. */
export type ConductorSize = { crossSectionMm2: number } | { awg: number };

export const DEFAULT_METRIC_TABLE: ConductorTableId = 'iec60228-class5';
export const DEFAULT_AWG_TABLE: ConductorTableId = 'awg-solid';


export function isAwgSize(size: ConductorSize): size is { awg: number } {
  return 'awg' in size;
}

/** The contract's default: IEC 60228 class 5 for a mm² size, ASTM solid for a gauge. */
export function defaultTableFor(size: ConductorSize): ConductorTableId {
  return isAwgSize(size) ? DEFAULT_AWG_TABLE : DEFAULT_METRIC_TABLE;
}


export function describeSize(size: ConductorSize): string {
  if (!isAwgSize(size)) return `${size.crossSectionMm2} mm²`;
  return size.awg === 0 ? '1/0 AWG' : `${size.awg} AWG`;
}


/**
 * The row of `size` in the table, or a SizingInputError naming the field: `conductorTable` when
 * the size system does not match the table, `<path>.crossSectionMm2` / `<path>.awg` when the table
 * lacks the size.
 */
export function findConductor(tableId: ConductorTableId, size: ConductorSize, path: string[] = ['conductor']): ConductorRow {
  const table = CONDUCTOR_TABLES[tableId];
  const awg = isAwgSize(size);
  if (awg !== (table.system === 'awg')) {
    throw new SizingInputError(
      ['conductorTable'],
      `conductorTable "${tableId}" lists ${table.system === 'awg' ? 'AWG gauges' : 'mm² sizes'}; ` +
        `give the conductor as ${table.system === 'awg' ? '{ awg }' : '{ crossSectionMm2 }'} or choose a ` +
        `${awg ? 'AWG' : 'metric'} table`,
      'conductor_table_mismatch',
    );
  }
  const wanted = awg ? size.awg : size.crossSectionMm2;
  const row = table.rows.find((r) => Math.abs(r.size - wanted) < 1e-9);
  if (!row) {
    const listed = table.rows.map((r) => r.size).join(', ');
    throw new SizingInputError(
      [...path, awg ? 'awg' : 'crossSectionMm2'],
      `${describeSize(size)} is not in conductorTable "${tableId}" (sizes: ${listed})`,
      'conductor_size_not_in_table',
    );
  }
  return row;
}
