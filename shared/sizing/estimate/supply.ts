import type { EstimateRailSupply } from '../../schemas/estimate.js';
import { class2MaxVA, CIRCUIT_REFERENCE, DEFAULT_DRIVER_RATINGS_W, DEFAULT_MAINS_VOLTAGE_V, DEFAULT_POWER_FACTOR, requiredRatingW } from '../drivers.js';
import { treadPositionsM, type StairGeometry } from '../geometry.js';
import { blockSizes } from '../outputs.js';
import { describeSize } from '../conductors.js';
import { round, type TraceEntry } from '../trace.js';
import { cheapestDriver, driversAt, type CatalogIndex } from './catalog.js';
import { planCircuits, type Circuit, type Feeder, type FeedTarget, type Load, type RailRatings } from './circuits.js';
import { setSize, type RunCable } from './run-cable.js';
import type { RailPart } from './rail-pixels.js';
import { DEFAULT_RATINGS_ENTRY, type Settings } from './settings.js';
import type { TreadPixelPart } from './tread-pixels.js';
import type { TreadStripPart } from './tread-strips.js';

export type { Feeder, Load, LoadKind } from './circuits.js';

export interface SupplyRail {
  voltageV: number;
  loads: Load[];
  loadW: number;
  currentA: number;
  circuits: Circuit[];
  /** Cap on one supply (Class 2), W; null when uncapped. */
  maxSupplyW: number | null;
  /** Every available rating is above the cap: no driver at all. */
  noUsableRating: boolean;
  ratingsSource: EstimateRailSupply['ratingsSource'];
  /** SKU of the driver chosen for each rating, when a catalog holds it. */
  skuByRating: ReadonlyMap<number, string>;
  response: EstimateRailSupply;
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

interface RailChoice extends RailRatings {
  maxSupplyW: number | null;
  allRatingsW: number[];
  ratingsSource: EstimateRailSupply['ratingsSource'];
}

/** The ratings one rail may use: the catalog's (or the request's, or the default series) within the Class 2 cap. */
function railChoice(voltageV: number, settings: Settings, catalog: CatalogIndex | null): RailChoice {
  const d = settings.drivers;
  const stock = catalog ? railStock(catalog, voltageV, d.availableRatingsW) : null;
  let ratingsW: number[] = d.availableRatingsW ? [...d.availableRatingsW] : [...DEFAULT_DRIVER_RATINGS_W];
  let prices: Map<number, number> | undefined;
  let ratingsSource: EstimateRailSupply['ratingsSource'] = d.availableRatingsW ? 'request' : 'default';
  let skuByRating: ReadonlyMap<number, string> = NO_SKUS;
  if (stock) {
    ratingsW = stock.ratingsW;
    prices = stock.prices;
    skuByRating = stock.skuByRating;
    ratingsSource = 'catalog';
  }
  const maxSupplyW = d.class2 ? class2MaxVA(voltageV) : null;
  const usableW = ratingsW.filter((r) => maxSupplyW === null || r <= maxSupplyW * (1 + 1e-9));
  return {
    usableW,
    prices: prices ? usableW.map((r) => prices.get(r) as number) : undefined,
    skuByRating,
    maxSupplyW,
    allRatingsW: ratingsW,
    ratingsSource,
  };
}

function railResponse(voltageV: number, loads: Load[], circuits: Circuit[], choice: RailChoice, settings: Settings): EstimateRailSupply {
  const d = settings.drivers;
  let loadW = 0;
  let currentA = 0;
  for (const l of loads) {
    loadW += l.loadW;
    currentA += l.currentA;
  }
  const groups = new Map<number, { count: number; loadW: number; loadingPercent: number }>();
  let totalRatingW = 0;
  let worstLoading: number | null = null;
  let totalPrice = 0;
  let priced = choice.prices !== undefined;
  for (const c of circuits) {
    if (c.ratingW === null || c.loadW <= 0) continue;
    const g = groups.get(c.ratingW) ?? { count: 0, loadW: 0, loadingPercent: 0 };
    g.count++;
    g.loadW = Math.max(g.loadW, c.loadW);
    g.loadingPercent = Math.max(g.loadingPercent, c.loadingPercent as number);
    groups.set(c.ratingW, g);
    totalRatingW += c.ratingW;
    worstLoading = Math.max(worstLoading ?? 0, c.loadingPercent as number);
    if (c.price === null) priced = false;
    else totalPrice += c.price;
  }
  const drivers = [...groups.entries()]
    .sort((a, b) => b[0] - a[0])
    .map(([ratingW, g]) => {
      const group: EstimateRailSupply['drivers'][number] = { ratingW, count: g.count, loadW: round(g.loadW, 4), loadingPercent: round(g.loadingPercent, 4) };
      const sku = choice.skuByRating.get(ratingW);
      if (sku !== undefined) group.sku = sku;
      return group;
    });
  let driverCount = 0;
  for (const g of drivers) driverCount += g.count;
  const response: EstimateRailSupply = {
    voltageV,
    loads: loads.map((l) => l.kind),
    loadW: round(loadW),
    currentA: round(currentA),
    requiredRatingW: round(requiredRatingW(loadW, d.maxLoadingPercent)),
    maxLoadingPercent: d.maxLoadingPercent,
    drivers,
    driverCount,
    totalRatingW,
    loadingPercent: worstLoading === null ? null : round(worstLoading, 4),
    maxSupplyW: choice.maxSupplyW,
    circuits: circuits.filter((c) => c.loadW > 0).length,
    ratingsSource: choice.ratingsSource,
  };
  if (priced && driverCount > 0) response.totalPrice = round(totalPrice, 2);
  if (d.efficiencyPercent !== undefined && loadW > 0) {
    const inputPowerW = loadW / (d.efficiencyPercent / 100);
    response.inputPowerW = round(inputPowerW, 4);
    response.mainsCurrentA = round(inputPowerW / ((d.mainsVoltageV ?? DEFAULT_MAINS_VOLTAGE_V) * (d.powerFactor ?? DEFAULT_POWER_FACTOR)), 4);
  }
  return response;
}

export interface Supplies {
  rails: SupplyRail[];
  circuits: Circuit[];
  feeders: Feeder[];
}

/** Circuits for every rail voltage, one driver each, and a feeder from it to every controller and pixel feed point. */
export function sizeSupplies(loads: readonly Load[], settings: Settings, catalog: CatalogIndex | null, trace: TraceEntry[]): Supplies {
  const railGroups = groupRails(loads);
  const choices = railGroups.map((r) => ({ voltageV: r.voltageV, choice: railChoice(r.voltageV, settings, catalog) }));
  const choiceAt = (v: number) => (choices.find((c) => sameVoltage(c.voltageV, v)) as (typeof choices)[number]).choice;
  const circuits = planCircuits(loads, choiceAt, settings);
  const feeders: Feeder[] = [];
  for (const c of circuits) feeders.push(...c.feeders);

  const rails: SupplyRail[] = railGroups.map((r) => {
    const choice = choiceAt(r.voltageV);
    const own = circuits.filter((c) => sameVoltage(c.voltageV, r.voltageV));
    const response = railResponse(r.voltageV, r.loads, own, choice, settings);
    const prefix = `${r.voltageV} V rail: `;
    if (response.loadW > 0) {
      trace.push(
        {
          quantity: `${prefix}requiredRatingW`,
          value: response.requiredRatingW,
          unit: 'W',
          formula: 'P_load / (maxLoadingPercent / 100)',
          inputs: { loadW: response.loadW, maxLoadingPercent: settings.drivers.maxLoadingPercent },
          reference: 'common practice, no published source (80 % loading); closest published rule NEC 210.19(A)(1) / 215.2(A)(1): 125 % of a continuous load',
        },
        {
          quantity: `${prefix}circuits`,
          value: own.map((c) => `${c.response.name}: ${c.ratingW === null ? 'no driver' : `${c.ratingW} W`} for ${round(c.loadW, 1)} W`).join('; '),
          unit: '',
          formula: 'consecutive feeds grouped into the fewest circuits within the largest usable rating × loading; per circuit the ' + (choice.prices ? 'cheapest' : 'smallest') + ' single rating ≥ circuit load / loading',
          inputs: {
            usableRatingsW: choice.usableW.join(', '),
            maxSupplyW: choice.maxSupplyW,
            class2: settings.drivers.class2,
            ratingsSource: choice.ratingsSource,
          },
          reference: CIRCUIT_REFERENCE,
        },
      );
      if (choice.ratingsSource === 'default' && !trace.includes(DEFAULT_RATINGS_ENTRY)) trace.push(DEFAULT_RATINGS_ENTRY);
    }
    trace.push({
      quantity: `${prefix}loadW`,
      value: round(response.loadW),
      unit: 'W',
      formula: 'Σ loads on this voltage',
      inputs: Object.fromEntries(r.loads.map((l) => [l.kind, round(l.loadW)])),
      reference: 'arithmetic; one supply rail per voltage, split into circuits',
    });
    let loadW = 0;
    let currentA = 0;
    for (const l of r.loads) {
      loadW += l.loadW;
      currentA += l.currentA;
    }
    return {
      voltageV: r.voltageV,
      loads: r.loads,
      loadW,
      currentA,
      circuits: own,
      maxSupplyW: choice.maxSupplyW,
      noUsableRating: choice.usableW.length === 0,
      ratingsSource: choice.ratingsSource,
      skuByRating: choice.skuByRating,
      response,
    };
  });

  let worst: Feeder | undefined;
  for (const f of feeders) if (!worst || f.pathDropPercent > worst.pathDropPercent) worst = f;
  if (worst) {
    trace.push({
      quantity: 'feeder.worstPathDropPercent',
      value: round(worst.pathDropPercent, 3),
      unit: '%',
      formula: 'feeder drop + worst drop behind it (lead or chain links); feeder length = feederLengthM + |driver position − feed position|',
      inputs: {
        to: worst.target.to,
        circuit: worst.circuit,
        currentA: round(worst.target.currentA),
        lengthM: round(worst.run.lengthM, 3),
        alongRunM: round(worst.alongM, 3),
        lengthDefaulted: settings.cable.feederLengthDefaulted,
        voltageV: worst.voltageV,
        size: worst.run.size ? describeSize(worst.run.size) : 'none',
        feederDropPercent: round(worst.run.dropPercent, 3),
        resistanceOhmPerKm: round(worst.run.resistanceOhmPerKm, 4),
        currentRatingA: worst.run.currentRatingA,
        fuseA: worst.protection.fuseA,
      },
      reference: 'IEC 60364-5-52 Annex G, two-wire DC loop (cos φ = 1); series drop from the driver to the farthest strip against the ELV lighting limit',
    });
    let busiest: Feeder | undefined;
    for (const f of feeders) if (f.target.to === 'controller' && (!busiest || f.target.currentA > busiest.target.currentA)) busiest = f;
    if (busiest) {
      trace.push({
        quantity: 'controllerInputCurrentA',
        value: round(busiest.target.currentA),
        unit: 'A',
        formula: 'Σ CV currents of the controller’s treads ≤ maxInputCurrentA',
        inputs: { controller: busiest.target.controller, maxInputCurrentA: busiest.target.maxInputCurrentA ?? null },
        reference: 'controller profile data',
      });
    }
  }
  return { rails, circuits, feeders };
}

/** Rail pixel data outputs over the rail's length: which chains the stretch [fromM, toM) touches. */
function chainsAlong(rail: RailPart, fromM: number, toM: number): number[] {
  if (rail.dataOutputs.length === 0 || rail.pixels === 0) return [1];
  const out: number[] = [];
  let startPx = 0;
  rail.dataOutputs.forEach((o, i) => {
    const a = (startPx / rail.pixels) * rail.rail.lengthM;
    const b = ((startPx + o.pixels) / rail.pixels) * rail.rail.lengthM;
    if (a < toM - 1e-9 && b > fromM + 1e-9) out.push(i + 1);
    startPx += o.pixels;
  });
  return out.length > 0 ? out : [1];
}

/** What each part of the layout draws, and where its feeds are along the run. */
export function loadsOf(
  treadStrips: TreadStripPart | null,
  rail: RailPart | null,
  treadPixels: TreadPixelPart | null,
  settings: Settings,
  stair: StairGeometry | null,
): Load[] {
  const loads: Load[] = [];
  const positions = stair && (treadStrips || treadPixels) ? treadPositionsM(stair) : null;
  if (treadStrips) {
    const targets: FeedTarget[] = [];
    const controllers = treadStrips.allocation.controllers;
    const blocks = controllers.length > 0 ? controllers : [{ controller: 1, firstTread: 1, lastTread: treadStrips.leads.length, currentA: treadStrips.totalCurrentA }];
    const inputs = settings.drivers.powerInputsPerController;
    blocks.forEach((b, i) => {
      const atTread = treadStrips.runs.blocks[i]?.atTread ?? b.firstTread;
      const positionM = positions ? (positions[atTread - 1] as number) : 0;
      const outputs = treadStrips.allocation.outputs.filter((o) => o.controller === i + 1);
      // A controller with several power inputs: each feeds its own group of outputs, so each is a feed of its own.
      const groups: { treads: number[]; currentA: number }[] = [];
      if (inputs > 1 && outputs.length > 1) {
        let next = 0;
        for (const size of blockSizes(outputs.length, Math.min(inputs, outputs.length))) {
          const group = outputs.slice(next, next + size);
          // The outputs' own currents: they include a lit landing's, which has no tread lead.
          groups.push({ treads: group.flatMap((o) => o.treads), currentA: group.reduce((sum, o) => sum + o.currentA, 0) });
          next += size;
        }
      } else {
        const all: number[] = [];
        for (let t = b.firstTread; t <= b.lastTread; t++) all.push(t);
        groups.push({ treads: all, currentA: b.currentA });
      }
      groups.forEach(({ treads, currentA }, g) => {
        const leads: FeedTarget['leads'] = treads.map((t) => ({ tread: t, run: treadStrips.leads[t - 1] as RunCable }));
        targets.push({
          kind: 'tread strips',
          to: 'controller',
          controller: i + 1,
          powerInput: groups.length > 1 ? g + 1 : null,
          feedPoint: null,
          firstTread: treads.length > 0 ? Math.min(...treads) : b.firstTread,
          lastTread: treads.length > 0 ? Math.max(...treads) : b.lastTread,
          currentA,
          positionM,
          chain: null,
          fixedDownstreamPercent: 0,
          downstreamRatingA: null,
          leads,
          maxInputCurrentA: settings.profile.maxInputCurrentA,
        });
      });
    });
    loads.push({ kind: 'tread strips', voltageV: treadStrips.strip.voltageV, loadW: treadStrips.totalLoadW, currentA: treadStrips.totalCurrentA, targets });
  }
  if (rail) {
    const seg = rail.injection.segmentLengthM;
    const targets: FeedTarget[] = [];
    for (let i = 0; i < rail.feedPoints; i++) {
      targets.push({
        kind: 'rail pixels',
        to: 'pixel feed point',
        controller: null,
        powerInput: null,
        feedPoint: i + 1,
        firstTread: null,
        lastTread: null,
        currentA: rail.currentA / rail.feedPoints,
        // Each section is fed at its start (the injection plan's one-end feed); the rail starts at the foot.
        positionM: i * seg,
        chain: (chainsAlong(rail, i * seg, (i + 1) * seg)[0] as number),
        fixedDownstreamPercent: rail.injection.dropPercent ?? 0,
        downstreamRatingA: null,
        leads: [],
      });
    }
    loads.push({ kind: 'rail pixels', voltageV: rail.rail.voltageV, loadW: rail.powerW, currentA: rail.currentA, targets });
  }
  if (treadPixels) {
    const targets: FeedTarget[] = [];
    let feedPoint = 0;
    treadPixels.chains.forEach((chain, ci) => {
      for (const g of chain.groups) {
        feedPoint++;
        targets.push({
          kind: 'tread pixels',
          to: 'pixel feed point',
          controller: null,
          powerInput: null,
          feedPoint,
          firstTread: g.firstTread,
          lastTread: g.lastTread,
          currentA: g.currentA,
          positionM: positions ? (positions[g.firstTread - 1] as number) : 0,
          chain: ci + 1,
          fixedDownstreamPercent: g.cable ? g.cable.dropPercent : 0,
          downstreamRatingA: g.cable ? g.cable.currentRatingA : null,
          leads: [],
        });
      }
    });
    loads.push({ kind: 'tread pixels', voltageV: treadPixels.block.voltageV, loadW: treadPixels.totalLoadW, currentA: treadPixels.totalCurrentA, targets });
  }
  return loads;
}

/** The data chains a circuit's pixels are on: Class 2 circuits must not share one (their 0 V would be joined). */
export function chainsOf(c: Circuit, rail: RailPart | null): number[] {
  // Keyed by run: rail chains from 1, tread-pixel chains from 1001.
  const set = new Set<number>();
  for (const t of c.targets) {
    if (t.kind === 'tread strips') continue;
    if (t.kind === 'rail pixels' && rail) {
      const seg = rail.injection.segmentLengthM;
      const i = (t.feedPoint as number) - 1;
      for (const ch of chainsAlong(rail, i * seg, (i + 1) * seg)) set.add(ch);
    } else if (t.chain !== null) set.add(1000 + t.chain);
  }
  return [...set];
}

/** Leads resized with their feeder for the end-to-end budget: written back into the tread rows. */
export function applyResizedLeads(treadStrips: TreadStripPart | null, feeders: readonly Feeder[], settings: Settings): void {
  if (!treadStrips) return;
  for (const f of feeders) {
    for (const l of f.leads) {
      treadStrips.leads[l.tread - 1] = l.run;
      const row = treadStrips.rows[l.tread - 1];
      if (!row) continue;
      row.dropPercent = round(l.run.dropPercent, 3);
      row.cableLengthM = round(l.run.lengthM, 3);
      setSize(row, settings.cable, l.run);
    }
    for (const l of f.target.leads) {
      const row = treadStrips.rows[l.tread - 1];
      if (row) row.pathDropPercent = round(f.run.dropPercent + (treadStrips.leads[l.tread - 1] as RunCable).dropPercent, 3);
    }
  }
}

const NO_SKUS: ReadonlyMap<number, string> = new Map();
// Worked out once per catalog and rail: a batch sends one catalog with many stairs.
const stockCache = new WeakMap<CatalogIndex, Map<string, RailStock | null>>();
