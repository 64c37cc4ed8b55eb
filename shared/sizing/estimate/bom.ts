import type { DataLinePart } from '../../schemas/catalog.js';
import type { BomLine, CartLine, EstimateCableLine, EstimatePricing } from '../../schemas/estimate.js';
import { describeSize, type ConductorSize } from '../conductors.js';
import { cutReels } from '../reels.js';
import { round, type TraceEntry } from '../trace.js';
import { cheapestOf, findCable, findDataLinePart, findFuse, type CatalogIndex } from './catalog.js';
import { fromMinor, toMinor } from './money.js';
import type { SensorCableLine, SensorPart } from './sensor-layout.js';
import type { Settings } from './settings.js';
import type { Supplies } from './supply.js';

/** A catalog item a line was matched to, and how well. */
interface Match {
  sku: string;
  unitPrice?: number | undefined;
  description?: string | undefined;
  /** Why the match is not priced although found (e.g. a different reel length). */
  priceWithheld?: string;
}

/** The catalog item a line needs: its kind and the fields an item must have to fill it. */
export interface Wanted {
  kind: string;
  fields: Record<string, string | number | boolean>;
}

interface LineDraft {
  category: BomLine['category'];
  want?: Wanted | undefined;
  description: string;
  quantity: number;
  unit: BomLine['unit'];
  /** SKU named by the request when the catalog does not hold it (or there is no catalog). */
  sku?: string | undefined;
  match?: Match | undefined;
  note?: string | undefined;
}

export interface StripLine {
  category: 'strip' | 'pixel-strip';
  want: Wanted;
  description: string;
  reels: number;
  reelLengthMm: number;
  sku: string | undefined;
  match: (Match & { reelLengthMm?: number | undefined }) | undefined;
  note?: string | undefined;
}

export interface BomInput {
  settings: Settings;
  catalog: CatalogIndex | null;
  strips: StripLine[];
  /** Strip pieces that get an aluminium profile (one per lit tread), mm. */
  profilePiecesMm: number[];
  /** The request asks for profiles and end caps. */
  profiles: boolean;
  supplies: Supplies;
  controllers: number;
  sensors: SensorPart;
  cables: EstimateCableLine[];
  /** Parts the pixel data lines add (differential links, level shifters); none by default. */
  extraLines?: ExtraBomLine[];
  /** The sensors' 3-core cable, when the geometry places sensors away from the controller. */
  sensorCable?: SensorCableLine | null;
}

/** A part of a pixel data line (differential link, level shifter), matched by its part. */
export interface ExtraBomLine {
  category: 'data-line';
  part: DataLinePart;
  description: string;
  quantity: number;
  unit: BomLine['unit'];
}

export interface Bom {
  lines: BomLine[];
  total?: number;
  complete?: boolean;
  currency?: string;
  pricing?: EstimatePricing;
  cart?: CartLine[];
}

function cableSize(line: EstimateCableLine): ConductorSize | null {
  if (line.awg !== undefined && line.awg !== null) return { awg: line.awg };
  if (line.crossSectionMm2 !== undefined && line.crossSectionMm2 !== null) return { crossSectionMm2: line.crossSectionMm2 };
  return null;
}

/** Metres to order per size and cores, over every use (a handful of lines: a linear search). */
function cableDrafts(cables: EstimateCableLine[], catalog: CatalogIndex | null): LineDraft[] {
  const sizes: (ConductorSize | null)[] = [];
  const cores: number[] = [];
  const metres: number[] = [];
  for (const c of cables) {
    const size = cableSize(c);
    let i = 0;
    while (i < sizes.length && !(cores[i] === c.cores && sameSize(sizes[i] as ConductorSize | null, size))) i++;
    if (i === sizes.length) {
      sizes.push(size);
      cores.push(c.cores);
      metres.push(0);
    }
    metres[i] = (metres[i] as number) + c.totalLengthM;
  }
  const drafts: LineDraft[] = [];
  for (let i = 0; i < sizes.length; i++) {
    const size = sizes[i] as ConductorSize | null;
    const quantity = Math.ceil((metres[i] as number) - 1e-9);
    if (quantity === 0) continue;
    if (!size) {
      drafts.push({
        category: 'cable',
        description: `${cores[i]}-core copper cable, size to choose: no size of the table passes (see checks)`,
        quantity,
        unit: 'm',
      });
      continue;
    }
    const item = catalog ? findCable(catalog, size, cores[i] as number) : undefined;
    drafts.push({
      want: { kind: 'cable', fields: { ...size, cores: cores[i] as number } },
      category: 'cable',
      description: `${cores[i]}-core copper cable ${describeSize(size)}`,
      quantity,
      unit: 'm',
      match: item && { sku: item.sku, unitPrice: item.unitPrice, description: item.description },
    });
  }
  return drafts;
}

