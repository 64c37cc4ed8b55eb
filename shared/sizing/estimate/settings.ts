import { DEFAULT_FEEDER_LENGTH_M, type EstimateInput } from '../../schemas/estimate.js';
import type { ControllerProfile } from '../../schemas/controller.js';
import { DEFAULT_MIN_CROSS_SECTION_MM2, type CableOptions } from '../cable.js';
import { DEFAULT_METRIC_TABLE } from '../conductors.js';
import { DEFAULT_CURRENT_LIMIT_PERCENT, DEFAULT_DRIVER_RATINGS_W, DEFAULT_MAINS_VOLTAGE_V, DEFAULT_MAX_LOADING_PERCENT, DEFAULT_POWER_FACTOR } from '../drivers.js';
import { SizingInputError } from '../../tables/errors.js';
import { DEFAULT_SERVICE_ALLOWANCE_M, type ControllerPosition } from '../geometry.js';
import { DEFAULT_DAYLIGHT_CUTOFF_LUX } from '../sensors.js';
import { pixelCurrentBasis, pixelCurrentDefaultEntry, type PixelCurrentInput } from '../strip.js';
import { pixelBlockDefaults } from './data-lines.js';
import { CONDUCTOR_TABLES, type ConductorTableId, type SizeSystem } from '../../tables/conductors.js';
import type { TraceEntry } from '../trace.js';
import { DEFAULT_MAX_DROP_PERCENT, DROP_LIMIT_REFERENCE } from '../voltage-drop.js';
import { findController, type CatalogIndex } from './catalog.js';

/** Cable options in the shape the cable module takes, filled once per estimate. */
export interface CableSettings extends CableOptions {
  conductorTable: ConductorTableId;
  system: SizeSystem;
  maxDropPercent: number;
  minCrossSectionMm2: number;
  temperatureC: number;
  serviceAllowanceM: number;
  /** What the geometry module receives: undefined keeps its own default (and its trace says so). */
  serviceAllowanceGiven: number | undefined;
  feederLengthM: number;
  feederLengthDefaulted: boolean;
  /** Share of the drop limit given to feeders; undefined: feeder and leads sized together. */
  feederDropPercent: number | undefined;
  /** 'annex-g-service': R′ = 1.25 × R′20 (the default); 'temperature': R′ at temperatureC. */
  resistanceBasis: 'annex-g-service' | 'temperature';
  resistanceFactor: number;
  jurisdiction: 'iec' | 'uk' | 'us' | undefined;
  /** A smaller minimum for short flexible runs (IEC/UK: 1 mm² up to 3 m); undefined when none applies. */
  shortRunMinMm2: number | undefined;
  shortRunMaxM: number;
}

export interface DriverSettings {
  maxLoadingPercent: number;
  availableRatingsW: readonly number[] | undefined;
  class2: boolean;
  efficiencyPercent: number | undefined;
  mainsVoltageV: number | undefined;
  powerFactor: number | undefined;
  /** Where drivers may sit, m along the run; undefined: the best single place. */
  positionsM: readonly number[] | undefined;
  currentLimitPercent: number;
  powerInputsPerController: number;
}

export interface Settings {
  profile: ControllerProfile;
  profileSource: 'inline' | 'catalog';
  controllerSku: string | undefined;
  position: ControllerPosition | undefined;
  cable: CableSettings;
  drivers: DriverSettings;
  /** As requested; the catalog item's reel, then 5 m, fill in later per strip. */
  reelLengthMm: number | undefined;
  daylightCutoff: boolean;
  defaultsUsed: TraceEntry[];
}

// Trace entries for defaults are the same every time: build them once, share them frozen.
function defaultEntry(field: string, value: number | string | boolean, unit: string, reference: string): TraceEntry {
  return Object.freeze({ quantity: `default ${field}`, value, unit, formula: 'not given; default used', inputs: Object.freeze({}), reference }) as TraceEntry;
}

