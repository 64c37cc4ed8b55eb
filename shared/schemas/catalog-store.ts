import { z } from 'zod';
import { pageOf, pageQuerySchema } from './page.js';
import {
  catalogAluminiumProfileSchema,
  catalogCableSchema,
  catalogControllerSchema,
  catalogDaylightSensorSchema,
  catalogDriverSchema,
  catalogDataLineSchema,
  catalogEndCapsSchema,
  catalogFuseSchema,
  catalogMotionSensorSchema,
  catalogPixelStripSchema,
  catalogStripSchema,
  currencySchema,
  minorUnitDigits,
  taxRateSchema,
  type Catalog,
  type CatalogItem,
} from './catalog.js';

/**
 * The organisation's stored catalog: the inline catalog's item kinds, each with `active` added
 * (a retired SKU stays for old estimates but is never picked).
 */

const active = {
  active: z.boolean().optional().meta({ description: 'False once the SKU is retired: kept for old estimates, never picked. Default true.', default: true }),
};

export const storedCatalogItemSchema = z
  .discriminatedUnion('kind', [
    catalogStripSchema.safeExtend(active).meta({ id: 'StoredCatalogStrip' }),
    catalogPixelStripSchema.safeExtend(active).meta({ id: 'StoredCatalogPixelStrip' }),
    catalogDriverSchema.safeExtend(active).meta({ id: 'StoredCatalogDriver' }),
    catalogCableSchema.safeExtend(active).meta({ id: 'StoredCatalogCable' }),
    catalogControllerSchema.safeExtend(active).meta({ id: 'StoredCatalogController' }),
    catalogMotionSensorSchema.safeExtend(active).meta({ id: 'StoredCatalogMotionSensor' }),
    catalogDaylightSensorSchema.safeExtend(active).meta({ id: 'StoredCatalogDaylightSensor' }),
    catalogAluminiumProfileSchema.safeExtend(active).meta({ id: 'StoredCatalogAluminiumProfile' }),
    catalogEndCapsSchema.safeExtend(active).meta({ id: 'StoredCatalogEndCaps' }),
    catalogFuseSchema.safeExtend(active).meta({ id: 'StoredCatalogFuse' }),
    catalogDataLineSchema.safeExtend(active).meta({ id: 'StoredCatalogDataLine' }),
  ])
  .meta({
    id: 'StoredCatalogItem',
    description: 'One item of the stored catalog; `kind` says which fields it carries. `unitPrice` is in major units of the catalog currency (39 = 39.00).',
    example: { sku: 'HL-D24-100', kind: 'driver', unitPrice: 34, voltageV: 24, ratingW: 100, active: true },
  });
export type StoredCatalogItem = z.output<typeof storedCatalogItemSchema>;

export const CATALOG_ITEM_KINDS = storedCatalogItemSchema.options.map((o) => o.shape.kind.value);
export type CatalogItemKind = StoredCatalogItem['kind'];

/** The fields every kind shares; a PATCH may change only these (PUT replaces the kind's fields). */
export const patchCatalogItemSchema = z
  .strictObject({
    description: z.string().min(1).max(200).nullable().optional().meta({ description: 'Name on the bill of materials; null removes it.' }),
    unitPrice: z.number().min(0).max(10_000_000).nullable().optional().meta({ description: 'Price of one unit in major units; null removes it.' }),
    active: z.boolean().optional().meta({ description: 'False retires the SKU, true brings it back.' }),
  })
  .meta({ id: 'PatchCatalogItem', description: 'Changes the price, name or active flag of one item.', example: { unitPrice: 36 } });
export type PatchCatalogItem = z.output<typeof patchCatalogItemSchema>;

const booleanQuery = z.enum(['true', 'false']).transform((v) => v === 'true');

export const catalogItemQuerySchema = pageQuerySchema
  .extend({
    kind: z.enum(CATALOG_ITEM_KINDS as [CatalogItemKind, ...CatalogItemKind[]]).optional().meta({ description: 'Only items of this kind.' }),
    active: booleanQuery.optional().meta({ description: '`true`: only active items; `false`: only retired ones. Embed keys always see active items only.' }),
  })
  .meta({ description: 'Filter and page the catalog items (sorted by SKU).' });
export type CatalogItemQuery = z.output<typeof catalogItemQuerySchema>;

export const catalogItemPageSchema = pageOf(storedCatalogItemSchema, 'StoredCatalogItemPage');

