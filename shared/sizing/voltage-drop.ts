import type { VoltageDropInput, VoltageDropResult } from '../schemas/voltage-drop.js';
import { conductorTable, correctForTemperature, copperAlphaAt, defaultTableFor, describeSize, findConductor } from './conductors.js';
import { round, settingEntry, type TraceEntry, type Warning } from './trace.js';
import { ENGINE_VERSION } from './version.js';

export type LoadDistribution = 'end' | 'uniform';

/** ELV lighting: ≤ 5 % from the converter to the farthest luminaire (IEC 60364-7-715 / BS 7671 715.525, from memory). */
export const DEFAULT_MAX_DROP_PERCENT = 5;
/** Extension cable controller → tread: common practice, no published source. */
export const PRACTICE_MAX_RUN_M = 10;

export const DROP_LIMIT_REFERENCE =
  'IEC 60364-7-715 / BS 7671 715.525: ≤ 5 % from the ELV converter (driver) to the farthest luminaire, end to end (from memory); IEC 60364-5-52 Table G.52.1, informative: lighting 3 % public / 6 % private supply';
export const LOOP_REFERENCE = 'IEC 60364-5-52 Annex G, two-wire DC loop (cos φ = 1)';
export const UNIFORM_REFERENCE = 'DC distributor theory, load spread evenly and fed from one end: I·R/2 (any circuits text)';

/**
 * Two-wire DC loop drop, Vd = 2 · L · I · R′; a load spread evenly along a run fed from one end
 * drops half of that at its far end. Allocation-free for the estimate's hot loop.
 */
export function loopDropV(currentA: number, lengthM: number, resistanceOhmPerKm: number, loadDistribution: LoadDistribution = 'end'): number {
  const dropV = (2 * lengthM * currentA * resistanceOhmPerKm) / 1000;
  return loadDistribution === 'uniform' ? dropV / 2 : dropV;
}

export function dropPercentOf(dropV: number, supplyVoltageV: number): number {
  return (dropV / supplyVoltageV) * 100;
}

/** A hair of tolerance so a drop computed as 5.000000000001 % still meets a 5 % limit. */
export function withinDropLimit(dropPercent: number, maxDropPercent: number): boolean {
  return dropPercent <= maxDropPercent * (1 + 1e-9);
}

export function runLengthWarning(lengthM: number): Warning | null {
  if (lengthM <= PRACTICE_MAX_RUN_M) return null;
  return {
    code: 'run_over_practice_length',
    message: `The run is ${round(lengthM, 2)} m; common practice keeps low-voltage runs from the controller to ${PRACTICE_MAX_RUN_M} m or less. Move the controller (e.g. to mid-flight) or feed the far end differently.`,
  };
}

export function defaultDropLimitWarning(): Warning {
  return {
    code: 'default_drop_limit',
    message: `No maxDropPercent given: the default ${DEFAULT_MAX_DROP_PERCENT} % was used — the ELV lighting limit from the driver to the farthest luminaire (IEC 60364-7-715 / BS 7671 715.525, from memory); this run is only part of that path, and the strip's datasheet may ask for less.`,
  };
}

