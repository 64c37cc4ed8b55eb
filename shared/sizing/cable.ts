import type { CableAlternative, CableInput, CableResult } from '../schemas/cable.js';
import { conductorTable, correctForTemperature, DEFAULT_METRIC_TABLE, describeSize, sizeOfRow, type ConductorSize } from './conductors.js';
import type { ConductorRow, ConductorTableId } from '../tables/conductors.js';
import { round, settingEntry, type TraceEntry, type Warning } from './trace.js';
import { ENGINE_VERSION } from './version.js';
import {
  DEFAULT_MAX_DROP_PERCENT,
  DROP_LIMIT_REFERENCE,
  LOOP_REFERENCE,
  UNIFORM_REFERENCE,
  defaultDropLimitWarning,
  dropExceedsSupply,
  dropExceedsSupplyWarning,
  dropPercentOf,
  loopDropV,
  runLengthWarning,
  withinDropLimit,
  type LoadDistribution,
} from './voltage-drop.js';

/** Controller-to-tread extension cable: common practice, no published source. */
export const DEFAULT_MIN_CROSS_SECTION_MM2 = 0.5;
const MIN_SIZE_REFERENCE = 'common practice, no published source (copper no thinner than 0.5 mm²)';

export interface CableOptions {
  conductorTable?: ConductorTableId | undefined;
  maxDropPercent?: number | undefined;
  minCrossSectionMm2?: number | undefined;
  temperatureC?: number | undefined;
  loadDistribution?: LoadDistribution | undefined;
  /** The size must also be rated for this current, A (a current-limited driver's limit, which may never blow a fuse). */
  mustCarryA?: number | undefined;
  /** Multiplies every table resistance after the temperature correction (1.25 for the Annex G service resistivity). */
  resistanceFactor?: number | undefined;
}

export interface SuitableConductor {
  size: ConductorSize;
  row: ConductorRow;
  resistanceOhmPerKm: number;
  dropV: number;
  dropPercent: number;
}

// Metric sizes are exact; an AWG area is a computed float, so allow for rounding.
function meetsMinimum(row: ConductorRow, minCrossSectionMm2: number): boolean {
  return row.areaMm2 >= minCrossSectionMm2 * (1 - 1e-9);
}

/**
 * The smallest size of the table not thinner than the minimum that keeps the drop within the
 * limit and carries the current; null when none does. Rows ascend in cross-section, so the
 * first to pass is the answer. No trace: this is what the estimate calls per tread.
 */
export function smallestSuitableConductor(
  supplyVoltageV: number,
  currentA: number,
  lengthM: number,
  options: CableOptions = {},
): SuitableConductor | null {
  const table = conductorTable(options.conductorTable ?? DEFAULT_METRIC_TABLE);
  const temperatureC = options.temperatureC ?? table.referenceTemperatureC;
  const maxDropPercent = options.maxDropPercent ?? DEFAULT_MAX_DROP_PERCENT;
  const minCrossSectionMm2 = options.minCrossSectionMm2 ?? DEFAULT_MIN_CROSS_SECTION_MM2;
  const mustCarryA = Math.max(currentA, options.mustCarryA ?? 0);
  for (const row of table.rows) {
    if (!meetsMinimum(row, minCrossSectionMm2) || mustCarryA > row.currentRatingA) continue;
    const r = runResistanceOhmPerKm(row, table.referenceTemperatureC, temperatureC, options.resistanceFactor);
    const dropV = loopDropV(currentA, lengthM, r, options.loadDistribution);
    const dropPercent = dropPercentOf(dropV, supplyVoltageV);
    if (withinDropLimit(dropPercent, maxDropPercent)) {
      return { size: sizeOfRow(table, row), row, resistanceOhmPerKm: r, dropV, dropPercent };
    }
  }
  return null;
}

/** One conductor's resistance for a run: the table value at the temperature, times the resistance factor. */
export function runResistanceOhmPerKm(row: ConductorRow, referenceTemperatureC: number, temperatureC: number, resistanceFactor = 1): number {
  return correctForTemperature(row.resistanceOhmPerKm, referenceTemperatureC, temperatureC) * resistanceFactor;
}

type AlternativeChecks = Omit<CableAlternative, 'awg' | 'crossSectionMm2'>;