function circuitList(indexes: number[]): string {
  return indexes.length === 1 ? `circuit ${indexes[0]}` : `circuits ${indexes.join(', ')}`;
}

function sameSize(a: ConductorSize | null, b: ConductorSize | null): boolean {
  if (a === null || b === null) return a === b;
  return 'awg' in a ? 'awg' in b && a.awg === b.awg : 'crossSectionMm2' in b && a.crossSectionMm2 === b.crossSectionMm2;
}

/** Profile bars cut to the tread pieces; a piece longer than a bar takes whole bars joined. */
function profileBars(piecesMm: number[], barMm: number): number {
  if (piecesMm.length === 0) return 0;
  const plan = cutReels(piecesMm, barMm);
  let bars = plan.reels;
  for (const i of plan.unplaceableIndexes) bars += Math.ceil((piecesMm[i] as number) / barMm);
  return bars;
}

function drafts(input: BomInput): LineDraft[] {
  const { catalog, sensors } = input;
  const out: LineDraft[] = [];
  for (const s of input.strips) {
    const match = s.match && { ...s.match };
    if (match && match.reelLengthMm !== undefined && Math.abs(match.reelLengthMm - s.reelLengthMm) > 1e-9) {
      match.priceWithheld = `catalog reel of ${match.sku} is ${match.reelLengthMm} mm, planned with ${s.reelLengthMm} mm reels`;
    }
    out.push({ category: s.category, want: s.want, description: s.description, quantity: s.reels, unit: 'reel', sku: s.sku, match, note: s.note });
  }
  if (input.profiles) out.push(...profileDrafts(input.profilePiecesMm, catalog));

  for (const rail of input.supplies.rails) {
    for (const g of rail.response.drivers) {
      const sku = rail.skuByRating.get(g.ratingW);
      const item = sku && catalog ? catalog.drivers.find((d) => d.sku === sku) : undefined;
      out.push({
        want: { kind: 'driver', fields: { voltageV: rail.voltageV, ratingW: g.ratingW } },
        category: 'driver',
        description: `LED driver ${rail.voltageV} V ${g.ratingW} W${input.settings.drivers.class2 ? ' (listed Class 2)' : ''}, one per circuit (${circuitList(rail.circuits.filter((c) => c.ratingW === g.ratingW).map((c) => c.index))}); never parallel their outputs`,
        quantity: g.count,
        unit: 'pcs',
        match: item && { sku: item.sku, unitPrice: item.unitPrice, description: item.description },
      });
    }
  }

  // One fuse per feeder at its driver, grouped by rating (circuits and protection).
  const fuses = new Map<number, number>();
  for (const f of input.supplies.feeders) {
    if (f.target.currentA > 0 && f.protection.fuseA !== null) fuses.set(f.protection.fuseA, (fuses.get(f.protection.fuseA) ?? 0) + 1);
  }
  for (const [ratingA, count] of [...fuses.entries()].sort((a, b) => a[0] - b[0])) {
    const item = catalog ? findFuse(catalog, ratingA) : undefined;
    out.push({
      want: { kind: 'fuse', fields: { ratingA } },
      category: 'fuse',
      description: `Inline fuse holder with ${ratingA} A fuse, at the driver output of a feeder`,
      quantity: count,
      unit: 'pcs',
      match: item && { sku: item.sku, unitPrice: item.unitPrice, description: item.description },
    });
  }

  const controllerItem = input.settings.controllerSku && catalog ? catalog.controllers.find((c) => c.sku === input.settings.controllerSku) : undefined;
  const profile = input.settings.profile;
  out.push({
    want: { kind: 'controller', fields: { outputs: profile.outputs, maxCurrentPerOutputA: profile.maxCurrentPerOutputA } },
    category: 'controller',
    description: controllerItem ? 'Stair controller' : 'Stair controller (profile sent inline)',
    quantity: input.controllers,
    unit: 'pcs',
    match: controllerItem && { sku: controllerItem.sku, unitPrice: controllerItem.unitPrice, description: controllerItem.description },
    note: catalog && !controllerItem ? 'profile sent inline, not a catalog item: not priced (name a catalog controller by controller.profileId to price it)' : undefined,
  });

  if (sensors.plan.motionSensors > 0) {
    const m = sensors.motion;
    const item = m?.sku && catalog ? catalog.motionSensors.find((s) => s.sku === m.sku) : undefined;
    const i = sensors.controllerInput;
    out.push({
      want: { kind: 'motion-sensor', fields: m ? { outputType: m.outputType, supplyV: m.supplyV, currentMa: m.currentMa } : { outputType: i.type, supplyV: i.supplyV } },
      category: 'motion-sensor',
      description: m
        ? `PIR motion sensor, ${m.outputType.toUpperCase()} output, ${m.supplyV} V, ${m.currentMa} mA`
        : `PIR motion sensor, ${i.type.toUpperCase()} output, ${i.supplyV} V, at most ${i.maxCurrentMa} mA`,
      quantity: sensors.plan.motionSensors,
      unit: 'pcs',
      match: item && { sku: item.sku, unitPrice: item.unitPrice, description: item.description },
    });
  }
  if (sensors.daylightSensors > 0) {
    const item = sensors.daylightSku && catalog ? catalog.daylightSensors.find((s) => s.sku === sensors.daylightSku) : undefined;
    out.push({
      want: { kind: 'daylight-sensor', fields: {} },
      category: 'daylight-sensor',
      description: `Ambient-light sensor for the ${sensors.response.daylightCutoffLux} lx cut-off`,
      quantity: sensors.daylightSensors,
      unit: 'pcs',
      match: item && { sku: item.sku, unitPrice: item.unitPrice, description: item.description },
    });
  }
  out.push(...cableDrafts(input.cables, catalog));
  const sc = input.sensorCable;
  if (sc && sc.metres > 0) {
    const item = catalog ? findCable(catalog, sc.size, 3) : undefined;
    out.push({
      want: { kind: 'cable', fields: { ...sc.size, cores: 3 } },
      category: 'cable',
      description: sc.description,
      quantity: sc.metres,
      unit: 'm',
      match: item && { sku: item.sku, unitPrice: item.unitPrice, description: item.description },
    });
  }
  for (const extra of input.extraLines ?? []) {
    if (extra.quantity <= 0) continue;
    const item = catalog ? findDataLinePart(catalog, extra.part) : undefined;
    out.push({
      want: { kind: 'data-line', fields: { part: extra.part } },
      category: extra.category,
      description: extra.description,
      quantity: extra.quantity,
      unit: extra.unit,
      match: item && { sku: item.sku, unitPrice: item.unitPrice, description: item.description },
    });
  }
  return out;
}