export function voltageDrop(input: VoltageDropInput): VoltageDropResult {
  const tableId = input.conductorTable ?? defaultTableFor(input.conductor);
  const table = conductorTable(tableId);
  const row = findConductor(tableId, input.conductor);
  const temperatureC = input.temperatureC ?? table.referenceTemperatureC;
  const loadDistribution = input.loadDistribution ?? 'end';
  const maxDropPercent = input.maxDropPercent ?? DEFAULT_MAX_DROP_PERCENT;
  const sizeLabel = describeSize(input.conductor);

  const rOhmPerKm = correctForTemperature(row.resistanceOhmPerKm, table.referenceTemperatureC, temperatureC);
  const loopResistanceOhm = (2 * input.lengthM * rOhmPerKm) / 1000;
  const dropV = loopDropV(input.currentA, input.lengthM, rOhmPerKm, loadDistribution);
  const dropPercent = dropPercentOf(dropV, input.supplyVoltageV);
  // Vd = 2·L·I·R′ assumes the load still draws I; a drop as large as the supply means it cannot:
  // there is no voltage left at the load, and a negative one would be reported as if real.
  const exceedsSupply = dropExceedsSupply(dropV, input.supplyVoltageV);
  const voltageAtLoadV = exceedsSupply ? 0 : input.supplyVoltageV - dropV;
  const withinLimit = !exceedsSupply && withinDropLimit(dropPercent, maxDropPercent);

  const warnings: Warning[] = [];
  if (exceedsSupply) warnings.push(dropExceedsSupplyWarning(sizeLabel, input.lengthM, input.currentA, dropV, input.supplyVoltageV));
  if (!withinLimit) {
    warnings.push({
      code: 'drop_over_limit',
      message: `${sizeLabel} over ${input.lengthM} m drops ${round(dropPercent, 2)} %, over the ${maxDropPercent} % limit: use a larger conductor or a shorter run.`,
    });
  }
  const runWarning = runLengthWarning(input.lengthM);
  if (runWarning) warnings.push(runWarning);
  if (input.currentA > row.currentRatingA) {
    warnings.push({
      code: 'current_over_rating',
      message: `${input.currentA} A exceeds the ${row.currentRatingA} A rating of ${sizeLabel} (${row.currentRatingSource}): the cable would overheat.`,
    });
  }
  if (input.maxDropPercent === undefined) warnings.push(defaultDropLimitWarning());

  const trace: TraceEntry[] = [
    settingEntry('conductorTable', tableId, '', input.conductorTable !== undefined, table.reference, `default for a ${'awg' in input.conductor ? 'gauge' : 'mm²'} size`),
    settingEntry('temperatureC', temperatureC, '°C', input.temperatureC !== undefined, table.reference, 'default: the table’s reference temperature', {
      referenceTemperatureC: table.referenceTemperatureC,
    }),
    {
      quantity: 'resistanceOhmPerKm',
      value: round(rOhmPerKm, 4),
      unit: 'Ω/km',
      formula: 'R_T = R_ref · (1 + α · (T − T_ref)), 1/α = 1/0.00393 + (T_ref − 20)',
      inputs: {
        size: sizeLabel,
        resistanceRefOhmPerKm: round(row.resistanceOhmPerKm, 4),
        referenceTemperatureC: table.referenceTemperatureC,
        temperatureC,
        alpha: round(copperAlphaAt(table.referenceTemperatureC), 6),
      },
      reference: `${row.resistanceSource}; temperature correction IEC 60028`,
    },
    {
      quantity: 'resistanceBasis',
      value: `${table.id} at ${temperatureC} °C`,
      unit: '',
      formula: input.temperatureC === undefined ? 'default: the table’s reference temperature, not the Annex G service resistivity (1.25 × ρ20) that estimates use' : 'as given',
      inputs: { conductorTable: tableId, temperatureC, referenceTemperatureC: table.referenceTemperatureC },
      reference: table.reference,
    },
    {
      quantity: 'loopResistanceOhm',
      value: round(loopResistanceOhm, 6),
      unit: 'Ω',
      formula: 'R_loop = 2 · L · R′',
      inputs: { lengthM: input.lengthM, resistanceOhmPerKm: round(rOhmPerKm, 4) },
      reference: LOOP_REFERENCE,
    },
    {
      quantity: 'dropV',
      value: round(dropV, 4),
      unit: 'V',
      formula: loadDistribution === 'uniform' ? 'Vd = 2 · L · I · R′ / 2' : 'Vd = 2 · L · I · R′',
      inputs: { lengthM: input.lengthM, currentA: input.currentA, resistanceOhmPerKm: round(rOhmPerKm, 4), loadDistribution, loadDistributionDefault: input.loadDistribution === undefined },
      reference: loadDistribution === 'uniform' ? `${LOOP_REFERENCE}; ${UNIFORM_REFERENCE}` : LOOP_REFERENCE,
    },
    {
      quantity: 'dropPercent',
      value: round(dropPercent, 4),
      unit: '%',
      formula: 'Vd / V · 100',
      inputs: { dropV: round(dropV, 4), supplyVoltageV: input.supplyVoltageV },
      reference: LOOP_REFERENCE,
    },
    {
      quantity: 'voltageAtLoadV',
      value: round(voltageAtLoadV, 4),
      unit: 'V',
      formula: exceedsSupply ? 'max(0, V − Vd): the drop is not less than the supply' : 'V − Vd',
      inputs: { supplyVoltageV: input.supplyVoltageV, dropV: round(dropV, 4) },
      reference: LOOP_REFERENCE,
    },
    {
      quantity: 'withinLimit',
      value: withinLimit,
      unit: '',
      formula: 'dropPercent ≤ maxDropPercent',
      inputs: { dropPercent: round(dropPercent, 4), maxDropPercent, maxDropPercentDefault: input.maxDropPercent === undefined },
      reference: DROP_LIMIT_REFERENCE,
    },
    {
      quantity: 'currentRatingA',
      value: row.currentRatingA,
      unit: 'A',
      formula: 'table lookup',
      inputs: { size: sizeLabel, currentA: input.currentA },
      reference: row.currentRatingSource,
    },
  ];

  return {
    resistanceOhmPerKm: round(rOhmPerKm, 4),
    loopResistanceOhm: round(loopResistanceOhm, 6),
    dropV: round(dropV, 4),
    dropPercent: round(dropPercent, 4),
    voltageAtLoadV: round(voltageAtLoadV, 4),
    maxDropPercent,
    withinLimit,
    conductorTable: tableId,
    temperatureC,
    loadDistribution,
    currentRatingA: row.currentRatingA,
    warnings,
    engineVersion: ENGINE_VERSION,
    trace,
  };
}

/** True when the computed drop leaves no voltage at the load (Vd ≥ V): the figure is not physical. */
export function dropExceedsSupply(dropV: number, supplyVoltageV: number): boolean {
  return dropV >= supplyVoltageV;
}

export function dropExceedsSupplyWarning(sizeLabel: string, lengthM: number, currentA: number, dropV: number, supplyVoltageV: number): Warning {
  return {
    code: 'drop_exceeds_supply',
    message:
      `${sizeLabel} over ${lengthM} m at ${currentA} A would drop ${round(dropV, 2)} V, not less than the ${supplyVoltageV} V supply: ` +
      'no voltage would reach the load and that current could not flow. The figures assume a run that cannot work: use a far larger conductor, a shorter run, a lower current or a higher voltage.',
  };
}
