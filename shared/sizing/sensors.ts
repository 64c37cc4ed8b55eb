import type { SensorInput } from '../schemas/controller.js';
import { type TraceEntry, type Warning } from './trace.js';

/** Most a sensor should draw from a stair controller's input (common practice, no published source). */
export const TYPICAL_SENSOR_CURRENT_MA = 10;

/**
 * The lights run only below this ambient level. Reasoning: a hallway with its general
 * lighting on measures about 80 lx and an overcast day about 1 000 lx, while EN 12464-1:2021
 * asks 100 lx for corridors and 150 lx for stairs. Orientation lights are wanted when the
 * general light is off or daylight has faded, so the cut-off sits well under a lit hallway
 * and under both EN 12464-1 values: 50 lx (common practice, no published source).
 */
export const DEFAULT_DAYLIGHT_CUTOFF_LUX = 50;

export interface MotionSensor {
  outputType: 'pnp' | 'npn';
  supplyV: number;
  currentMa: number;
}

export interface SensorFlight {
  treads: number;
  /** People enter the stair at the landing above this flight (ignored on the last flight). */
  joinedLandingAbove?: boolean;
}

export interface SensorPlanInput {
  /** Flights foot first; ignored for a corridor. */
  flights?: SensorFlight[];
  /** A corridor has a sensor at each end and one at every side entrance. */
  corridor?: { sideEntrances?: number };
  motion?: MotionSensor;
  sensorInput?: SensorInput;
  daylightCutoffLux?: number;
}

export interface SensorPlacement {
  role: 'foot' | 'head' | 'landing' | 'corridor-end' | 'side-entrance';
  /** Flight number from 1; null in a corridor. */
  flight: number | null;
  /** Tread the sensor looks over (1 = foot); null on a landing or in a corridor. */
  tread: number | null;
}

export interface SensorPlan {
  motionSensors: number;
  placements: SensorPlacement[];
  /** null when the sensor or the controller input is not described. */
  typeMatch: boolean | null;
  needsInterface: boolean;
  supplyMatch: boolean | null;
  currentLimitMa: number;
  currentOk: boolean | null;
  totalSensorCurrentMa: number | null;
  daylightCutoffLux: number;
  warnings: Warning[];
}

export function sensorPlan(input: SensorPlanInput): SensorPlan {
  const placements = input.corridor ? corridorPlacements(input.corridor.sideEntrances ?? 0) : stairPlacements(input.flights ?? []);
  const { motion, sensorInput } = input;
  const warnings: Warning[] = [];

  const typeMatch = motion && sensorInput ? motion.outputType === sensorInput.type : null;
  // Sensors are rated for one supply; 5 % covers rounding of nominal voltages.
  const supplyMatch = motion && sensorInput ? Math.abs(motion.supplyV - sensorInput.supplyV) <= 0.05 * motion.supplyV : null;
  const currentLimitMa = sensorInput?.maxCurrentMa ?? TYPICAL_SENSOR_CURRENT_MA;
  const currentOk = motion ? motion.currentMa <= currentLimitMa : null;

  if (typeMatch === false) {
    warnings.push({
      code: 'sensor_type_mismatch',
      message: `The sensor's output is ${motion?.outputType.toUpperCase()} but the controller input expects ${sensorInput?.type.toUpperCase()}; fit an interface (or a sensor of the other type).`,
    });
  }
  if (supplyMatch === false) {
    warnings.push({
      code: 'sensor_supply_mismatch',
      message: `The sensor is rated for ${motion?.supplyV} V but the controller supplies ${sensorInput?.supplyV} V.`,
    });
  }
  if (currentOk === false) {
    warnings.push({
      code: 'sensor_current_exceeded',
      message: `The sensor draws ${motion?.currentMa} mA; the input gives at most ${currentLimitMa} mA.`,
    });
  }
  return {
    motionSensors: placements.length,
    placements,
    typeMatch,
    needsInterface: typeMatch === false,
    supplyMatch,
    currentLimitMa,
    currentOk,
    totalSensorCurrentMa: motion ? motion.currentMa * placements.length : null,
    daylightCutoffLux: input.daylightCutoffLux ?? DEFAULT_DAYLIGHT_CUTOFF_LUX,
    warnings,
  };
}