/** Profile bars cut to the lit tread pieces, and a pair of end caps per piece. */
function profileDrafts(piecesMm: number[], catalog: CatalogIndex | null): LineDraft[] {
  if (piecesMm.length === 0) return [];
  const profile = catalog ? cheapestOf(catalog.aluminiumProfiles) : undefined;
  const caps = catalog ? cheapestOf(catalog.endCaps) : undefined;
  const longest = Math.max(...piecesMm);
  return [
    profile
      ? {
          want: { kind: 'aluminium-profile', fields: {} },
          category: 'aluminium-profile',
          description: `Aluminium profile with diffuser, ${profile.lengthMm} mm bars cut to the tread pieces`,
          quantity: profileBars(piecesMm, profile.lengthMm),
          unit: 'pcs',
          match: { sku: profile.sku, unitPrice: profile.unitPrice, description: profile.description },
        }
      : {
          want: { kind: 'aluminium-profile', fields: { lengthMm: longest } },
          category: 'aluminium-profile',
          description: `Aluminium profile with diffuser, one piece per lit tread (longest ${longest} mm)`,
          quantity: piecesMm.length,
          unit: 'pcs',
        },
    {
      want: { kind: 'end-caps', fields: {} },
      category: 'end-caps',
      description: 'End caps, one pair per tread piece',
      quantity: piecesMm.length,
      unit: 'pair',
      match: caps && { sku: caps.sku, unitPrice: caps.unitPrice, description: caps.description },
    },
  ];
}

