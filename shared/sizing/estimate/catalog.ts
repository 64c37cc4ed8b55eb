import {
  minorUnitDigits,
  type Catalog,
  type CatalogAluminiumProfile,
  type CatalogCable,
  type CatalogController,
  type CatalogDataLine,
  type CatalogDaylightSensor,
  type CatalogDriver,
  type CatalogEndCaps,
  type CatalogFuse,
  type CatalogMotionSensor,
  type DataLinePart,
  type CatalogPixelStrip,
  type CatalogStrip,
} from '../../schemas/catalog.js';
import type { PixelProtocol } from '../../schemas/pixels.js';
import type { ConductorSize } from '../conductors.js';
import type { Currency } from './money.js';

/** The catalog sorted by kind once, so each BOM line looks in a short list. */
export interface CatalogIndex {
  currency: Currency;
  /** Tax rate in hundredths of a percent (2000 = 20 %), so tax is integer arithmetic. */
  taxRateBasisPoints: number;
  strips: CatalogStrip[];
  pixelStrips: CatalogPixelStrip[];
  drivers: CatalogDriver[];
  cables: CatalogCable[];
  controllers: CatalogController[];
  motionSensors: CatalogMotionSensor[];
  daylightSensors: CatalogDaylightSensor[];
  aluminiumProfiles: CatalogAluminiumProfile[];
  endCaps: CatalogEndCaps[];
  fuses: CatalogFuse[];
  dataLines: CatalogDataLine[];
}

// A shop sends the same catalog object with every stair of a batch: index it once.
const indexes = new WeakMap<Catalog, CatalogIndex>();

export function indexCatalog(catalog: Catalog): CatalogIndex {
  const known = indexes.get(catalog);
  if (known) return known;
  const digits = minorUnitDigits(catalog.currency);
  const index: CatalogIndex = {
    currency: { code: catalog.currency, digits, scale: 10 ** digits },
    taxRateBasisPoints: Math.round((catalog.taxRatePercent ?? 0) * 100),
    strips: [],
    pixelStrips: [],
    drivers: [],
    cables: [],
    controllers: [],
    motionSensors: [],
    daylightSensors: [],
    aluminiumProfiles: [],
    endCaps: [],
    fuses: [],
    dataLines: [],
  };
  for (const item of catalog.items) {
    switch (item.kind) {
      case 'strip': index.strips.push(item); break;
      case 'pixel-strip': index.pixelStrips.push(item); break;
      case 'driver': index.drivers.push(item); break;
      case 'cable': index.cables.push(item); break;
      case 'controller': index.controllers.push(item); break;
      case 'motion-sensor': index.motionSensors.push(item); break;
      case 'daylight-sensor': index.daylightSensors.push(item); break;
      case 'aluminium-profile': index.aluminiumProfiles.push(item); break;
      case 'end-caps': index.endCaps.push(item); break;
      case 'fuse': index.fuses.push(item); break;
      case 'data-line': index.dataLines.push(item); break;
    }
  }
  indexes.set(catalog, index);
  return index;
}

const same = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a));

/** Cheapest first; an unpriced item only when nothing priced matches. */
function cheapest<T extends { unitPrice?: number | undefined }>(items: T[]): T | undefined {
  let best: T | undefined;
  for (const item of items) {
    if (!best || (item.unitPrice ?? Infinity) < (best.unitPrice ?? Infinity)) best = item;
  }
  return best;
}

export function findStrip(index: CatalogIndex, sku: string | undefined, voltageV: number, powerWPerM: number, cutPitchMm: number): CatalogStrip | undefined {
  if (sku !== undefined) return index.strips.find((s) => s.sku === sku);
  return cheapest(
    index.strips.filter(
      (s) => same(s.voltageV, voltageV) && same(s.powerWPerM, powerWPerM) && (s.cutPitchMm === undefined || same(s.cutPitchMm, cutPitchMm)),
    ),
  );
}

export function findPixelStrip(
  index: CatalogIndex,
  sku: string | undefined,
  voltageV: number,
  pixelsPerM: number,
  protocol: PixelProtocol,
): CatalogPixelStrip | undefined {
  if (sku !== undefined) return index.pixelStrips.find((s) => s.sku === sku);
  return cheapest(
    index.pixelStrips.filter(
      (s) => same(s.voltageV, voltageV) && same(s.pixelsPerM, pixelsPerM) && (s.protocol === undefined || s.protocol === protocol),
    ),
  );
}

/** Drivers at the rail voltage, restricted to the request's ratings when it lists any. */
export function driversAt(index: CatalogIndex, voltageV: number, ratingsW: readonly number[] | undefined): CatalogDriver[] {
  return index.drivers.filter((d) => same(d.voltageV, voltageV) && (ratingsW === undefined || ratingsW.some((r) => same(r, d.ratingW))));
}

export function cheapestDriver(drivers: CatalogDriver[], ratingW: number): CatalogDriver | undefined {
  return cheapest(drivers.filter((d) => same(d.ratingW, ratingW)));
}

export function findCable(index: CatalogIndex, size: ConductorSize, cores: number): CatalogCable | undefined {
  return cheapest(
    index.cables.filter((c) => {
      if ((c.cores ?? 2) !== cores) return false;
      return 'awg' in size ? c.awg === size.awg : c.crossSectionMm2 !== undefined && same(c.crossSectionMm2, size.crossSectionMm2);
    }),
  );
}

/** A controller item answers to its profileId, or to its SKU when it has none. */
export function findController(index: CatalogIndex, profileId: string): CatalogController | undefined {
  return index.controllers.find((c) => (c.profileId ?? c.sku) === profileId);
}

/** The sensor the request describes, else the catalog's sensor of the controller's input type. */
export function findMotionSensor(
  index: CatalogIndex,
  wanted: { outputType: 'pnp' | 'npn'; supplyV?: number | undefined; currentMa?: number | undefined },
): CatalogMotionSensor | undefined {
  return cheapest(
    index.motionSensors.filter(
      (m) =>
        m.outputType === wanted.outputType &&
        (wanted.supplyV === undefined || same(m.supplyV, wanted.supplyV)) &&
        (wanted.currentMa === undefined || same(m.currentMa, wanted.currentMa)),
    ),
  );
}

export function findFuse(index: CatalogIndex, ratingA: number): CatalogFuse | undefined {
  return cheapest(index.fuses.filter((f) => same(f.ratingA, ratingA)));
}

export function findDataLinePart(index: CatalogIndex, part: DataLinePart): CatalogDataLine | undefined {
  return cheapest(index.dataLines.filter((d) => d.part === part));
}

/** The cheapest of a kind that needs no matching fields (profiles, end caps, daylight sensors). */
export function cheapestOf<T extends { unitPrice?: number | undefined }>(items: T[]): T | undefined {
  return cheapest(items);
}