// Built field by field: an object spread here cost ~10 µs per size in V8, and the estimate calls this per tread.
function withSize(awg: boolean, size: number, c: AlternativeChecks): CableAlternative {
  return awg
    ? { awg: size, areaMm2: c.areaMm2, dropV: c.dropV, dropPercent: c.dropPercent, currentRatingA: c.currentRatingA, withinLimit: c.withinLimit, carriesCurrent: c.carriesCurrent, meetsMinimum: c.meetsMinimum }
    : { crossSectionMm2: size, areaMm2: c.areaMm2, dropV: c.dropV, dropPercent: c.dropPercent, currentRatingA: c.currentRatingA, withinLimit: c.withinLimit, carriesCurrent: c.carriesCurrent, meetsMinimum: c.meetsMinimum };
}

export function chooseCable(input: CableInput): CableResult {
  const tableId = input.conductorTable ?? DEFAULT_METRIC_TABLE;
  const table = conductorTable(tableId);
  const temperatureC = input.temperatureC ?? table.referenceTemperatureC;
  const maxDropPercent = input.maxDropPercent ?? DEFAULT_MAX_DROP_PERCENT;
  const minCrossSectionMm2 = input.minCrossSectionMm2 ?? DEFAULT_MIN_CROSS_SECTION_MM2;
  const loadDistribution = input.loadDistribution ?? 'end';

  const alternatives: CableAlternative[] = [];
  let chosen: CableAlternative | null = null;
  let chosenRow: ConductorRow | null = null;
  for (const row of table.rows) {
    const r = correctForTemperature(row.resistanceOhmPerKm, table.referenceTemperatureC, temperatureC);
    const dropV = loopDropV(input.currentA, input.lengthM, r, loadDistribution);
    const dropPercent = dropPercentOf(dropV, input.supplyVoltageV);
    const checks = {
      areaMm2: round(row.areaMm2, 4),
      dropV: round(dropV, 4),
      dropPercent: round(dropPercent, 4),
      currentRatingA: row.currentRatingA,
      withinLimit: withinDropLimit(dropPercent, maxDropPercent),
      carriesCurrent: input.currentA <= row.currentRatingA,
      meetsMinimum: meetsMinimum(row, minCrossSectionMm2),
    };
    const alternative: CableAlternative = withSize(table.system === 'awg', row.size, checks);
    alternatives.push(alternative);
    if (!chosen && alternative.withinLimit && alternative.carriesCurrent && alternative.meetsMinimum) {
      chosen = alternative;
      chosenRow = row;
    }
  }
  const recommended: ConductorSize | null = chosenRow ? sizeOfRow(table, chosenRow) : null;

  const warnings: Warning[] = [];
  if (!recommended) {
    warnings.push({
      code: 'no_suitable_size',
      message: `No size in "${tableId}" from ${minCrossSectionMm2} mm² up keeps ${input.currentA} A over ${input.lengthM} m within ${maxDropPercent} % and within its current rating: shorten the run, raise the voltage or split the load.`,
    });
  }
  // Even the largest size leaves no voltage at the load: the run cannot work with any cable of the table.
  const largest = alternatives.at(-1);
  if (largest && dropExceedsSupply(largest.dropV, input.supplyVoltageV)) {
    warnings.push(dropExceedsSupplyWarning(`the largest size, ${describeSize(largest)},`, input.lengthM, input.currentA, largest.dropV, input.supplyVoltageV));
  }
  const runWarning = runLengthWarning(input.lengthM);
  if (runWarning) warnings.push(runWarning);
  if (input.maxDropPercent === undefined) warnings.push(defaultDropLimitWarning());

  const loopReference = loadDistribution === 'uniform' ? `${LOOP_REFERENCE}; ${UNIFORM_REFERENCE}` : LOOP_REFERENCE;
  const trace: TraceEntry[] = [
    settingEntry('conductorTable', tableId, '', input.conductorTable !== undefined, table.reference),
    settingEntry('temperatureC', temperatureC, '°C', input.temperatureC !== undefined, table.reference, 'default: the table’s reference temperature', {
      referenceTemperatureC: table.referenceTemperatureC,
    }),
    settingEntry('maxDropPercent', maxDropPercent, '%', input.maxDropPercent !== undefined, DROP_LIMIT_REFERENCE),
    settingEntry('minCrossSectionMm2', minCrossSectionMm2, 'mm²', input.minCrossSectionMm2 !== undefined, MIN_SIZE_REFERENCE),
    {
      quantity: 'recommended',
      value: recommended ? describeSize(recommended) : 'none',
      unit: '',
      formula: 'smallest size with area ≥ minCrossSectionMm2, Vd = 2 · L · I · R′ within the limit, and I ≤ current rating',
      inputs: {
        supplyVoltageV: input.supplyVoltageV,
        currentA: input.currentA,
        lengthM: input.lengthM,
        loadDistribution,
        maxDropPercent,
        minCrossSectionMm2,
        temperatureC,
      },
      reference: loopReference,
    },
  ];
  if (chosen && chosenRow && recommended) {
    const row = chosenRow;
    trace.push(
      {
        quantity: 'dropV',
        value: chosen.dropV,
        unit: 'V',
        formula: loadDistribution === 'uniform' ? 'Vd = 2 · L · I · R′ / 2' : 'Vd = 2 · L · I · R′',
        inputs: {
          lengthM: input.lengthM,
          currentA: input.currentA,
          resistanceOhmPerKm: round(correctForTemperature(row.resistanceOhmPerKm, table.referenceTemperatureC, temperatureC), 4),
        },
        reference: `${loopReference}; R′ from ${row.resistanceSource}, temperature correction IEC 60028`,
      },
      {
        quantity: 'dropPercent',
        value: chosen.dropPercent,
        unit: '%',
        formula: 'Vd / V · 100',
        inputs: { dropV: chosen.dropV, supplyVoltageV: input.supplyVoltageV },
        reference: LOOP_REFERENCE,
      },
      {
        quantity: 'currentRatingA',
        value: chosen.currentRatingA,
        unit: 'A',
        formula: 'table lookup',
        inputs: { size: describeSize(recommended), currentA: input.currentA },
        reference: row.currentRatingSource,
      },
    );
  }

  return {
    recommended,
    dropV: chosen ? chosen.dropV : null,
    dropPercent: chosen ? chosen.dropPercent : null,
    currentRatingA: chosen ? chosen.currentRatingA : null,
    conductorTable: tableId,
    temperatureC,
    maxDropPercent,
    minCrossSectionMm2,
    alternatives,
    warnings,
    engineVersion: ENGINE_VERSION,
    trace,
  };
}

