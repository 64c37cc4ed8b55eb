import type { EstimateCircuit, EstimateFeederRun } from '../../schemas/estimate.js';
import { conductorTable } from '../conductors.js';
import { singleDriverFor } from '../driver-mix.js';
import { requiredRatingW } from '../drivers.js';
import { protectionFor, type ProtectionPlan } from '../protection.js';
import { round } from '../trace.js';
import { runOnRow, setSize, sizeRun, type RunCable } from './run-cable.js';
import type { CableSettings, Settings } from './settings.js';

export type LoadKind = 'tread strips' | 'rail pixels' | 'tread pixels';

/** One place a feeder brings power to: a controller's power input, or a pixel feed point. */
export interface FeedTarget {
  kind: LoadKind;
  to: 'controller' | 'pixel feed point';
  controller: number | null;
  /** Power input of the controller (1-based) when it has several; null with one. */
  powerInput: number | null;
  /** 1-based feed point along its run (pixel feeds); null for a controller. */
  feedPoint: number | null;
  firstTread: number | null;
  lastTread: number | null;
  currentA: number;
  /** m along the run (stair: along the stringer from tread 1; rail: from its start). */
  positionM: number;
  /** Data chain the fed pixels are on: two Class 2 circuits on one chain share its 0 V. */
  chain: number | null;
  /** Drop behind the feeder that feeder sizing cannot change (pixel links, strip copper), %. */
  fixedDownstreamPercent: number;
  /** Rating of the thinnest cable behind the feeder that only the feeder's fuse protects, A. */
  downstreamRatingA: number | null;
  /** Tread leads behind this feeder (tread strips): sized with the feeder against the end-to-end limit. */
  leads: { tread: number; run: RunCable }[];
  maxInputCurrentA?: number | undefined;
}

export interface Load {
  kind: LoadKind;
  voltageV: number;
  loadW: number;
  currentA: number;
  targets: FeedTarget[];
}

/** The drivers a rail may use: ratings within the cap, prices aligned when all are priced. */
export interface RailRatings {
  usableW: number[];
  prices: number[] | undefined;
  skuByRating: ReadonlyMap<number, string>;
}

export interface Feeder {
  target: FeedTarget;
  circuit: number;
  voltageV: number;
  load: LoadKind;
  run: RunCable;
  alongM: number;
  /** Leads resized for the end-to-end budget (tread strips); empty otherwise. */
  leads: { tread: number; run: RunCable }[];
  /** Feeder drop plus the worst drop behind it, %. */
  pathDropPercent: number;
  /** Which run behind the feeder is the worst, for messages. */
  worstBehind: string | null;
  protection: ProtectionPlan;
  thinnestRatingA: number;
  response: EstimateFeederRun;
}

export interface Circuit {
  index: number;
  /** The load of its first feed (a circuit may feed tread strips and a rail on one voltage). */
  kind: LoadKind;
  kinds: LoadKind[];
  voltageV: number;
  loadW: number;
  currentA: number;
  targets: FeedTarget[];
  /** A single target larger than the largest usable driver: no driver can feed it. */
  oversize: boolean;
  ratingW: number | null;
  sku: string | undefined;
  price: number | null;
  loadingPercent: number | null;
  driverPositionM: number;
  feeders: Feeder[];
  response: EstimateCircuit;
}

const targetLoadW = (t: FeedTarget, voltageV: number) => t.currentA * voltageV;

/**
 * Consecutive feeds grouped into the fewest circuits whose load fits the largest usable driver
 * (greedy packing is optimal for contiguous groups). A feed too large for any driver is a
 * circuit of its own, flagged `oversize`.
 */
export function groupIntoCircuits(targets: readonly FeedTarget[], voltageV: number, capacityW: number): FeedTarget[][] {
  const groups: FeedTarget[][] = [];
  let current: FeedTarget[] = [];
  let sumW = 0;
  for (const t of targets) {
    const w = targetLoadW(t, voltageV);
    if (current.length > 0 && sumW + w > capacityW * (1 + 1e-9)) {
      groups.push(current);
      current = [];
      sumW = 0;
    }
    current.push(t);
    sumW += w;
  }
  if (current.length > 0) groups.push(current);
  return groups;
}

