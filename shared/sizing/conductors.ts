import { SizingInputError } from './errors.js';
import {
  CONDUCTOR_TABLES,
  awgAreaMm2,
  type ConductorRow,
  type ConductorTable,
  type ConductorTableId,
} from './tables/conductors.js';

/** A conductor size as the API names it. */
export type ConductorSize = { crossSectionMm2: number } | { awg: number };

export const DEFAULT_METRIC_TABLE: ConductorTableId = 'iec60228-class5';
export const DEFAULT_AWG_TABLE: ConductorTableId = 'awg-solid';

/** Annealed copper at 20 °C (IEC 60028). */
export const COPPER_ALPHA_20 = 0.00393;

export function isAwgSize(size: ConductorSize): size is { awg: number } {
  return 'awg' in size;
}

/** The contract's default: IEC 60228 class 5 for a mm² size, ASTM solid for a gauge. */
export function defaultTableFor(size: ConductorSize): ConductorTableId {
  return isAwgSize(size) ? DEFAULT_AWG_TABLE : DEFAULT_METRIC_TABLE;
}

export function conductorTable(id: ConductorTableId): ConductorTable {
  return CONDUCTOR_TABLES[id];
}

export function sizeOfRow(table: ConductorTable, row: ConductorRow): ConductorSize {
  return table.system === 'awg' ? { awg: row.size } : { crossSectionMm2: row.size };
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

/**
 * α re-referenced to the table's own temperature, 1/α_T = 1/α_20 + (T − 20), so the correction
 * stays exact for a 75 °C table (gives 0.00323 at 75 °C, the NEC Table 8 note, from memory) and
 * equals IEC 60028's 0.00393 for 20 °C tables.
 */
export function copperAlphaAt(referenceTemperatureC: number): number {
  return 1 / (1 / COPPER_ALPHA_20 + (referenceTemperatureC - 20));
}

/** R_T = R_ref · (1 + α_ref · (T − T_ref)) (IEC 60028). */
export function correctForTemperature(resistanceRef: number, referenceTemperatureC: number, temperatureC: number): number {
  return resistanceRef * (1 + copperAlphaAt(referenceTemperatureC) * (temperatureC - referenceTemperatureC));
}

/** One conductor's resistance per km at `temperatureC` (default: the table's reference). */
export function resistanceOhmPerKm(tableId: ConductorTableId, size: ConductorSize, temperatureC?: number): number {
  const table = CONDUCTOR_TABLES[tableId];
  const row = findConductor(tableId, size);
  return correctForTemperature(row.resistanceOhmPerKm, table.referenceTemperatureC, temperatureC ?? table.referenceTemperatureC);
}

/** The table's standard sizes, ascending cross-section. */
export function standardSizes(tableId: ConductorTableId): ConductorSize[] {
  const table = CONDUCTOR_TABLES[tableId];
  return table.rows.map((row) => sizeOfRow(table, row));
}

/** ASTM B258 cross-section of an integer gauge 0–40 (0 = 1/0). */
export function awgCrossSectionMm2(awg: number, path: string[] = ['awg']): number {
  if (!Number.isInteger(awg) || awg < 0 || awg > 40) {
    throw new SizingInputError(path, `AWG must be an integer from 0 (1/0) to 40, got ${awg}`, 'awg_out_of_range');
  }
  return awgAreaMm2(awg);
}

export function currentRatingA(tableId: ConductorTableId, size: ConductorSize): number {
  return findConductor(tableId, size).currentRatingA;
}
