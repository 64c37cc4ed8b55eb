import type { EstimateInput, EstimateResult } from '../../schemas/estimate.js';
import { describeSize } from '../conductors.js';
import type { StairGeometry } from '../geometry.js';
import { round, type TraceEntry } from '../trace.js';
import { ENGINE_VERSION } from '../version.js';
import { buildBom, type ExtraBomLine } from './bom.js';
import { isControllerLead } from './cable-checks.js';
import { cableSchedule, cableUsesOf, describeUse, type CableUse } from './cable-schedule.js';
import { indexCatalog } from './catalog.js';
import { cautionsFor } from './cautions.js';
import { dataLineBomLines } from './data-lines.js';
import type { Design } from './checks.js';
import { sizeRailPixels, type RailPart } from './rail-pixels.js';
import { outputsOf, pixelsOf } from './result-shapes.js';
import { runChecks } from './run-checks.js';
import { controllerSites, planSensors, sensorCableLine, sensorWiring } from './sensor-layout.js';
import { standbyOf } from './standby.js';
import { endClearanceDefault, pixelDefaults, resolveSettings, type Settings } from './settings.js';
import type { TreadBlock } from './stair.js';
import { planReels } from './strip-reels.js';
import { applyResizedLeads, loadsOf, sizeSupplies } from './supply.js';
import { sizeTreadPixels, type TreadPixelPart } from './tread-pixels.js';
import { sizeTreadStrips, type TreadStripPart } from './tread-strips.js';

export { SizingInputError } from '../../tables/errors.js';

/**
 * POST /v1/estimates: the whole stair (or corridor) sized on input the request schema has
 * already validated — no parsing here, so a shop can run thousands a second.
 *
 * A design that breaks a limit still gets a full result whose checks say what fails and what to
 * change. Throws SizingInputError only for input no schema can rule out: a controller profileId
 * that the inline catalog does not hold (path `controller.profileId`).
 */
export function estimate(input: EstimateInput): EstimateResult {
  const catalog = input.catalog ? indexCatalog(input.catalog) : null;
  const settings = resolveSettings(input, catalog);
  const trace: TraceEntry[] = [];
  const stair: StairGeometry | null = input.staircase ?? null;

  let treadStrips: TreadStripPart | null = null;
  let treadPixels: TreadPixelPart | null = null;
  let rail: RailPart | null = null;
  switch (input.layout) {
    case 'tread-strips':
      treadStrips = sizeTreadStrips(stair as StairGeometry, input.treadStrip, settings, trace);
      break;
    case 'treads-and-rail':
      treadStrips = sizeTreadStrips(stair as StairGeometry, input.treadStrip, settings, trace);
      rail = sizeRailPixels(input.railPixels, settings.profile, input.staircase.treads, trace);
      break;
    case 'rail-pixels':
      rail = sizeRailPixels(input.railPixels, settings.profile, null, trace);
      break;
    case 'tread-pixels':
      treadPixels = sizeTreadPixels(stair as StairGeometry, input.treadPixels, settings, trace);
      break;
  }
  noteBlockDefaults(input, settings);

  const cvControllers = treadStrips ? Math.max(1, treadStrips.allocation.controllers.length) : 0;
  const controllers = Math.max(1, cvControllers, rail?.controllersNeeded ?? 0, treadPixels?.controllers ?? 0);
  const controllerBlocks: TreadBlock[] = treadStrips
    ? treadStrips.runs.blocks
    : treadPixels
      ? treadPixels.controllerBlocks
      : [];
  trace.push({
    quantity: 'controllers',
    value: controllers,
    unit: 'controllers',
    formula: 'max(controllers for the CV outputs and tread range, controllers for the data outputs)',
    inputs: {
      forTreadStrips: cvControllers,
      forRail: rail?.controllersNeeded ?? 0,
      forTreadPixels: treadPixels?.controllers ?? 0,
    },
    reference: 'controller profile',
  });

  const supplies = sizeSupplies(loadsOf(treadStrips, rail, treadPixels, settings, stair), settings, catalog, trace);
  applyResizedLeads(treadStrips, supplies.feeders, settings);
  const sensors = planSensors(input, settings, catalog, controllers, trace);
  sensors.wiring = sensorWiring(sensors, controllerSites(stair, treadStrips, treadPixels, rail), settings, trace);

  const { treadReels, railReels, strips } = planReels(treadStrips, treadPixels, rail, settings, catalog, trace);

  const cableUses = cableUsesOf(treadStrips, treadPixels, supplies.feeders, settings);
  const cables = cableSchedule(cableUses, settings.cable);

  const design: Design = { settings, stair, treadStrips, treadPixels, rail, controllers, controllerBlocks, supplies, sensors, treadReels, cableUses };
  const checks = runChecks(design);

  const litPieces = litPiecesMm(treadStrips, treadPixels);
  // Issue 8 (pixels): parts the data lines need, and the sensor cable from the geometry.
  const extraLines: ExtraBomLine[] = dataLineBomLines(rail?.dataLines ?? treadPixels?.dataLines);
  const sensorCable = sensors.wiring ? sensorCableLine(sensors, sensors.wiring, settings) : null;
  const bom = buildBom(
    { settings, catalog, strips, profilePiecesMm: litPieces, profiles: input.profiles === true, supplies, controllers, sensors, cables, extraLines, sensorCable },
    trace,
  );

  let totalLoadW = 0;
  let driverCount = 0;
  let maxRailCurrentA = 0;
  let maxRailVoltageV = 0;
  for (const r of supplies.rails) {
    totalLoadW += r.loadW;
    driverCount += r.response.driverCount;
    maxRailCurrentA = Math.max(maxRailCurrentA, r.currentA);
    maxRailVoltageV = Math.max(maxRailVoltageV, r.voltageV);
  }
  let longestRunM = 0;
  let longestFeederM = 0;
  let worstDrop: CableUse | null = null;
  for (const u of cableUses) {
    // longestRunM: controller → tread leads only, as the cable-run-length check; feeders have longestFeederM.
    if (isControllerLead(u)) longestRunM = Math.max(longestRunM, u.run.lengthM);
    if (u.use === 'feeders') longestFeederM = Math.max(longestFeederM, u.run.lengthM);
    if (u.powered && (!worstDrop || u.run.dropPercent > worstDrop.run.dropPercent)) worstDrop = u;
  }
  // End to end, as the cable-drop check: the worst driver → strip path, or a single run if that is worse.
  let worstDropPercent = worstDrop ? worstDrop.run.dropPercent : 0;
  for (const f of supplies.feeders) if (f.target.currentA > 0) worstDropPercent = Math.max(worstDropPercent, f.pathDropPercent);
  if (worstDrop) trace.push(worstDropEntry(worstDrop));
  trace.push({
    quantity: 'totalLoadW',
    value: round(totalLoadW),
    unit: 'W',
    formula: 'Σ rail loads',
    inputs: { rails: supplies.rails.length },
    reference: 'arithmetic',
  });

  const counts = { pass: 0, warn: 0, fail: 0 };
  for (const c of checks) counts[c.status]++;

  const result: EstimateResult = {
    engineVersion: ENGINE_VERSION,
    layout: input.layout,
    summary: {
      treads: stair && input.layout !== 'rail-pixels' ? stair.treads : 0,
      litTreads: treadStrips?.litTreads ?? treadPixels?.litTreads ?? 0,
      controllers,
      totalLoadW: round(totalLoadW),
      driverCount,
      longestRunM: round(longestRunM, 3),
      longestFeederM: round(longestFeederM, 3),
      worstDropPercent: round(worstDropPercent, 3),
      motionSensors: sensors.plan.motionSensors,
      reels: (treadReels?.response.reels ?? 0) + (railReels?.reels ?? 0),
      checks: counts,
    },
    treads: treadStrips?.rows ?? treadPixels?.rows ?? [],
    outputs: outputsOf(settings, controllers, treadStrips, treadPixels, rail),
    drivers: supplies.rails.map((r) => r.response),
    circuits: supplies.circuits.map((c) => c.response),
    feeder: {
      lengthM: settings.cable.feederLengthM,
      lengthDefaulted: settings.cable.feederLengthDefaulted,
      runs: supplies.feeders.map((f) => f.response),
    },
    pixels: pixelsOf(rail, treadPixels),
    reels: { treads: treadReels?.response ?? null, rail: railReels?.response ?? null },
    cables,
    sensors: sensors.response,
    bom: bom.lines,
    checks,
    cautions: cautionsFor(maxRailCurrentA, maxRailVoltageV),
    standby: standbyOf({ input, controllers, driverCount, sensors, rail, treadPixels, litLoadW: totalLoadW }, trace),
    trace: settings.defaultsUsed.length > 0 ? settings.defaultsUsed.concat(trace) : trace,
  };
  if (treadStrips && treadStrips.landingRows.length > 0) result.landings = treadStrips.landingRows;
  if (bom.total !== undefined) result.bomTotal = bom.total;
  if (bom.complete !== undefined) result.bomTotalComplete = bom.complete;
  if (bom.currency !== undefined) result.currency = bom.currency;
  if (bom.pricing !== undefined) result.pricing = bom.pricing;
  if (bom.cart !== undefined) result.cart = bom.cart;
  return result;
}

