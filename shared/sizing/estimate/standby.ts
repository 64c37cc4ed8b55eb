import type { EstimateInput, EstimateStandby } from '../../schemas/estimate.js';
import { round, type TraceEntry } from '../trace.js';
import type { RailPart } from './rail-pixels.js';
import type { SensorPart } from './sensor-layout.js';
import type { TreadPixelPart } from './tread-pixels.js';

/**
 * What the installation draws while the stair is dark, and its yearly energy: owners ask what
 * it costs to run. Figures come from the request where given; the defaults are recalled typical
 * values, marked as such in the trace.
 */

/** A small stair controller's own draw, W: from memory, no published source — use the datasheet. */
export const DEFAULT_CONTROLLER_STANDBY_W = 0.5;
/** A driver's no-load input, W: LED control gear standby ≤ 0.5 W (EU Regulation 2019/2020, from memory). */
export const DEFAULT_DRIVER_NO_LOAD_W = 0.5;
/** A dark pixel IC's quiescent current, mA: about 0.5–1 mA (from memory); the upper figure. */
export const DEFAULT_DARK_PIXEL_MA = 1;
/** An ambient-light sensor's draw, W: from memory, no published source. */
export const DEFAULT_DAYLIGHT_SENSOR_W = 0.05;
/** Minutes a day the lights are on: a Treadwise assumption for a dwelling's stair, no published source. */
export const DEFAULT_LIT_MINUTES_PER_DAY = 30;

const DAYS_PER_YEAR = 365;

export interface StandbyInputs {
  input: EstimateInput;
  controllers: number;
  driverCount: number;
  sensors: SensorPart;
  rail: RailPart | null;
  treadPixels: TreadPixelPart | null;
  /** Load while lit (brightness cap applied), W. */
  litLoadW: number;
}

export function standbyOf(x: StandbyInputs, trace: TraceEntry[]): EstimateStandby {
  const s = x.input.standby ?? {};
  const controllerW = (s.controllerW ?? DEFAULT_CONTROLLER_STANDBY_W) * x.controllers;
  const motion = x.sensors.motion ?? x.sensors.controllerInput;
  const motionMa = 'currentMa' in motion ? motion.currentMa : motion.maxCurrentMa;
  const sensorsW = (x.sensors.plan.motionSensors * motion.supplyV * motionMa) / 1000 + x.sensors.daylightSensors * (s.daylightSensorW ?? DEFAULT_DAYLIGHT_SENSOR_W);
  const driversW = x.driverCount * (s.driverNoLoadW ?? DEFAULT_DRIVER_NO_LOAD_W);
  const darkMa = s.darkPixelMa ?? DEFAULT_DARK_PIXEL_MA;
  let pixelIcsW = 0;
  let pixels = 0;
  if (x.rail) {
    pixels += x.rail.pixels;
    pixelIcsW += (x.rail.pixels * darkMa * x.rail.rail.voltageV) / 1000;
  }
  if (x.treadPixels) {
    pixels += x.treadPixels.totalPixels;
    pixelIcsW += (x.treadPixels.totalPixels * darkMa * x.treadPixels.block.voltageV) / 1000;
  }
  const totalW = controllerW + sensorsW + driversW + pixelIcsW;
  const litMinutes = s.litMinutesPerDay ?? DEFAULT_LIT_MINUTES_PER_DAY;
  const litHours = litMinutes / 60;
  const standbyKWh = (totalW * (24 - litHours) * DAYS_PER_YEAR) / 1000;
  const litKWh = ((totalW + x.litLoadW) * litHours * DAYS_PER_YEAR) / 1000;
  const defaults = {
    controllerW: s.controllerW === undefined,
    driverNoLoadW: s.driverNoLoadW === undefined,
    darkPixelMa: s.darkPixelMa === undefined,
    daylightSensorW: s.daylightSensorW === undefined,
    litMinutesPerDay: s.litMinutesPerDay === undefined,
  };
  trace.push({
    quantity: 'standby.totalW',
    value: round(totalW, 3),
    unit: 'W',
    formula: 'controllers × controllerW + motion sensors × V × I + daylight sensors × W + drivers × no-load W + pixels × dark mA × V',
    inputs: {
      controllers: x.controllers,
      controllerW: s.controllerW ?? DEFAULT_CONTROLLER_STANDBY_W,
      motionSensors: x.sensors.plan.motionSensors,
      sensorSupplyV: motion.supplyV,
      sensorCurrentMa: motionMa,
      drivers: x.driverCount,
      driverNoLoadW: s.driverNoLoadW ?? DEFAULT_DRIVER_NO_LOAD_W,
      pixels,
      darkPixelMa: darkMa,
      ...Object.fromEntries(Object.entries(defaults).map(([k, v]) => [`${k}Default`, v])),
    },
    reference:
      'defaults from memory, no published source: controller 0.5 W, driver no-load 0.5 W (EU Regulation 2019/2020 standby limit for control gear, from memory), dark pixel IC 1 mA (domain.md: 0.5–1 mA), daylight sensor 0.05 W; sensor draw from its data',
  });
  trace.push({
    quantity: 'standby.yearlyKWh',
    value: round(standbyKWh + litKWh, 3),
    unit: 'kWh',
    formula: '(P_standby × (24 − h_lit) + (P_standby + P_lit) × h_lit) × 365 / 1000',
    inputs: { standbyW: round(totalW, 3), litLoadW: round(x.litLoadW, 3), litMinutesPerDay: litMinutes, litMinutesDefault: defaults.litMinutesPerDay },
    reference: 'arithmetic; lit time per day as stated (default 30 min, a Treadwise assumption, no published source)',
  });
  return {
    controllerW: round(controllerW, 3),
    sensorsW: round(sensorsW, 3),
    driversW: round(driversW, 3),
    pixelIcsW: round(pixelIcsW, 3),
    totalW: round(totalW, 3),
    litMinutesPerDay: litMinutes,
    litLoadW: round(x.litLoadW, 3),
    standbyKWhPerYear: round(standbyKWh, 3),
    litKWhPerYear: round(litKWh, 3),
    totalKWhPerYear: round(standbyKWh + litKWh, 3),
    defaultsUsed: Object.entries(defaults)
      .filter(([, v]) => v)
      .map(([k]) => k),
  };
}
