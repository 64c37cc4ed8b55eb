import type { SensorInput } from '../../schemas/controller.js';
import type { EstimateInput, EstimateSensorsResult } from '../../schemas/estimate.js';
import { treadPositionsM, type StairGeometry } from '../geometry.js';
import { describeSize, type ConductorSize } from '../conductors.js';
import { DEFAULT_SENSOR_INPUTS, sensorPlan, sensorTrace, TYPICAL_SENSOR_CURRENT_MA, type MotionSensor, type SensorPlan, type SensorPlanInput } from '../sensors.js';
import { round, type TraceEntry } from '../trace.js';
import { DEFAULT_RAIL_DATA_LEAD_M } from './data-lines.js';
import type { BlockRuns } from './stair.js';
import { findMotionSensor, type CatalogIndex } from './catalog.js';
import type { Settings } from './settings.js';

export interface SensorPart {
  plan: SensorPlan;
  motion: EstimateSensorsResult['motion'];
  controllerInput: EstimateSensorsResult['controllerInput'];
  daylightSensors: number;
  daylightSku: string | undefined;
  response: EstimateSensorsResult;
  /** Sensor cable and the sensors on each controller, once the controllers are placed. */
  wiring?: SensorWiring;
}

/** Usual stair-controller input when the profile does not say (common practice, no published source). */
const TYPICAL_SENSOR_INPUT: SensorInput = Object.freeze({ type: 'pnp', supplyV: 5, maxCurrentMa: TYPICAL_SENSOR_CURRENT_MA });
const TYPICAL_INPUT = Object.freeze({ ...TYPICAL_SENSOR_INPUT, source: 'typical' } as const);

/**
 * Motion sensors at the foot and head of every flight (and joined landings), or at the ends of
 * a corridor; a daylight sensor per controller when the lux cut-off is used.
 */
export function planSensors(input: EstimateInput, settings: Settings, catalog: CatalogIndex | null, controllers: number, trace: TraceEntry[]): SensorPart {
  const s = input.sensors ?? {};
  const { profile } = settings;
  const staircase = input.staircase;
  const joined = s.joinedLandings ?? [];

  let motion: SensorPart['motion'] = null;
  if (s.motion) {
    const item = catalog ? findMotionSensor(catalog, s.motion) : undefined;
    const m = s.motion;
    motion = { outputType: m.outputType, supplyV: m.supplyV, currentMa: m.currentMa, source: 'request' };
    if (item) motion.sku = item.sku;
  } else if (catalog) {
    const item = findMotionSensor(catalog, { outputType: profile.sensorInput?.type ?? 'pnp' });
    if (item) motion = { outputType: item.outputType, supplyV: item.supplyV, currentMa: item.currentMa, source: 'catalog', sku: item.sku };
  }
  const motionSensor: MotionSensor | undefined = motion ? { outputType: motion.outputType, supplyV: motion.supplyV, currentMa: motion.currentMa } : undefined;

  // Without a stated input the typical one is checked against; the trace still says it was not stated.
  const planInput: SensorPlanInput = staircase
    ? {
        flights: (staircase.flights ?? [{ treads: staircase.treads }]).map((f, i) => ({ treads: f.treads, joinedLandingAbove: joined.includes(i + 1) })),
        motion: motionSensor,
        sensorInput: profile.sensorInput ?? TYPICAL_SENSOR_INPUT,
        daylightCutoffLux: s.daylightCutoffLux,
      }
    : {
        corridor: { sideEntrances: s.sideEntrances ?? 0 },
        motion: motionSensor,
        sensorInput: profile.sensorInput ?? TYPICAL_SENSOR_INPUT,
        daylightCutoffLux: s.daylightCutoffLux,
      };
  const plan = sensorPlan(planInput);

  const stated = profile.sensorInput;
  const controllerInput: SensorPart['controllerInput'] = stated
    ? { type: stated.type, supplyV: stated.supplyV, maxCurrentMa: stated.maxCurrentMa, source: 'profile' }
    : TYPICAL_INPUT;
  const daylightSensors = settings.daylightCutoff ? controllers : 0;
  const daylightSku = settings.daylightCutoff && catalog ? catalog.daylightSensors[0]?.sku : undefined;

  const traceInput: SensorPlanInput = { flights: planInput.flights, corridor: planInput.corridor, motion: motionSensor, sensorInput: stated, daylightCutoffLux: s.daylightCutoffLux };
  for (const entry of sensorTrace(traceInput, plan)) {
    if (entry.quantity !== 'daylightCutoffLux' || settings.daylightCutoff) trace.push(entry);
  }
  trace.push({
    quantity: 'daylightSensors',
    value: daylightSensors,
    unit: 'sensors',
    formula: settings.daylightCutoff ? 'one ambient-light sensor per controller' : 'no daylight cut-off used',
    inputs: { controllers, useDaylightCutoff: settings.daylightCutoff },
    reference: 'each controller reads its own ambient-light input (common practice, no published source)',
  });

  const response: EstimateSensorsResult = {
    motionSensors: plan.motionSensors,
    placements: plan.placements,
    motion,
    controllerInput,
    typeMatch: plan.typeMatch,
    needsInterface: plan.needsInterface,
    supplyMatch: plan.supplyMatch,
    currentOk: plan.currentOk,
    totalSensorCurrentMa: plan.totalSensorCurrentMa,
    daylightSensors,
    daylightCutoffLux: settings.daylightCutoff ? plan.daylightCutoffLux : null,
    daylightCutoffDefaulted: settings.daylightCutoff && s.daylightCutoffLux === undefined,
  };
  return { plan, motion, controllerInput, daylightSensors, daylightSku, response };
}