/** Where a circuit's driver sits: the given place nearest its feeds (by the longest feeder), else the common default. */
function driverPosition(targets: readonly FeedTarget[], positionsM: readonly number[] | undefined, defaultM: number): number {
  if (!positionsM) return defaultM;
  let best = positionsM[0] as number;
  let bestWorst = Infinity;
  for (const p of positionsM) {
    let worst = 0;
    for (const t of targets) worst = Math.max(worst, Math.abs(p - t.positionM));
    if (worst < bestWorst - 1e-12) {
      best = p;
      bestWorst = worst;
    }
  }
  return best;
}

/** Midway between the farthest feeds: the single place where the longest feeder is shortest. */
export function bestDriverPositionM(loads: readonly Load[]): number {
  let lo = Infinity;
  let hi = -Infinity;
  for (const l of loads) {
    for (const t of l.targets) {
      lo = Math.min(lo, t.positionM);
      hi = Math.max(hi, t.positionM);
    }
  }
  return Number.isFinite(lo) ? (lo + hi) / 2 : 0;
}

function worstLead(leads: readonly { tread: number; run: RunCable }[]): { tread: number; run: RunCable } | null {
  let worst: { tread: number; run: RunCable } | null = null;
  for (const l of leads) if (!worst || l.run.dropPercent > worst.run.dropPercent) worst = l;
  return worst;
}

const copperOf = (run: RunCable) => run.areaMm2 * run.lengthM;

/**
 * Feeder and leads of one controller sized together: every feeder size that carries the current
 * is tried, the leads get what its drop leaves of the limit, and the pair with the least copper
 * wins. With a fixed split the feeder gets its share and the leads the rest.
 */
function sizeFeederWithLeads(
  voltageV: number,
  target: FeedTarget,
  lengthM: number,
  mustCarryA: number,
  cable: CableSettings,
): { run: RunCable; leads: { tread: number; run: RunCable }[] } | null {
  const limit = cable.maxDropPercent;
  const live = target.leads.filter((l) => l.run.currentA > 0);
  const resize = (budget: number) => live.map((l) => ({ tread: l.tread, run: sizeRun(voltageV, l.run.currentA, l.run.lengthM, { ...cable, maxDropPercent: budget }) }));
  if (cable.feederDropPercent !== undefined) {
    const run = sizeRun(voltageV, target.currentA, lengthM, { ...cable, maxDropPercent: cable.feederDropPercent }, mustCarryA);
    return { run, leads: resize(Math.max(1e-9, limit - cable.feederDropPercent)) };
  }
  const table = conductorTable(cable.conductorTable);
  let best: { run: RunCable; leads: { tread: number; run: RunCable }[]; copper: number } | null = null;
  for (const row of table.rows) {
    if (row.currentRatingA < mustCarryA * (1 - 1e-9)) continue;
    const run = runOnRow(voltageV, target.currentA, lengthM, cable, row, limit);
    if (run.failure) continue;
    const remaining = limit - run.dropPercent;
    if (remaining <= 0) continue;
    const leads = resize(remaining);
    if (leads.some((l) => l.run.failure !== null)) continue;
    let copper = copperOf(run);
    for (const l of leads) copper += copperOf(l.run);
    if (!best || copper < best.copper - 1e-12) best = { run, leads, copper };
  }
  return best;
}

