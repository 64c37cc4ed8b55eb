import { runResistanceOhmPerKm, smallestSuitableConductor } from '../cable.js';
import { conductorTable, describeSize, sizeOfRow, type ConductorSize } from '../conductors.js';
import type { ConductorRow } from '../../tables/conductors.js';
import { dropPercentOf, loopDropV } from '../voltage-drop.js';
import type { CableSettings } from './settings.js';

export type RunFailure = 'drop' | 'current' | 'min-size';

/** The cable chosen for one run, or — when no size passes — what the table's largest size would give. */
export interface RunCable {
  size: ConductorSize | null;
  areaMm2: number;
  resistanceOhmPerKm: number;
  currentA: number;
  lengthM: number;
  dropV: number;
  dropPercent: number;
  currentRatingA: number;
  failure: RunFailure | null;
}

/**
 * The smallest size of the table that keeps the drop within the limit and carries the current
 * (and `mustCarryA`, when a current-limited driver's limit must be carried too).
 */
export function sizeRun(supplyVoltageV: number, currentA: number, lengthM: number, cableIn: CableSettings, mustCarryA?: number): RunCable {
  const cable = forLength(cableIn, lengthM);
  const chosen = smallestSuitableConductor(supplyVoltageV, currentA, lengthM, mustCarryA === undefined ? cable : { ...cable, mustCarryA });
  if (chosen) {
    return {
      size: chosen.size,
      areaMm2: chosen.row.areaMm2,
      resistanceOhmPerKm: chosen.resistanceOhmPerKm,
      currentA,
      lengthM,
      dropV: chosen.dropV,
      dropPercent: chosen.dropPercent,
      currentRatingA: chosen.row.currentRatingA,
      failure: null,
    };
  }
  return largestSizeRun(supplyVoltageV, currentA, lengthM, cable, mustCarryA);
}

/** A run on one given row of the table (for the end-to-end budget search); failure says what it breaks. */
/** The settings for a run of this length: a short flexible run may have a smaller minimum (IEC/UK ELV rules). */
export function forLength(cable: CableSettings, lengthM: number): CableSettings {
  if (cable.shortRunMinMm2 === undefined || lengthM > cable.shortRunMaxM * (1 + 1e-9)) return cable;
  return { ...cable, minCrossSectionMm2: cable.shortRunMinMm2 };
}

/** The minimum size a run of this length must have, mm². */
export function minimumFor(cable: CableSettings, lengthM: number): number {
  return forLength(cable, lengthM).minCrossSectionMm2;
}

export function runOnRow(supplyVoltageV: number, currentA: number, lengthM: number, cableIn: CableSettings, row: ConductorRow, maxDropPercent: number): RunCable {
  const cable = forLength(cableIn, lengthM);
  const table = conductorTable(cable.conductorTable);
  const r = runResistanceOhmPerKm(row, table.referenceTemperatureC, cable.temperatureC, cable.resistanceFactor);
  const dropV = loopDropV(currentA, lengthM, r);
  const dropPercent = dropPercentOf(dropV, supplyVoltageV);
  const failure: RunFailure | null =
    row.areaMm2 < cable.minCrossSectionMm2 * (1 - 1e-9) ? 'min-size' : currentA > row.currentRatingA ? 'current' : dropPercent > maxDropPercent * (1 + 1e-9) ? 'drop' : null;
  return {
    size: failure === null ? sizeOfRow(table, row) : null,
    areaMm2: row.areaMm2,
    resistanceOhmPerKm: r,
    currentA,
    lengthM,
    dropV,
    dropPercent,
    currentRatingA: row.currentRatingA,
    failure,
  };
}

/** Nothing passes: report the table's largest size, and which rule it still breaks. */
function largestSizeRun(supplyVoltageV: number, currentA: number, lengthM: number, cable: CableSettings, mustCarryA = 0): RunCable {
  const table = conductorTable(cable.conductorTable);
  const row = table.rows[table.rows.length - 1] as ConductorRow;
  const r = runResistanceOhmPerKm(row, table.referenceTemperatureC, cable.temperatureC, cable.resistanceFactor);
  const dropV = loopDropV(currentA, lengthM, r);
  const failure: RunFailure =
    row.areaMm2 < cable.minCrossSectionMm2 * (1 - 1e-9) ? 'min-size' : Math.max(currentA, mustCarryA) > row.currentRatingA ? 'current' : 'drop';
  return {
    size: null,
    areaMm2: row.areaMm2,
    resistanceOhmPerKm: r,
    currentA,
    lengthM,
    dropV,
    dropPercent: dropPercentOf(dropV, supplyVoltageV),
    currentRatingA: row.currentRatingA,
    failure,
  };
}

/** The table's next size above a run's, for a "next cable size" suggestion. */
export function nextSizeLabel(cable: CableSettings, areaMm2: number): string | null {
  const table = conductorTable(cable.conductorTable);
  const next = table.rows.find((r) => r.areaMm2 > areaMm2 * (1 + 1e-9));
  return next ? describeSize(sizeOfRow(table, next)) : null;
}

export function sizeLabel(run: RunCable): string {
  return run.size ? describeSize(run.size) : 'no size of the table';
}

/** Writes the response's size field: crossSectionMm2 for a metric table, awg for an AWG one. */
export function setSize(target: { crossSectionMm2?: number | null | undefined; awg?: number | null | undefined }, cable: CableSettings, run: RunCable): void {
  if (cable.system === 'awg') target.awg = run.size && 'awg' in run.size ? run.size.awg : null;
  else target.crossSectionMm2 = run.size && 'crossSectionMm2' in run.size ? run.size.crossSectionMm2 : null;
}
