import type { DriverResult } from '../../schemas/driver.js';
import type { EstimateFeederRun, EstimateRailSupply } from '../../schemas/estimate.js';
import { describeSize } from '../conductors.js';
import { chooseDrivers, requiredRatingW } from '../drivers.js';
import { round, type TraceEntry } from '../trace.js';
import { cheapestDriver, driversAt, type CatalogIndex } from './catalog.js';
import { setSize, sizeRun, type RunCable } from './run-cable.js';
import type { RailPart } from './rail-pixels.js';
import { DEFAULT_RATINGS_ENTRY, type Settings } from './settings.js';
import type { TreadPixelPart } from './tread-pixels.js';
import type { TreadStripPart } from './tread-strips.js';

export type LoadKind = 'tread strips' | 'rail pixels' | 'tread pixels';

export interface FeederSpec {
  to: 'controller' | 'pixel feed point';
  controller: number | null;
  count: number;
  currentA: number;
  maxInputCurrentA?: number | undefined;
}

/** A load on a supply rail and the feeders that bring it power. */
export interface Load {
  kind: LoadKind;
  voltageV: number;
  loadW: number;
  currentA: number;
  feeders: FeederSpec[];
}

export interface SupplyRail {
  voltageV: number;
  loads: Load[];
  loadW: number;
  currentA: number;
  /** null when the rail has no load (nothing to size). */
  result: DriverResult | null;
  ratingsSource: EstimateRailSupply['ratingsSource'];
  /** SKU of the driver chosen for each rating, when a catalog holds it. */
  skuByRating: ReadonlyMap<number, string>;
  response: EstimateRailSupply;
}

export interface Feeder {
  spec: FeederSpec;
  voltageV: number;
  load: LoadKind;
  run: RunCable;
  response: EstimateFeederRun;
}

const sameVoltage = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * Math.max(1, a);

/** One rail per voltage: a 5 V pixel run beside a 24 V tread rail gets drivers of its own. */
export function groupRails(loads: readonly Load[]): { voltageV: number; loads: Load[] }[] {
  const rails: { voltageV: number; loads: Load[] }[] = [];
  for (const load of loads) {
    const rail = rails.find((r) => sameVoltage(r.voltageV, load.voltageV));
    if (rail) rail.loads.push(load);
    else rails.push({ voltageV: load.voltageV, loads: [load] });
  }
  return rails;
}

/** The catalog's drivers at one voltage: ratings, the cheapest SKU per rating, prices when every one has a price. */
interface RailStock {
  ratingsW: number[];
  prices: Map<number, number> | undefined;
  skuByRating: Map<number, string>;
}

const NO_SKUS: ReadonlyMap<number, string> = new Map();
// Worked out once per catalog and rail: a batch sends one catalog with many stairs.
const stockCache = new WeakMap<CatalogIndex, Map<string, RailStock | null>>();

function railStock(catalog: CatalogIndex, voltageV: number, ratingsFilterW: readonly number[] | undefined): RailStock | null {
  let byRail = stockCache.get(catalog);
  if (!byRail) stockCache.set(catalog, (byRail = new Map()));
  const key = ratingsFilterW ? `${voltageV}|${ratingsFilterW.join(',')}` : `${voltageV}`;
  const known = byRail.get(key);
  if (known !== undefined) return known;
  const stocked = driversAt(catalog, voltageV, ratingsFilterW);
  let stock: RailStock | null = null;
  if (stocked.length > 0) {
    const ratingsW = [...new Set(stocked.map((s) => s.ratingW))];
    const prices = stocked.every((s) => s.unitPrice !== undefined) ? new Map<number, number>() : undefined;
    const skuByRating = new Map<number, string>();
    for (const rating of ratingsW) {
      const item = cheapestDriver(stocked, rating) as NonNullable<ReturnType<typeof cheapestDriver>>;
      skuByRating.set(rating, item.sku);
      prices?.set(rating, item.unitPrice as number);
    }
    stock = { ratingsW, prices, skuByRating };
  }
  byRail.set(key, stock);
  return stock;
}

