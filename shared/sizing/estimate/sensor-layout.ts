import type { SensorInput } from '../../schemas/controller.js';
import type { EstimateInput, EstimateSensorsResult } from '../../schemas/estimate.js';
import { sensorPlan, sensorTrace, TYPICAL_SENSOR_CURRENT_MA, type MotionSensor, type SensorPlan, type SensorPlanInput } from '../sensors.js';
import type { TraceEntry } from '../trace.js';
import { findMotionSensor, type CatalogIndex } from './catalog.js';
import type { Settings } from './settings.js';

export interface SensorPart {
  plan: SensorPlan;
  motion: EstimateSensorsResult['motion'];
  controllerInput: EstimateSensorsResult['controllerInput'];
  daylightSensors: number;
  daylightSku: string | undefined;
  response: EstimateSensorsResult;
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
