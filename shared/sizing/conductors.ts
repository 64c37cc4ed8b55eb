import {
  CONDUCTOR_TABLES,
  awgAreaMm2,
  type ConductorRow,
  type ConductorSize,
  type ConductorTable,
  type ConductorTableId,
} from '../tables/conductors.js';

// The lookups the request schemas need live with the tables, below both schemas and engine.
export {
  DEFAULT_AWG_TABLE,
  DEFAULT_METRIC_TABLE,
  defaultTableFor,
  describeSize,
  findConductor,
  isAwgSize,
  type ConductorSize,
} from '../tables/conductors.js';
import { findConductor, isAwgSize } from '../tables/conductors.js';
import { SizingInputError } from '../tables/errors.js';

/** Annealed copper at 20 °C (IEC 60028). */
export const COPPER_ALPHA_20 = 0.00393;

export function conductorTable(id: ConductorTableId): ConductorTable {
  return CONDUCTOR_TABLES[id];
}

export function sizeOfRow(table: ConductorTable, row: ConductorRow): ConductorSize {
  return table.system === 'awg' ? { awg: row.size } : { crossSectionMm2: row.size };
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