function sizeRail(voltageV: number, loads: Load[], settings: Settings, catalog: CatalogIndex | null, trace: TraceEntry[]): SupplyRail {
  let loadW = 0;
  let currentA = 0;
  for (const l of loads) {
    loadW += l.loadW;
    currentA += l.currentA;
  }
  const d = settings.drivers;
  const stock = catalog ? railStock(catalog, voltageV, d.availableRatingsW) : null;
  let availableRatingsW: number[] | undefined = d.availableRatingsW ? [...d.availableRatingsW] : undefined;
  let prices: Map<number, number> | undefined;
  let ratingsSource: SupplyRail['ratingsSource'] = availableRatingsW ? 'request' : 'default';
  let skuByRating = NO_SKUS;
  if (stock) {
    availableRatingsW = stock.ratingsW;
    prices = stock.prices;
    skuByRating = stock.skuByRating;
    ratingsSource = 'catalog';
  }

  const prefix = `${voltageV} V rail: `;
  let result: DriverResult | null = null;
  if (loadW > 0) {
    result = chooseDrivers({
      loadW,
      outputVoltageV: voltageV,
      maxLoadingPercent: d.maxLoadingPercent,
      availableRatingsW,
      class2: d.class2,
      efficiencyPercent: d.efficiencyPercent,
      mainsVoltageV: d.mainsVoltageV,
      powerFactor: d.powerFactor,
      prices,
    });
    for (const entry of result.trace) {
      if (entry.quantity !== 'maxLoadingPercent') trace.push({ ...entry, quantity: prefix + entry.quantity });
    }
    if (ratingsSource === 'default' && !trace.includes(DEFAULT_RATINGS_ENTRY)) trace.push(DEFAULT_RATINGS_ENTRY);
  }
  trace.push({
    quantity: `${prefix}loadW`,
    value: round(loadW),
    unit: 'W',
    formula: 'Σ loads on this voltage',
    inputs: Object.fromEntries(loads.map((l) => [l.kind, round(l.loadW)])),
    reference: 'arithmetic; one supply rail per voltage',
  });

  const response: EstimateRailSupply = {
    voltageV,
    loads: loads.map((l) => l.kind),
    loadW: round(loadW),
    currentA: round(currentA),
    requiredRatingW: round(requiredRatingW(loadW, d.maxLoadingPercent)),
    maxLoadingPercent: d.maxLoadingPercent,
    drivers: result ? result.drivers.map((g) => withSku(g, skuByRating.get(g.ratingW))) : [],
    driverCount: result ? result.driverCount : 0,
    totalRatingW: result ? result.totalRatingW : 0,
    loadingPercent: result ? result.loadingPercent : null,
    maxSupplyW: result ? result.maxSupplyW : null,
    ratingsSource,
  };
  if (result?.totalPrice !== undefined) response.totalPrice = result.totalPrice;
  if (result?.inputPowerW !== undefined) response.inputPowerW = result.inputPowerW;
  if (result?.mainsCurrentA !== undefined) response.mainsCurrentA = result.mainsCurrentA;
  return { voltageV, loads, loadW, currentA, result, ratingsSource, skuByRating, response };
}

function withSku<T extends object>(group: T, sku: string | undefined): T & { sku?: string } {
  return sku === undefined ? group : { ...group, sku };
}

/**
 * The feeder carries the whole current of what it feeds (a controller's treads, or one pixel feed
 * point), so it is sized like any run, with the cable module's smallest suitable conductor.
 */
function sizeOneFeeder(spec: FeederSpec, voltageV: number, load: LoadKind, settings: Settings): Feeder {
  const c = settings.cable;
  const run = sizeRun(voltageV, spec.currentA, c.feederLengthM, c);
  const response: EstimateFeederRun = {
    voltageV,
    to: spec.to,
    controller: spec.controller,
    count: spec.count,
    currentA: round(spec.currentA),
    lengthM: c.feederLengthM,
    dropV: round(run.dropV),
    dropPercent: round(run.dropPercent, 3),
    currentRatingA: run.size ? run.currentRatingA : null,
    maxInputCurrentA: spec.maxInputCurrentA ?? null,
  };
  setSize(response, c, run);
  return { spec, voltageV, load, run, response };
}

export interface Supplies {
  rails: SupplyRail[];
  feeders: Feeder[];
}