const DEFAULTS = {
  endClearanceMm: defaultEntry('endClearanceMm', 20, 'mm', 'strip clears the stringer by 20 mm each end (common practice, no published source)'),
  position: defaultEntry('controller.position', 'best (longest run shortest)', '', 'controller where the longest run is shortest (common practice, no published source)'),
  conductorTable: defaultEntry('cable.conductorTable', DEFAULT_METRIC_TABLE, '', CONDUCTOR_TABLES[DEFAULT_METRIC_TABLE].reference),
  maxDropPercent: defaultEntry('cable.maxDropPercent', DEFAULT_MAX_DROP_PERCENT, '%', DROP_LIMIT_REFERENCE),
  minCrossSectionMm2: defaultEntry('cable.minCrossSectionMm2', DEFAULT_MIN_CROSS_SECTION_MM2, 'mm²', 'copper no thinner than 0.5 mm² (common practice, no published source)'),
  serviceAllowanceM: defaultEntry('cable.serviceAllowanceM', DEFAULT_SERVICE_ALLOWANCE_M, 'm', 'drop from the stringer to the strip’s feed end (common practice, no published source)'),
  feederLengthM: defaultEntry('cable.feederLengthM', DEFAULT_FEEDER_LENGTH_M, 'm', 'driver mounted beside the controller (Treadwise assumption, no published source)'),
  maxLoadingPercent: defaultEntry(
    'drivers.maxLoadingPercent',
    DEFAULT_MAX_LOADING_PERCENT,
    '%',
    'common practice, no published source (80 % loading); closest published rule NEC 210.19(A)(1) / 215.2(A)(1): 125 % of a continuous load',
  ),
  availableRatingsW: defaultEntry('drivers.availableRatingsW', DEFAULT_DRIVER_RATINGS_W.join(', '), 'W', 'a common driver series (common practice, no published source)'),
  mainsVoltageV: defaultEntry('drivers.mainsVoltageV', DEFAULT_MAINS_VOLTAGE_V, 'V', 'IEC 60038 nominal 230 V'),
  powerFactor: defaultEntry('drivers.powerFactor', DEFAULT_POWER_FACTOR, '', 'assumed, no published source — use the driver datasheet'),
  currentLimitPercent: defaultEntry(
    'drivers.currentLimitPercent',
    DEFAULT_CURRENT_LIMIT_PERCENT,
    '%',
    'constant-voltage LED driver overload protection commonly 105–150 % of rated output; the upper figure taken (from memory)',
  ),
  driverPositions: defaultEntry('drivers.positionsM', 'one place, midway between the farthest feeds', '', 'where the longest feeder is shortest (common practice, no published source)'),
  reelLengthMm: defaultEntry('reels.reelLengthMm', 5000, 'mm', 'a common reel length (common practice, no published source)'),
  daylightCutoffLux: defaultEntry(
    'sensors.daylightCutoffLux',
    DEFAULT_DAYLIGHT_CUTOFF_LUX,
    'lx',
    'below a lit hallway (~80 lx) and EN 12464-1:2021 corridors 100 lx / stairs 150 lx, so the lights help only when general light is off (common practice, no published source)',
  ),
  useDaylightCutoff: defaultEntry('sensors.useDaylightCutoff', true, '', 'Treadwise default: orientation lights are wanted only after dark'),
  bitsPerPixel: defaultEntry('bitsPerPixel', 24, 'bits', '24 bits per RGB pixel — WS2812B datasheet'),
  brightnessPercent: defaultEntry('brightnessPercent', 100, '%', 'no brightness cap'),
} as const;

/** IEC/UK ELV lighting: 1.5 mm² copper at least, 1 mm² for flexible cable up to 3 m (IEC 60364-7-715 / BS 7671 715.524, from memory). */
export const ELV_MIN_CROSS_SECTION_MM2 = 1.5;
export const ELV_FLEXIBLE_SHORT_MIN_MM2 = 1;
export const ELV_FLEXIBLE_SHORT_MAX_M = 3;
export const ELV_MINIMUM_REFERENCE =
  'IEC 60364-7-715 / BS 7671 715.524: ELV lighting conductors at least 1.5 mm² copper, 1 mm² for flexible cables up to 3 m (from memory)';