export interface SensorWiring {
  /** Cable from the controller to each placement, m (same order as the placements). */
  lengthsM: number[];
  /** Controller each placement is wired to (from 1). */
  controllers: number[];
  totalM: number;
  /** Sensors wired to the busiest controller, and which controller that is. */
  mostOnOneController: number;
  busiestController: number;
  sensorInputs: number;
  sensorInputsDefaulted: boolean;
}

/** Where the controllers sit along the stair (tread blocks), or null for a rail or corridor. */
export interface ControllerSites {
  stair: StairGeometry | null;
  blocks: readonly BlockRuns[] | null;
  /** The rail's length and the lead from its controller to its start (rail layouts). */
  rail: { lengthM: number; leadM: number } | null;
}

/**
 * Sensor cable from the geometry (issue 8): foot, head and landing sensors sit at their place
 * along the stair and are wired to the controller whose block holds them, |x − x(controller)|
 * + the service allowance; along a rail or corridor the controller sits at its start, a far-end
 * sensor at its end and a side entrance (position unknown) at its middle.
 */
export function sensorWiring(part: SensorPart, sites: ControllerSites, settings: Settings, trace: TraceEntry[]): SensorWiring {
  const placements = part.plan.placements;
  const allowanceM = settings.cable.serviceAllowanceM;
  const lengthsM: number[] = [];
  const controllers: number[] = [];
  const { stair, blocks } = sites;
  if (stair && blocks && blocks.length > 0) {
    const x = treadPositionsM(stair);
    const flights = stair.flights && stair.flights.length > 0 ? stair.flights : [{ treads: stair.treads }];
    const blockOf = (tread: number) => blocks.find((b) => tread >= b.firstTread && tread <= b.lastTread) ?? (blocks[0] as BlockRuns);
    for (const p of placements) {
      let tread: number;
      let at: number;
      if (p.role === 'landing' && p.flight !== null) {
        tread = flights.slice(0, p.flight).reduce((sum, f) => sum + f.treads, 0);
        at = ((x[tread - 1] as number) + (x[tread] as number)) / 2;
      } else {
        tread = p.tread ?? 1;
        at = x[tread - 1] as number;
      }
      const block = blockOf(tread);
      controllers.push(block.controller);
      lengthsM.push(Math.abs(at - (x[block.atTread - 1] as number)) + allowanceM);
    }
  } else {
    // A rail along a stair or a corridor: the controller beside the rail's start.
    const lengthM = sites.rail?.lengthM ?? (stair ? treadPositionsM(stair)[stair.treads - 1] ?? 0 : 0);
    const leadM = sites.rail?.leadM ?? allowanceM;
    let ends = 0;
    for (const p of placements) {
      controllers.push(1);
      if (p.role === 'side-entrance' || p.role === 'landing') lengthsM.push(lengthM / 2 + leadM);
      else lengthsM.push((p.role === 'head' || (p.role === 'corridor-end' && ends++ > 0) ? lengthM : 0) + leadM);
    }
  }
  const perController = new Map<number, number>();
  for (const c of controllers) perController.set(c, (perController.get(c) ?? 0) + 1);
  let busiestController = 1;
  let most = 0;
  for (const [c, count] of perController) {
    if (count > most) {
      most = count;
      busiestController = c;
    }
  }
  const totalM = lengthsM.reduce((sum, l) => sum + l, 0);
  const inputs = settings.profile.sensorInputs;
  trace.push({
    quantity: 'sensorCableM',
    value: round(totalM, 3),
    unit: 'm',
    formula: stair && blocks && blocks.length > 0 ? 'Σ |x(sensor) − x(controller)| + serviceAllowanceM' : 'Σ distance from the rail’s start (far end: its length; side entrance: its middle) + lead',
    inputs: { sensors: placements.length, serviceAllowanceM: allowanceM },
    reference: 'stair geometry (Pythagoras per step); sensors at the foot, head and entered landings (common practice, no published source)',
  });
  return {
    lengthsM,
    controllers,
    totalM,
    mostOnOneController: most,
    busiestController,
    sensorInputs: inputs ?? DEFAULT_SENSOR_INPUTS,
    sensorInputsDefaulted: inputs === undefined,
  };
}