export const storedCatalogSchema = z
  .object({
    currency: currencySchema,
    taxRatePercent: z.number().meta({ description: 'Tax rate, percent.' }),
    version: z.int().meta({ description: 'Bumped by every change to the catalog or its items; 0 before the first change.' }),
    itemCount: z.int().meta({ description: 'Items stored, active or retired.' }),
    activeItemCount: z.int().meta({ description: 'Active items.' }),
    updatedAt: z.string().nullable().meta({ description: 'Time of the last change; null before the first.' }),
  })
  .meta({
    id: 'StoredCatalog',
    description: 'The organisation’s catalog: currency, tax rate and version.',
    example: { currency: 'EUR', taxRatePercent: 20, version: 21, itemCount: 20, activeItemCount: 20, updatedAt: '2026-12-01T10:00:00.000Z' },
  });
export type StoredCatalog = z.output<typeof storedCatalogSchema>;

export const patchCatalogSchema = z
  .strictObject({ currency: currencySchema.optional(), taxRatePercent: taxRateSchema.optional() })
  .meta({ id: 'PatchCatalog', description: 'Changes the catalog’s currency or tax rate.', example: { taxRatePercent: 20 } });
export type PatchCatalog = z.output<typeof patchCatalogSchema>;

/** A price in major units as whole minor units, or null when it is not a whole number of them. */
export function toMinorUnits(price: number, currency: string): number | null {
  const minor = price * 10 ** minorUnitDigits(currency);
  return Math.abs(minor - Math.round(minor)) > 1e-6 ? null : Math.round(minor);
}

export function toMajorUnits(minor: number, currency: string): number {
  const digits = minorUnitDigits(currency);
  return Number((minor / 10 ** digits).toFixed(digits));
}

/**
 * Stored items as the inline catalog the engine prices from: active items only, without `active`,
 * prices as whole minor units read back, by SKU in code-point order (the same on every database
 * and in the CLI); null when no item is active. The API turns its stored catalog into this, and
 * `treadwise batch --local --catalog` a catalog CSV, so both price a stair alike.
 */
export function inlineCatalogOf(items: readonly StoredCatalogItem[], settings: { currency: string; taxRatePercent: number }): Catalog | null {
  const active = items
    .filter((item) => item.active !== false)
    .map(({ active: _active, ...item }) => {
      const minor = item.unitPrice === undefined ? null : toMinorUnits(item.unitPrice, settings.currency);
      return (minor === null ? item : { ...item, unitPrice: toMajorUnits(minor, settings.currency) }) as CatalogItem;
    })
    .sort((a, b) => (a.sku < b.sku ? -1 : a.sku > b.sku ? 1 : 0));
  return active.length > 0 ? { currency: settings.currency, taxRatePercent: settings.taxRatePercent, items: active } : null;
}

export const catalogImportQuerySchema = z
  .strictObject({
    dryRun: booleanQuery.optional().meta({ description: '`true`: check the file and answer the report without importing.' }),
  })
  .meta({ description: 'How to import.' });
export type CatalogImportQuery = z.output<typeof catalogImportQuerySchema>;

export const catalogImportErrorSchema = z.object({
  row: z.int().meta({ description: 'Line of the file; the header is line 1.' }),
  column: z.string().meta({ description: 'The column, e.g. `unitPrice` or `profile.outputs`; `(row)` or `(header)` for a whole row.' }),
  message: z.string(),
});

export const catalogImportReportSchema = z
  .object({
    dryRun: z.boolean(),
    imported: z.boolean().meta({ description: 'True when the rows were written (never on a dry run or with any bad row).' }),
    rows: z.int().meta({ description: 'Data rows in the file.' }),
    created: z.int().meta({ description: 'New SKUs (that would be) created.' }),
    updated: z.int().meta({ description: 'Existing SKUs (that would be) changed.' }),
    unchanged: z.int().meta({ description: 'Rows equal to the stored item.' }),
    version: z.int().meta({ description: 'The catalog version after the import (on a dry run: the one it would have).' }),
    errors: z.array(catalogImportErrorSchema).meta({ description: 'Every bad row and column with the reason (at most 500). Empty when the file is good.' }),
  })
  .meta({
    id: 'CatalogImportReport',
    description: 'What an import did or, on a dry run, would do.',
    example: { dryRun: true, imported: false, rows: 20, created: 2, updated: 1, unchanged: 17, version: 5, errors: [] },
  });
export type CatalogImportReport = z.output<typeof catalogImportReportSchema>;