const ELV_MINIMUM = defaultEntry('cable.minCrossSectionMm2', ELV_MIN_CROSS_SECTION_MM2, 'mm²', ELV_MINIMUM_REFERENCE);

/** IEC 60364-5-52 Annex G takes the resistivity in service as 1.25 × ρ20 (from memory). */
export const ANNEX_G_SERVICE_FACTOR = 1.25;
const ANNEX_G_SERVICE = defaultEntry(
  'cable.temperatureC',
  'none: Annex G resistivity in service, R′ = 1.25 × R′ at 20 °C',
  '',
  'IEC 60364-5-52 Annex G: ρ in service = 1.25 × ρ20 (from memory), applied to the conductor table’s 20 °C resistance (Annex G prints ρ1 = 0.0225 Ω·mm²/m, 1.25 × 0.018); give temperatureC to use R′ at that temperature instead',
);

const FEED_LENGTH_DEFAULTS = {
  low: defaultEntry('maxFeedLengthM', 2.5, 'm', 'about 2.5 m for 5 V pixel strip (common practice, from memory)'),
  high: defaultEntry('maxFeedLengthM', 5, 'm', 'about 5 m for 12 V / 24 V strip (common practice, from memory)'),
};

/** Defaults of the pixel block a layout uses; lists what the request left out. */
export function pixelDefaults(
  block: PixelCurrentInput & { bitsPerPixel?: number | undefined; brightnessPercent?: number | undefined; maxFeedLengthM?: number | undefined; voltageV: number; protocol: string },
  into: TraceEntry[],
): void {
  // The default current depends on channels and voltage (issue 8): the entry says which one.
  const current = pixelCurrentBasis(block);
  if (current.defaulted) into.push(pixelCurrentDefaultEntry(current));
  if (block.bitsPerPixel === undefined && block.protocol !== 'clocked') into.push(DEFAULTS.bitsPerPixel);
  if (block.brightnessPercent === undefined) into.push(DEFAULTS.brightnessPercent);
  if (block.maxFeedLengthM === undefined) into.push(block.voltageV <= 5 ? FEED_LENGTH_DEFAULTS.low : FEED_LENGTH_DEFAULTS.high);
  into.push(...pixelBlockDefaults(block));
}

export function endClearanceDefault(into: TraceEntry[]): void {
  into.push(DEFAULTS.endClearanceMm);
}

export function reelLengthDefault(into: TraceEntry[]): void {
  if (!into.includes(DEFAULTS.reelLengthMm)) into.push(DEFAULTS.reelLengthMm);
}

function resolveProfile(input: EstimateInput, catalog: CatalogIndex | null): Pick<Settings, 'profile' | 'profileSource' | 'controllerSku'> {
  const { controller } = input;
  if (controller.profile) return { profile: controller.profile, profileSource: 'inline', controllerSku: undefined };
  const id = controller.profileId as string;
  const item = catalog ? findController(catalog, id) : undefined;
  if (!item) {
    throw new SizingInputError(
      ['controller', 'profileId'],
      catalog
        ? `No controller with profileId "${id}" in the catalog; send the profile inline or add a catalog item of kind "controller" with that profileId (or SKU).`
        : `profileId "${id}" needs a catalog holding that controller; send a catalog with the request or give the profile inline.`,
      'controller_profile_not_found',
    );
  }
  return { profile: item.profile, profileSource: 'catalog', controllerSku: item.sku };
}