/** Adds the cable lengths to the response and gives the bill-of-materials line for the sensor cable. */
export function sensorCableLine(part: SensorPart, wiring: SensorWiring, settings: Settings): SensorCableLine | null {
  part.response.placements.forEach((p, i) => {
    (p as { cableLengthM?: number }).cableLengthM = round(wiring.lengthsM[i] as number, 3);
  });
  part.response.sensorCableM = round(wiring.totalM, 3);
  if (wiring.lengthsM.length === 0) return null;
  const size: ConductorSize = settings.cable.system === 'awg' ? { awg: 22 } : { crossSectionMm2: settings.cable.minCrossSectionMm2 };
  return {
    description: `3-core sensor cable (supply, 0 V, signal) ${describeSize(size)}, ${wiring.lengthsM.length} run${wiring.lengthsM.length === 1 ? '' : 's'}`,
    metres: Math.ceil(wiring.totalM - 1e-9),
    size,
  };
}

/** The sensor cable to order: 3 cores (supply, 0 V, signal) of the smallest size the table allows. */
export interface SensorCableLine {
  description: string;
  metres: number;
  size: ConductorSize;
}

/** Where the layout put its controllers (tread blocks) or its rail. */
export function controllerSites(
  stair: StairGeometry | null,
  treadStrips: { runs: { blocks: BlockRuns[] } } | null,
  treadPixels: { runs: { blocks: BlockRuns[] } } | null,
  rail: { rail: { lengthM: number; dataLeadM?: number | undefined } } | null,
): ControllerSites {
  const blocks = treadStrips?.runs.blocks ?? treadPixels?.runs.blocks ?? null;
  return {
    stair,
    blocks,
    rail: rail ? { lengthM: rail.rail.lengthM, leadM: rail.rail.dataLeadM ?? DEFAULT_RAIL_DATA_LEAD_M } : null,
  };
}