function worstDropEntry(u: CableUse): TraceEntry {
  return {
    quantity: 'worstDropPercent',
    value: round(u.run.dropPercent, 3),
    unit: '%',
    formula: u.use === 'chain links' ? 'Σ 2 · L · I · R′ over the links of a feed group / V · 100' : 'Vd = 2 · L · I · R′; Vd / V · 100',
    inputs: {
      run: describeUse(u),
      lengthM: round(u.run.lengthM, 4),
      currentA: round(u.run.currentA, 4),
      size: u.run.size ? describeSize(u.run.size) : 'none passes',
      resistanceOhmPerKm: round(u.run.resistanceOhmPerKm || 0, 4),
      dropV: round(u.run.dropV, 4),
    },
    reference: 'IEC 60364-5-52 Annex G, two-wire DC loop (cos φ = 1)',
  };
}

/** Defaults of the blocks a layout uses (the shared ones are noted by resolveSettings). */
function noteBlockDefaults(input: EstimateInput, settings: Settings): void {
  const used = settings.defaultsUsed;
  if ((input.layout === 'tread-strips' || input.layout === 'treads-and-rail') && input.treadStrip.endClearanceMm === undefined) endClearanceDefault(used);
  if (input.layout === 'tread-pixels') {
    if (input.treadPixels.endClearanceMm === undefined) endClearanceDefault(used);
    pixelDefaults(input.treadPixels, used);
  }
  if (input.layout === 'rail-pixels' || input.layout === 'treads-and-rail') pixelDefaults(input.railPixels, used);
}

function litPiecesMm(treadStrips: TreadStripPart | null, treadPixels: TreadPixelPart | null): number[] {
  // Each lit tread's own piece (treads may differ in width).
  if (treadStrips && treadStrips.litTreads > 0) return treadStrips.litPiecesMm;
  if (treadPixels && treadPixels.litTreads > 0) return treadPixels.litPiecesMm;
  return [];
}