/** Applies the domain defaults once and notes each one used, for the trace. */
export function resolveSettings(input: EstimateInput, catalog: CatalogIndex | null): Settings {
  const used: TraceEntry[] = [];
  const c = input.cable ?? {};
  const conductorTable = c.conductorTable ?? DEFAULT_METRIC_TABLE;
  const table = CONDUCTOR_TABLES[conductorTable];
  if (c.conductorTable === undefined) used.push(DEFAULTS.conductorTable);
  if (c.maxDropPercent === undefined) used.push(DEFAULTS.maxDropPercent);
  const elvMinimum = (c.jurisdiction === 'iec' || c.jurisdiction === 'uk') && c.minCrossSectionMm2 === undefined;
  if (c.minCrossSectionMm2 === undefined) used.push(elvMinimum ? ELV_MINIMUM : DEFAULTS.minCrossSectionMm2);
  // Without a conductor temperature the estimate takes Annex G's resistivity in service, 1.25 × ρ20.
  if (c.temperatureC === undefined) used.push(ANNEX_G_SERVICE);
  if (c.serviceAllowanceM === undefined && input.layout !== 'rail-pixels') used.push(DEFAULTS.serviceAllowanceM);
  if (c.feederLengthM === undefined) used.push(DEFAULTS.feederLengthM);
  if (input.controller.position === undefined && input.layout !== 'rail-pixels') used.push(DEFAULTS.position);

  const d = input.drivers ?? {};
  if (d.maxLoadingPercent === undefined) used.push(DEFAULTS.maxLoadingPercent);
  if (d.efficiencyPercent !== undefined && d.mainsVoltageV === undefined) used.push(DEFAULTS.mainsVoltageV);
  if (d.efficiencyPercent !== undefined && d.powerFactor === undefined) used.push(DEFAULTS.powerFactor);
  if (d.currentLimitPercent === undefined) used.push(DEFAULTS.currentLimitPercent);
  if (d.positionsM === undefined) used.push(DEFAULTS.driverPositions);

  const s = input.sensors ?? {};
  const daylightCutoff = s.useDaylightCutoff ?? true;
  if (s.useDaylightCutoff === undefined) used.push(DEFAULTS.useDaylightCutoff);
  if (daylightCutoff && s.daylightCutoffLux === undefined) used.push(DEFAULTS.daylightCutoffLux);

  const controller = resolveProfile(input, catalog);
  return {
    profile: controller.profile,
    profileSource: controller.profileSource,
    controllerSku: controller.controllerSku,
    position: input.controller.position,
    cable: {
      conductorTable,
      system: table.system,
      maxDropPercent: c.maxDropPercent ?? DEFAULT_MAX_DROP_PERCENT,
      minCrossSectionMm2: c.minCrossSectionMm2 ?? (elvMinimum ? ELV_MIN_CROSS_SECTION_MM2 : DEFAULT_MIN_CROSS_SECTION_MM2),
      temperatureC: c.temperatureC ?? 20,
      serviceAllowanceM: c.serviceAllowanceM ?? DEFAULT_SERVICE_ALLOWANCE_M,
      serviceAllowanceGiven: c.serviceAllowanceM,
      feederLengthM: c.feederLengthM ?? DEFAULT_FEEDER_LENGTH_M,
      feederLengthDefaulted: c.feederLengthM === undefined,
      feederDropPercent: c.feederDropPercent,
      jurisdiction: c.jurisdiction,
      shortRunMinMm2: elvMinimum && (conductorTable === 'iec60228-class5' || conductorTable === 'iec60228-class5-tinned') ? ELV_FLEXIBLE_SHORT_MIN_MM2 : undefined,
      shortRunMaxM: ELV_FLEXIBLE_SHORT_MAX_M,
      resistanceBasis: c.temperatureC === undefined ? 'annex-g-service' : 'temperature',
      resistanceFactor: c.temperatureC === undefined ? ANNEX_G_SERVICE_FACTOR : 1,
    },
    drivers: {
      maxLoadingPercent: d.maxLoadingPercent ?? DEFAULT_MAX_LOADING_PERCENT,
      availableRatingsW: d.availableRatingsW,
      class2: d.class2 ?? false,
      efficiencyPercent: d.efficiencyPercent,
      mainsVoltageV: d.mainsVoltageV,
      powerFactor: d.powerFactor,
      positionsM: d.positionsM,
      currentLimitPercent: d.currentLimitPercent ?? DEFAULT_CURRENT_LIMIT_PERCENT,
      powerInputsPerController: d.powerInputsPerController ?? 1,
    },
    reelLengthMm: input.reels?.reelLengthMm,
    daylightCutoff,
    defaultsUsed: used,
  };
}

/** The default driver list entry is only true when no catalog supplied ratings. */
export const DEFAULT_RATINGS_ENTRY = DEFAULTS.availableRatingsW;