/**
 * One sensor at the foot and one at the head of the whole stair — an L or U stair with a plain
 * landing still has two — and one on each landing where people enter or leave (team handbook,
 * "Rules of thumb"; common practice, no published source). Landings are listed after the head.
 */
function stairPlacements(flights: SensorFlight[]): SensorPlacement[] {
  if (flights.length === 0) return [];
  const treads = flights.reduce((sum, f) => sum + f.treads, 0);
  const placements: SensorPlacement[] = [
    { role: 'foot', flight: 1, tread: 1 },
    { role: 'head', flight: flights.length, tread: treads },
  ];
  flights.forEach((flight, i) => {
    if (flight.joinedLandingAbove && i < flights.length - 1) placements.push({ role: 'landing', flight: i + 1, tread: null });
  });
  return placements;
}

/** Most sensors one controller reads when the profile does not say: foot and head (common practice, from memory). */
export const DEFAULT_SENSOR_INPUTS = 2;

function corridorPlacements(sideEntrances: number): SensorPlacement[] {
  const end: SensorPlacement = { role: 'corridor-end', flight: null, tread: null };
  const side: SensorPlacement = { role: 'side-entrance', flight: null, tread: null };
  return [end, { ...end }, ...Array.from({ length: sideEntrances }, () => ({ ...side }))];
}

export function sensorTrace(input: SensorPlanInput, plan: SensorPlan): TraceEntry[] {
  const joined = input.flights?.filter((f, i, all) => f.joinedLandingAbove && i < all.length - 1).length ?? 0;
  return [
    {
      quantity: 'motionSensors',
      value: plan.motionSensors,
      unit: 'sensors',
      formula: input.corridor ? '2 corridor ends + side entrances' : '2 (foot and head of the whole stair) + landings where people enter',
      inputs: input.corridor
        ? { sideEntrances: input.corridor.sideEntrances ?? 0 }
        : { flights: input.flights?.length ?? 0, joinedLandings: joined },
      reference: 'one sensor at the foot and one at the head of the whole stair, one per landing where people enter (common practice, no published source)',
    },
    {
      quantity: 'sensorCurrentLimitMa',
      value: plan.currentLimitMa,
      unit: 'mA',
      formula: 'sensor currentMa ≤ controller maxCurrentMa (≈ 10 mA when the profile gives none)',
      inputs: {
        sensorCurrentMa: input.motion?.currentMa ?? null,
        limitDefaulted: input.sensorInput === undefined,
        currentOk: plan.currentOk,
      },
      reference: input.sensorInput ? 'controller profile' : 'about 10 mA per sensor input (common practice, no published source)',
    },
    {
      quantity: 'sensorTypeMatch',
      value: plan.typeMatch ?? 'unknown',
      unit: '',
      formula: 'sensor output type = controller input type, else an interface is needed',
      inputs: { sensorType: input.motion?.outputType ?? null, inputType: input.sensorInput?.type ?? null },
      reference: 'PNP sources, NPN sinks (three-wire DC sensor outputs, IEC 60947-5-2)',
    },
    {
      quantity: 'daylightCutoffLux',
      value: plan.daylightCutoffLux,
      unit: 'lx',
      formula: input.daylightCutoffLux === undefined ? 'default: below a lit hallway (~80 lx) and EN 12464-1 stairs 150 lx / corridors 100 lx' : 'as given',
      inputs: { defaulted: input.daylightCutoffLux === undefined, hallwayLux: 80, overcastLux: 1000, stairsLux: 150, corridorsLux: 100 },
      reference:
        input.daylightCutoffLux === undefined
          ? 'EN 12464-1:2021 maintained illuminance; ambient values from the team handbook; 50 lx default (common practice, no published source)'
          : 'as given',
    },
  ];
}