export interface FeederInput extends CableOptions {
  supplyVoltageV: number;
  /** The whole load the controller draws through the feeder. */
  totalCurrentA: number;
  lengthM: number;
  /** The controller profile's maximum input current, when it has one. */
  maxInputCurrentA?: number | undefined;
}

export interface FeederResult {
  cable: CableResult;
  totalCurrentA: number;
  maxInputCurrentA: number | null;
  /** null when the profile gives no maximum. */
  exceedsControllerInput: boolean | null;
  warnings: Warning[];
  trace: TraceEntry[];
}

/** Driver → controller feeder: it carries every output's current, so size it for the total. */
export function sizeFeeder(input: FeederInput): FeederResult {
  const { totalCurrentA, maxInputCurrentA, ...rest } = input;
  const cable = chooseCable({ ...rest, currentA: totalCurrentA });
  const exceeds = maxInputCurrentA === undefined ? null : totalCurrentA > maxInputCurrentA;
  const warnings: Warning[] = [];
  if (exceeds) {
    warnings.push({
      code: 'controller_input_current_exceeded',
      message: `The load draws ${round(totalCurrentA, 3)} A through the controller, over its ${maxInputCurrentA} A maximum input: feed part of the load around the controller or use a larger one.`,
    });
  }
  const trace: TraceEntry[] = [
    {
      quantity: 'exceedsControllerInput',
      value: exceeds === null ? 'not checked' : exceeds,
      unit: '',
      formula: 'totalCurrentA > maxInputCurrentA',
      inputs: { totalCurrentA, maxInputCurrentA: maxInputCurrentA ?? null },
      reference: 'controller profile data',
    },
  ];
  return { cable, totalCurrentA, maxInputCurrentA: maxInputCurrentA ?? null, exceedsControllerInput: exceeds, warnings, trace };
}
