import type { Catalog, CatalogController, CatalogStrip } from '../../schemas/catalog.js';
import { treadStripsRequestSchema, type TreadStripsInput } from '../../schemas/estimate.js';
import { OPTION_POSITIONS, type KitChoices, type KitOptionsInput, type OptionPosition } from '../../schemas/estimate-options.js';
import { MAX_OPTION_CANDIDATES } from '../../tables/option-limits.js';
import { treadPositionsM } from '../geometry.js';

/** A catalog item left out before sizing, and why. */
export interface Pruned {
  sku: string;
  kind: 'strip' | 'controller';
  reason: string;
}

/** One design to size: its choices and the estimate request that sizes it (catalog attached). */
export interface Candidate {
  choices: KitChoices;
  input: TreadStripsInput;
}

export interface CandidatePlan {
  candidates: Candidate[];
  /** Candidates the catalog and constraints allow; more than candidates.length when capped. */
  possible: number;
  capped: boolean;
  pruned: Pruned[];
}

const same = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a));

/** Cheapest first (unpriced last), then by SKU: the order candidates are tried and capped in. */
function byPriceThenSku(a: { unitPrice?: number | undefined; sku: string }, b: { unitPrice?: number | undefined; sku: string }): number {
  const pa = a.unitPrice ?? Infinity;
  const pb = b.unitPrice ?? Infinity;
  if (pa !== pb) return pa < pb ? -1 : 1;
  return a.sku < b.sku ? -1 : a.sku > b.sku ? 1 : 0;
}

/** SKUs the request names that the catalog does not hold (or holds as another kind). */
function absent(wanted: readonly string[] | undefined, held: readonly { sku: string }[], kind: Pruned['kind']): Pruned[] {
  if (!wanted) return [];
  const skus = new Set(held.map((i) => i.sku));
  return [...new Set(wanted)].filter((s) => !skus.has(s)).map((sku) => ({ sku, kind, reason: `no active ${kind} with this SKU in the catalog` }));
}

/** The estimate request of one candidate, without the catalog (validated once per strip). */
function requestOf(input: KitOptionsInput, strip: CatalogStrip, controller: CatalogController, controllerPosition: OptionPosition, positionsM: number[] | undefined): TreadStripsInput {
  const request: TreadStripsInput = {
    layout: 'tread-strips',
    staircase: input.staircase,
    treadStrip: { voltageV: strip.voltageV, powerWPerM: strip.powerWPerM, cutPitchMm: strip.cutPitchMm as number, sku: strip.sku },
    controller: { profileId: controller.profileId ?? controller.sku, position: controllerPosition },
  };
  if (input.endClearanceMm !== undefined) request.treadStrip.endClearanceMm = input.endClearanceMm;
  if (input.cable) request.cable = input.cable;
  const drivers = positionsM ? { ...input.drivers, positionsM } : input.drivers;
  if (drivers) request.drivers = drivers;
  if (input.sensors) request.sensors = input.sensors;
  if (input.reels) request.reels = input.reels;
  if (input.profiles !== undefined) request.profiles = input.profiles;
  if (input.standby) request.standby = input.standby;
  return request;
}

/** Strips of the catalog the constraints allow and the engine can size and the catalog can power. */
function eligibleStrips(input: KitOptionsInput, catalog: Catalog, pruned: Pruned[]): CatalogStrip[] {
  const c = input.constraints;
  const all = catalog.items.filter((i): i is CatalogStrip => i.kind === 'strip');
  pruned.push(...absent(c?.stripSkus, all, 'strip'));
  const ratingsW = input.drivers?.availableRatingsW;
  const out: CatalogStrip[] = [];
  for (const s of all) {
    if (c?.stripSkus && !c.stripSkus.includes(s.sku)) continue;
    if (c?.voltagesV && !c.voltagesV.some((v) => same(v, s.voltageV))) continue;
    if (c?.colourTemperatureK !== undefined && s.colourTemperatureK !== c.colourTemperatureK) continue;
    if (c?.minPowerWPerM !== undefined && s.powerWPerM < c.minPowerWPerM - 1e-9) continue;
    if (c?.maxPowerWPerM !== undefined && s.powerWPerM > c.maxPowerWPerM + 1e-9) continue;
    if (s.cutPitchMm === undefined) {
      pruned.push({ sku: s.sku, kind: 'strip', reason: 'no cut pitch in the catalog: the strip cannot be cut to the treads' });
      continue;
    }
    // Sound: without a driver at the strip's voltage the kit has no priced supply to sell.
    const powered = catalog.items.some((d) => d.kind === 'driver' && same(d.voltageV, s.voltageV) && (!ratingsW || ratingsW.some((r) => same(r, d.ratingW))));
    if (!powered) {
      pruned.push({ sku: s.sku, kind: 'strip', reason: `no driver at ${s.voltageV} V in the catalog${ratingsW ? ' among drivers.availableRatingsW' : ''}` });
      continue;
    }
    out.push(s);
  }
  return out.sort(byPriceThenSku);
}