function sizeFeeder(voltageV: number, target: FeedTarget, lengthM: number, mustCarryA: number, cable: CableSettings): { run: RunCable; leads: { tread: number; run: RunCable }[] } {
  if (target.leads.length > 0) {
    const joint = sizeFeederWithLeads(voltageV, target, lengthM, mustCarryA, cable);
    if (joint) return joint;
    // Nothing meets the end-to-end limit: the feeder's own best, the leads as sized alone; the drop check fails.
    return { run: sizeRun(voltageV, target.currentA, lengthM, cable, mustCarryA), leads: target.leads };
  }
  const budget = cable.feederDropPercent ?? Math.max(1e-9, cable.maxDropPercent - target.fixedDownstreamPercent);
  return { run: sizeRun(voltageV, target.currentA, lengthM, { ...cable, maxDropPercent: budget }, mustCarryA), leads: [] };
}

function oneFeeder(circuit: number, target: FeedTarget, voltageV: number, kind: LoadKind, driverAtM: number, driverLimitA: number | null, settings: Settings): Feeder {
  const c = settings.cable;
  const alongM = Math.abs(driverAtM - target.positionM);
  const lengthM = c.feederLengthM + alongM;
  let sized = sizeFeeder(voltageV, target, lengthM, 0, c);
  let thinnest = Math.min(sized.run.currentRatingA, target.downstreamRatingA ?? Infinity);
  let protection = protectionFor(target.currentA, thinnest, driverLimitA);
  if (protection.protectedBy === 'none' && driverLimitA !== null) {
    // No fuse the limited driver can open fits: the feeder must carry the driver's limit itself.
    sized = sizeFeeder(voltageV, target, lengthM, driverLimitA, c);
    thinnest = Math.min(sized.run.currentRatingA, target.downstreamRatingA ?? Infinity);
    protection = protectionFor(target.currentA, thinnest, driverLimitA);
  }
  const run = sized.run;
  const behind = worstLead(sized.leads);
  const behindPercent = behind ? behind.run.dropPercent : target.fixedDownstreamPercent;
  const pathDropPercent = run.dropPercent + behindPercent;
  const response: EstimateFeederRun = {
    voltageV,
    to: target.to,
    controller: target.controller,
    count: 1,
    currentA: round(target.currentA),
    lengthM: round(lengthM, 3),
    dropV: round(run.dropV),
    dropPercent: round(run.dropPercent, 3),
    currentRatingA: run.size ? run.currentRatingA : null,
    maxInputCurrentA: target.maxInputCurrentA ?? null,
    circuit,
    powerInput: target.powerInput,
    feedPoint: target.feedPoint,
    positionM: round(target.positionM, 3),
    alongRunM: round(alongM, 3),
    pathDropPercent: round(pathDropPercent, 3),
    fuseA: protection.fuseA,
    protectedBy: protection.protectedBy,
  };
  setSize(response, c, run);
  return {
    target,
    circuit,
    voltageV,
    load: kind,
    run,
    alongM,
    leads: sized.leads,
    pathDropPercent,
    worstBehind: behind ? `the lead to tread ${behind.tread}` : target.fixedDownstreamPercent > 0 ? 'the links behind the feed point' : null,
    protection,
    thinnestRatingA: thinnest,
    response,
  };
}

function targetsName(targets: readonly FeedTarget[]): string {
  const first = targets[0] as FeedTarget;
  const last = targets[targets.length - 1] as FeedTarget;
  if (first.to === 'controller') {
    const name = (t: FeedTarget) => (t.powerInput === null ? `controller ${t.controller}` : `controller ${t.controller} input ${t.powerInput}`);
    if (targets.length === 1) return name(first);
    return first.powerInput === null ? `controllers ${first.controller}–${last.controller}` : targets.map(name).join(', ');
  }
  const run = first.kind === 'rail pixels' ? 'the rail' : 'the tread pixels';
  return targets.length === 1 ? `feed point ${first.feedPoint} of ${run}` : `feed points ${first.feedPoint}–${last.feedPoint} of ${run}`;
}