/** Tax on a net total, both in minor units, rounded half up (the rate in hundredths of a percent). */
export function taxMinor(netMinor: number, basisPoints: number): number {
  return Math.floor((netMinor * basisPoints + 5000) / 10000);
}

/** Lines with quantities always; with a catalog, prices in integer minor units, their totals and the cart. */
export function buildBom(input: BomInput, trace: TraceEntry[]): Bom {
  const { catalog } = input;
  const lines: BomLine[] = [];
  const cart = new Map<string, { quantity: number; unitMinor: number }>();
  let totalMinor = 0;
  let priced = 0;
  for (const draft of drafts(input)) {
    const line: BomLine = { category: draft.category, description: draft.match?.description ?? draft.description, quantity: draft.quantity, unit: draft.unit };
    const sku = draft.match?.sku ?? draft.sku;
    if (sku !== undefined) line.sku = sku;
    let note = draft.note;
    if (catalog) {
      const m = draft.match;
      if (!m) {
        note ??= draft.sku ? `SKU ${draft.sku} is not an active item of the catalog: not priced` : `no active ${draft.want?.kind ?? 'catalog'} item fits: not priced`;
        if (draft.want) line.missing = draft.want;
      } else if (m.priceWithheld) note = `${m.priceWithheld}: not priced`;
      else if (m.unitPrice === undefined) note = 'catalog gives no price';
      else {
        const unitMinor = toMinor(m.unitPrice, catalog.currency);
        const lineMinor = unitMinor * draft.quantity;
        line.unitPrice = fromMinor(unitMinor, catalog.currency);
        line.lineTotal = fromMinor(lineMinor, catalog.currency);
        totalMinor += lineMinor;
        priced++;
        const inCart = cart.get(m.sku);
        if (inCart && inCart.unitMinor === unitMinor) inCart.quantity += draft.quantity;
        else cart.set(m.sku, { quantity: draft.quantity, unitMinor });
      }
    }
    if (note) line.note = note;
    lines.push(line);
  }
  if (!catalog) return { lines };
  const currency = catalog.currency;
  const total = fromMinor(totalMinor, currency);
  const taxedMinor = taxMinor(totalMinor, catalog.taxRateBasisPoints);
  trace.push({
    quantity: 'bomTotal',
    value: total,
    unit: currency.code,
    formula: 'Σ quantity × unitPrice over priced lines, in integer minor units',
    inputs: { lines: lines.length, pricedLines: priced, minorUnitDigits: currency.digits, totalMinorUnits: totalMinor },
    reference: 'catalog prices as sent',
  });
  trace.push({
    quantity: 'bomGross',
    value: fromMinor(totalMinor + taxedMinor, currency),
    unit: currency.code,
    formula: 'net + round_half_up(net × taxRatePercent / 100), in integer minor units',
    inputs: { netMinorUnits: totalMinor, taxRatePercent: catalog.taxRateBasisPoints / 100, taxMinorUnits: taxedMinor },
    reference: 'catalog tax rate',
  });
  const complete = priced === lines.length;
  return {
    lines,
    total: round(total, currency.digits),
    complete,
    currency: currency.code,
    pricing: {
      source: 'inline',
      catalogVersion: null,
      currency: currency.code,
      taxRatePercent: catalog.taxRateBasisPoints / 100,
      net: fromMinor(totalMinor, currency),
      tax: fromMinor(taxedMinor, currency),
      gross: fromMinor(totalMinor + taxedMinor, currency),
      complete,
      unpricedLines: lines.length - priced,
    },
    cart: [...cart.entries()].map(([sku, c]) => ({ sku, quantity: c.quantity, unitPrice: fromMinor(c.unitMinor, currency) })),
  };
}