/** Controllers the constraints allow that have CV outputs and answer to their own profileId. */
function eligibleControllers(input: KitOptionsInput, catalog: Catalog, pruned: Pruned[]): CatalogController[] {
  const wanted = input.constraints?.controllerSkus;
  const all = catalog.items.filter((i): i is CatalogController => i.kind === 'controller');
  pruned.push(...absent(wanted, all, 'controller'));
  const out: CatalogController[] = [];
  for (const c of all) {
    if (wanted && !wanted.includes(c.sku)) continue;
    if (c.profile.outputs === 0) {
      pruned.push({ sku: c.sku, kind: 'controller', reason: 'no constant-voltage outputs for tread strips' });
      continue;
    }
    // The engine finds a controller by profileId (or SKU): a second item under the same id is unreachable.
    const id = c.profileId ?? c.sku;
    const first = all.find((o) => (o.profileId ?? o.sku) === id);
    if (first !== c) {
      pruned.push({ sku: c.sku, kind: 'controller', reason: `profileId "${id}" is also ${first?.sku}'s; only that item can be sized` });
      continue;
    }
    out.push(c);
  }
  return out.sort(byPriceThenSku);
}

/** Driver places: bottom = beside tread 1, top = beside the last tread, middle = the engine's default. */
function driverPlaces(input: KitOptionsInput): { position: KitChoices['driverPosition']; positionsM: number[] | undefined }[] {
  if (input.drivers?.positionsM) return [{ position: 'given', positionsM: undefined }];
  const along = treadPositionsM(input.staircase);
  const topM = along[along.length - 1] ?? 0;
  const wanted = input.constraints?.driverPositions ?? OPTION_POSITIONS;
  return OPTION_POSITIONS.filter((p) => wanted.includes(p)).map((position) => ({
    position,
    positionsM: position === 'bottom' ? [0] : position === 'top' ? [Math.round(topM * 1000) / 1000] : undefined,
  }));
}

/**
 * Every candidate the catalog and the constraints allow, cheapest parts first, at most
 * MAX_OPTION_CANDIDATES of them: strips × controllers × controller positions × driver positions.
 */
export function planCandidates(input: KitOptionsInput, catalog: Catalog): CandidatePlan {
  const pruned: Pruned[] = [];
  const controllers = eligibleControllers(input, catalog, pruned);
  const controllerPlaces = OPTION_POSITIONS.filter((p) => (input.constraints?.controllerPositions ?? OPTION_POSITIONS).includes(p));
  const places = driverPlaces(input);

  // Each strip's request is validated once, as POST /v1/estimates would (bounds, reel against pitch).
  const strips = eligibleStrips(input, catalog, pruned).filter((s) => {
    const probe = controllers[0];
    if (!probe) return true;
    const parsed = treadStripsRequestSchema.safeParse(requestOf(input, s, probe, 'bottom', undefined));
    if (parsed.success) return true;
    const issue = parsed.error.issues[0];
    pruned.push({ sku: s.sku, kind: 'strip', reason: `cannot be sized: ${issue?.path.join('.')}: ${issue?.message}` });
    return false;
  });

  const possible = strips.length * controllers.length * controllerPlaces.length * places.length;
  const candidates: Candidate[] = [];
  outer: for (const strip of strips) {
    for (const controller of controllers) {
      for (const controllerPosition of controllerPlaces) {
        for (const place of places) {
          if (candidates.length >= MAX_OPTION_CANDIDATES) break outer;
          const request = requestOf(input, strip, controller, controllerPosition, place.positionsM);
          candidates.push({
            choices: {
              stripSku: strip.sku,
              voltageV: strip.voltageV,
              powerWPerM: strip.powerWPerM,
              cutPitchMm: strip.cutPitchMm as number,
              controllerSku: controller.sku,
              controllerPosition,
              driverPosition: place.position,
            },
            input: { ...request, catalog },
          });
        }
      }
    }
  }
  return { candidates, possible, capped: possible > candidates.length, pruned };
}