/** A circuit named by what it feeds, one phrase per load on it. */
function circuitName(targets: readonly FeedTarget[]): string {
  const parts: string[] = [];
  let start = 0;
  for (let i = 1; i <= targets.length; i++) {
    if (i === targets.length || (targets[i] as FeedTarget).kind !== (targets[start] as FeedTarget).kind) {
      parts.push(targetsName(targets.slice(start, i)));
      start = i;
    }
  }
  return parts.join(' and ');
}

/**
 * One supply per circuit: each load's feeds grouped into circuits, each circuit's single driver,
 * its place, and a feeder from it to every feed it serves.
 */
export function planCircuits(
  loads: readonly Load[],
  ratingsFor: (voltageV: number) => RailRatings,
  settings: Settings,
  startIndex = 1,
): Circuit[] {
  const d = settings.drivers;
  const defaultAtM = bestDriverPositionM(loads);
  const circuits: Circuit[] = [];
  let index = startIndex;
  const rails: { voltageV: number; targets: FeedTarget[] }[] = [];
  for (const load of loads) {
    const rail = rails.find((r) => Math.abs(r.voltageV - load.voltageV) <= 1e-9 * Math.max(1, load.voltageV));
    if (rail) rail.targets.push(...load.targets);
    else rails.push({ voltageV: load.voltageV, targets: [...load.targets] });
  }
  for (const rail of rails) {
    const voltageV = rail.voltageV;
    const ratings = ratingsFor(voltageV);
    const largestW = ratings.usableW.length > 0 ? Math.max(...ratings.usableW) : 0;
    const capacityW = (largestW * d.maxLoadingPercent) / 100;
    const groups = capacityW > 0 ? groupIntoCircuits(rail.targets, voltageV, capacityW) : [rail.targets];
    for (const targets of groups) {
      let currentA = 0;
      for (const t of targets) currentA += t.currentA;
      const loadW = currentA * voltageV;
      const kinds = [...new Set(targets.map((t) => t.kind))];
      const kind = kinds[0] as LoadKind;
      const driver = loadW > 0 ? singleDriverFor(requiredRatingW(loadW, d.maxLoadingPercent), ratings.usableW, ratings.prices) : null;
      const oversize = loadW > 0 && driver === null;
      const atM = driverPosition(targets, d.positionsM, defaultAtM);
      const ratingW = driver ? driver.ratingW : null;
      const driverLimitA = ratingW !== null ? ((ratingW / voltageV) * d.currentLimitPercent) / 100 : null;
      const feeders = targets.map((t) => oneFeeder(index, t, voltageV, t.kind, atM, driverLimitA, settings));
      let worstPath = 0;
      for (const f of feeders) worstPath = Math.max(worstPath, f.pathDropPercent);
      const sku = ratingW !== null ? ratings.skuByRating.get(ratingW) : undefined;
      const loadingPercent = ratingW !== null ? (loadW / ratingW) * 100 : null;
      const response: EstimateCircuit = {
        circuit: index,
        name: circuitName(targets),
        voltageV,
        loads: kinds,
        loadW: round(loadW),
        currentA: round(currentA),
        driver: ratingW !== null ? { ratingW, loadingPercent: round(loadingPercent as number), currentLimitA: round(driverLimitA as number) } : null,
        driverPositionM: round(atM, 3),
        feeds: feeders.length,
        worstPathDropPercent: round(worstPath, 3),
        fusesA: feeders.map((f) => f.protection.fuseA),
        protectedBy: feeders.some((f) => f.protection.protectedBy === 'none')
          ? 'none'
          : feeders.every((f) => f.protection.protectedBy === 'driver current limit')
            ? 'driver current limit'
            : 'fuse',
      };
      if (sku !== undefined && response.driver) response.driver.sku = sku;
      circuits.push({
        index,
        kind,
        kinds,
        voltageV,
        loadW,
        currentA,
        targets,
        oversize,
        ratingW,
        sku,
        price: driver ? driver.price : null,
        loadingPercent,
        driverPositionM: atM,
        feeders,
        response,
      });
      index++;
    }
  }
  return circuits;
}
