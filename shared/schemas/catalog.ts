import { z } from 'zod';
import { MAX_CATALOG_ITEMS, MAX_PIXELS_PER_M } from '../tables/limits.js';
import { controllerProfileSchema } from './controller.js';
import { pixelProtocolSchema } from './pixels.js';

/**
 * A shop's catalog sent inline with an estimate: what it sells and at what price. The estimate
 * matches each bill-of-materials line to an item by kind and fields, so prices are optional
 * knowledge — a line without a match keeps its quantity and says so.
 */

/** Digits after the decimal point of a currency's minor unit (EUR 2, JPY 0, KWD 3). */
export function minorUnitDigits(currency: string): number {
  let digits = minorDigitsCache.get(currency);
  if (digits === undefined) {
    try {
      digits = new Intl.NumberFormat('en', { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ?? 2;
    } catch {
      digits = 2;
    }
    minorDigitsCache.set(currency, digits);
  }
  return digits;
}
const minorDigitsCache = new Map<string, number>();

const skuSchema = z
  .string()
  .min(1)
  .max(64)
  .regex(/^[A-Za-z0-9][A-Za-z0-9._\-/]*$/, 'letters, digits and . _ - / only')
  .meta({ description: 'The shop’s stock-keeping unit.', example: 'HL-S24-10' });

const base = {
  sku: skuSchema,
  description: z.string().min(1).max(200).optional().meta({ description: 'Name shown on the bill of materials; a generated one is used when absent.' }),
  unitPrice: z
    .number()
    .min(0)
    .max(10_000_000)
    .optional()
    .meta({
      description:
        'Price of one unit (one reel, one driver, one metre of cable …) in the catalog currency, a whole number of minor units (39.00, not 39.001). Without it the item is matched but its line is not priced.',
      example: 39,
    }),
};

const reelLengthMm = z.number().min(100).max(1_000_000).optional().meta({ description: 'Length of one reel, mm. Default 5000.', default: 5000 });

export const catalogStripSchema = z
  .strictObject({
    ...base,
    kind: z.literal('strip'),
    voltageV: z.number().positive().max(1000).meta({ description: 'Strip voltage, V DC.' }),
    powerWPerM: z.number().positive().max(1000).meta({ description: 'Power per metre, W/m.' }),
    cutPitchMm: z.number().min(1).max(1000).optional().meta({ description: 'Cut pitch, mm.' }),
    colourTemperatureK: z.int().min(1000).max(20_000).optional().meta({ description: 'Correlated colour temperature of white strip, K (kit options can ask for one).', example: 3000 }),
    reelLengthMm,
  })
  .meta({
    id: 'CatalogStrip',
    description: 'Constant-voltage strip, sold by the reel.',
    example: { sku: 'HL-S24-10', kind: 'strip', unitPrice: 39, voltageV: 24, powerWPerM: 10, cutPitchMm: 50, reelLengthMm: 5000 },
  });

export const catalogPixelStripSchema = z
  .strictObject({
    ...base,
    kind: z.literal('pixel-strip'),
    voltageV: z.number().positive().max(1000).meta({ description: 'Strip voltage, V DC.' }),
    pixelsPerM: z.number().positive().max(MAX_PIXELS_PER_M).meta({ description: `Pixels (driver ICs) per metre (at most ${MAX_PIXELS_PER_M}).` }),
    protocol: pixelProtocolSchema.optional(),
    reelLengthMm,
  })
  .meta({
    id: 'CatalogPixelStrip',
    description: 'Addressable pixel strip, sold by the reel.',
    example: { sku: 'HL-P05-60', kind: 'pixel-strip', unitPrice: 45, voltageV: 5, pixelsPerM: 60, protocol: 'one-wire-800k', reelLengthMm: 5000 },
  });

export const catalogDriverSchema = z
  .strictObject({
    ...base,
    kind: z.literal('driver'),
    voltageV: z.number().positive().max(1000).meta({ description: 'Constant-voltage output, V DC.' }),
    ratingW: z.number().min(1).max(100_000).meta({ description: 'Rated output power, W.' }),
  })
  .meta({
    id: 'CatalogDriver',
    description: 'LED driver (constant-voltage power supply).',
    example: { sku: 'HL-D24-150', kind: 'driver', unitPrice: 46, voltageV: 24, ratingW: 150 },
  });

export const catalogCableSchema = z
  .strictObject({
    ...base,
    kind: z.literal('cable'),
    crossSectionMm2: z.number().positive().max(1000).optional().meta({ description: 'Cross-section of one conductor, mm² (metric tables).' }),
    awg: z.int().min(0).max(40).optional().meta({ description: 'Gauge of one conductor (AWG tables).' }),
    cores: z.int().min(2).max(8).optional().meta({ description: 'Conductors in the cable. Default 2.', default: 2 }),
  })
  .refine((c) => (c.crossSectionMm2 === undefined) !== (c.awg === undefined), {
    message: 'give exactly one of crossSectionMm2 or awg',
    path: ['crossSectionMm2'],
  })
  .meta({ id: 'CatalogCable', description: 'Copper cable, priced per metre.', example: { sku: 'HL-C050', kind: 'cable', unitPrice: 0.6, crossSectionMm2: 0.5 } });

export const catalogControllerSchema = z
  .strictObject({
    ...base,
    kind: z.literal('controller'),
    profileId: z.string().min(1).max(64).optional().meta({ description: 'Id a request names in controller.profileId. Default: the SKU.' }),
    profile: controllerProfileSchema,
  })
  .meta({
    id: 'CatalogController',
    description: 'A stair controller and its profile.',
    example: { sku: 'HL-K36', kind: 'controller', profile: { outputs: 36, maxCurrentPerOutputA: 1.2, dataOutputs: 2, maxPixelsPerOutput: 600 } },
  });

export const catalogMotionSensorSchema = z
  .strictObject({
    ...base,
    kind: z.literal('motion-sensor'),
    outputType: z.enum(['pnp', 'npn']).meta({ description: 'Output type: pnp (sourcing) or npn (sinking).' }),
    supplyV: z.number().positive().max(60).meta({ description: 'Supply voltage the sensor runs on, V.' }),
    currentMa: z.number().positive().max(1000).meta({ description: 'Current the sensor draws, mA.' }),
  })
  .meta({ id: 'CatalogMotionSensor', description: 'PIR motion sensor.', example: { sku: 'HL-M05', kind: 'motion-sensor', outputType: 'pnp', supplyV: 5, currentMa: 8 } });

export const catalogDaylightSensorSchema = z
  .strictObject({ ...base, kind: z.literal('daylight-sensor') })
  .meta({ id: 'CatalogDaylightSensor', description: 'Ambient-light (daylight) sensor for the lux cut-off.', example: { sku: 'HL-L01', kind: 'daylight-sensor' } });

export const catalogAluminiumProfileSchema = z
  .strictObject({
    ...base,
    kind: z.literal('aluminium-profile'),
    lengthMm: z.number().min(100).max(10_000).meta({ description: 'Length of one profile bar, mm.' }),
  })
  .meta({
    id: 'CatalogAluminiumProfile',
    description: 'Aluminium profile with diffuser, cut to each tread’s strip.',
    example: { sku: 'HL-A100', kind: 'aluminium-profile', unitPrice: 8.5, lengthMm: 1000 },
  });

export const catalogEndCapsSchema = z
  .strictObject({ ...base, kind: z.literal('end-caps') })
  .meta({ id: 'CatalogEndCaps', description: 'A pair of end caps: one pair closes one profile piece.', example: { sku: 'HL-E02', kind: 'end-caps', unitPrice: 0.9 } });

export const catalogFuseSchema = z
  .strictObject({
    ...base,
    kind: z.literal('fuse'),
    ratingA: z.number().positive().max(1000).meta({ description: 'Fuse rating, A: the line of a feeder fuse of this rating is priced with it.' }),
  })
  .meta({
    id: 'CatalogFuse',
    description: 'Inline fuse holder with its fuse, fitted at a driver output (one per feeder).',
    example: { sku: 'HL-F05', kind: 'fuse', unitPrice: 3.2, ratingA: 5 },
  });

export const DATA_LINE_PARTS = ['differential-link', 'level-shifter'] as const;

export const catalogDataLineSchema = z
  .strictObject({
    ...base,
    kind: z.literal('data-line'),
    part: z.enum(DATA_LINE_PARTS).meta({ description: '`differential-link`: transmitter and receiver pair for a long one-wire data gap; `level-shifter`: 3.3 V to 5 V logic for one data output.' }),
  })
  .meta({
    id: 'CatalogDataLine',
    description: 'A part of a pixel data line.',
    example: { sku: 'HL-DL2', kind: 'data-line', unitPrice: 14, part: 'differential-link' },
  });

export const catalogItemSchema = z
  .discriminatedUnion('kind', [
    catalogStripSchema,
    catalogPixelStripSchema,
    catalogDriverSchema,
    catalogCableSchema,
    catalogControllerSchema,
    catalogMotionSensorSchema,
    catalogDaylightSensorSchema,
    catalogAluminiumProfileSchema,
    catalogEndCapsSchema,
    catalogFuseSchema,
    catalogDataLineSchema,
  ])
  .meta({
    id: 'CatalogItem',
    description: 'One item a shop sells; `kind` says which fields it carries.',
    example: { sku: 'HL-D24-100', kind: 'driver', unitPrice: 34, voltageV: 24, ratingW: 100 },
  });

export const currencySchema = z
  .string()
  .regex(/^[A-Z]{3}$/, 'an ISO 4217 code such as EUR')
  .meta({ description: 'ISO 4217 currency of every unitPrice.', example: 'EUR' });

export const taxRateSchema = z
  .number()
  .min(0)
  .max(100)
  .refine((v) => Math.abs(v * 100 - Math.round(v * 100)) < 1e-6, 'at most two decimal places')
  .meta({ description: 'Tax rate added to net prices, percent (20 = 20 %), two decimals at most.', example: 20 });

export const catalogSchema = z
  .strictObject({
    currency: currencySchema,
    taxRatePercent: taxRateSchema.optional().meta({ description: 'Tax added to the net total, percent (20 = 20 %). Default 0.', default: 0 }),
    items: z.array(catalogItemSchema).min(1).max(MAX_CATALOG_ITEMS).meta({ description: `The catalog's items, at most ${MAX_CATALOG_ITEMS}.` }),
  })
  .superRefine((catalog, ctx) => {
    const digits = minorUnitDigits(catalog.currency);
    const scale = 10 ** digits;
    const seen = new Set<string>();
    catalog.items.forEach((item, i) => {
      if (seen.has(item.sku)) ctx.addIssue({ code: 'custom', path: ['items', i, 'sku'], message: `SKU ${item.sku} appears twice.` });
      seen.add(item.sku);
      if (item.unitPrice === undefined) return;
      const minor = item.unitPrice * scale;
      if (Math.abs(minor - Math.round(minor)) > 1e-6) {
        ctx.addIssue({
          code: 'custom',
          path: ['items', i, 'unitPrice'],
          message: `${catalog.currency} prices have ${digits} decimal place(s); ${item.unitPrice} is not a whole number of minor units.`,
        });
      }
    });
  })
  .meta({
    id: 'Catalog',
    description:
      'An inline catalog: the estimate matches SKUs to its bill of materials by kind and fields (strip by SKU or voltage and power, drivers by rating and voltage, cable by size, controller by profileId) and prices the lines in integer minor units.',
    example: {
      currency: 'EUR',
      items: [
        { sku: 'HL-S24-10', kind: 'strip', unitPrice: 39, voltageV: 24, powerWPerM: 10, cutPitchMm: 50, reelLengthMm: 5000 },
        { sku: 'HL-D24-150', kind: 'driver', unitPrice: 46, voltageV: 24, ratingW: 150 },
        { sku: 'HL-C050', kind: 'cable', unitPrice: 0.6, crossSectionMm2: 0.5 },
      ],
    },
  });

export type Catalog = z.output<typeof catalogSchema>;
export type CatalogItem = z.output<typeof catalogItemSchema>;
export type CatalogStrip = z.output<typeof catalogStripSchema>;
export type CatalogPixelStrip = z.output<typeof catalogPixelStripSchema>;
export type CatalogDriver = z.output<typeof catalogDriverSchema>;
export type CatalogCable = z.output<typeof catalogCableSchema>;
export type CatalogController = z.output<typeof catalogControllerSchema>;
export type CatalogMotionSensor = z.output<typeof catalogMotionSensorSchema>;
export type CatalogDaylightSensor = z.output<typeof catalogDaylightSensorSchema>;
export type CatalogAluminiumProfile = z.output<typeof catalogAluminiumProfileSchema>;
export type CatalogEndCaps = z.output<typeof catalogEndCapsSchema>;
export type CatalogFuse = z.output<typeof catalogFuseSchema>;
export type CatalogDataLine = z.output<typeof catalogDataLineSchema>;
export type DataLinePart = (typeof DATA_LINE_PARTS)[number];