/** Drivers for every rail voltage and a feeder for every controller and pixel feed point. */
export function sizeSupplies(loads: readonly Load[], settings: Settings, catalog: CatalogIndex | null, trace: TraceEntry[]): Supplies {
  const rails = groupRails(loads).map((r) => sizeRail(r.voltageV, r.loads, settings, catalog, trace));
  const feeders: Feeder[] = [];
  for (const load of loads) {
    for (const spec of load.feeders) {
      const feeder = sizeOneFeeder(spec, load.voltageV, load.kind, settings);
      feeders.push(feeder);
    }
  }
  let worst: Feeder | undefined;
  for (const f of feeders) if (!worst || f.run.dropPercent > worst.run.dropPercent) worst = f;
  if (worst) {
    trace.push({
      quantity: 'feeder.worstDropPercent',
      value: round(worst.run.dropPercent, 3),
      unit: '%',
      formula: 'smallest size with Vd = 2 · L · I · R′ within the limit that carries the current; the worst feeder shown',
      inputs: {
        to: worst.spec.to,
        currentA: round(worst.spec.currentA),
        lengthM: settings.cable.feederLengthM,
        lengthDefaulted: settings.cable.feederLengthDefaulted,
        voltageV: worst.voltageV,
        size: worst.run.size ? describeSize(worst.run.size) : 'none',
        resistanceOhmPerKm: round(worst.run.resistanceOhmPerKm, 4),
        currentRatingA: worst.run.currentRatingA,
      },
      reference: 'IEC 60364-5-52 Annex G, two-wire DC loop (cos φ = 1); R′ and current rating from the conductor table',
    });
    let busiest: Feeder | undefined;
    for (const f of feeders) if (f.spec.to === 'controller' && (!busiest || f.spec.currentA > busiest.spec.currentA)) busiest = f;
    if (busiest) {
      trace.push({
        quantity: 'controllerInputCurrentA',
        value: round(busiest.spec.currentA),
        unit: 'A',
        formula: 'Σ CV currents of the controller’s treads ≤ maxInputCurrentA',
        inputs: { controller: busiest.spec.controller, maxInputCurrentA: busiest.spec.maxInputCurrentA ?? null },
        reference: 'controller profile data',
      });
    }
  }
  return { rails, feeders };
}

/** One feeder per controller: it carries that controller's whole CV current. */
export function controllerFeeders(currentsA: readonly number[], maxInputCurrentA: number | undefined): FeederSpec[] {
  return currentsA.map((currentA, i) => ({ to: 'controller', controller: i + 1, count: 1, currentA, maxInputCurrentA }));
}

/** What each part of the layout draws, and the feeders that bring it. */
export function loadsOf(treadStrips: TreadStripPart | null, rail: RailPart | null, treadPixels: TreadPixelPart | null, settings: Settings): Load[] {
  const loads: Load[] = [];
  if (treadStrips) {
    const currents = treadStrips.controllerCurrentsA.length > 0 ? treadStrips.controllerCurrentsA : [treadStrips.totalCurrentA];
    loads.push({
      kind: 'tread strips',
      voltageV: treadStrips.strip.voltageV,
      loadW: treadStrips.totalLoadW,
      currentA: treadStrips.totalCurrentA,
      feeders: controllerFeeders(currents, settings.profile.maxInputCurrentA),
    });
  }
  if (rail) {
    loads.push({
      kind: 'rail pixels',
      voltageV: rail.rail.voltageV,
      loadW: rail.powerW,
      currentA: rail.currentA,
      feeders: [{ to: 'pixel feed point', controller: null, count: rail.feedPoints, currentA: rail.currentA / rail.feedPoints }],
    });
  }
  if (treadPixels) {
    let largest = 0;
    for (const g of treadPixels.feedGroups) largest = Math.max(largest, g.currentA);
    loads.push({
      kind: 'tread pixels',
      voltageV: treadPixels.block.voltageV,
      loadW: treadPixels.totalLoadW,
      currentA: treadPixels.totalCurrentA,
      feeders: [{ to: 'pixel feed point', controller: null, count: treadPixels.feedGroups.length, currentA: largest }],
    });
  }
  return loads;
}
