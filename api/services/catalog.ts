import { and, asc, count, eq, gt, sql } from 'drizzle-orm';
import { z } from 'zod';
import { minorUnitDigits, type Catalog, type CatalogItem } from '../../shared/schemas/catalog.js';
import {
  toMajorUnits,
  toMinorUnits,
  type CatalogItemQuery,
  type PatchCatalog,
  type PatchCatalogItem,
  type StoredCatalog,
  type StoredCatalogItem,
} from '../../shared/schemas/catalog-store.js';
import type { Db } from '../db/client.js';
import { catalogItems, catalogs } from '../db/schema.js';
import { HttpProblem } from '../problem.js';
import { decodeCursor, toPage, type Page } from './pagination.js';

type ItemRow = typeof catalogItems.$inferSelect;
type CatalogRow = typeof catalogs.$inferSelect;

const DEFAULT_CURRENCY = 'EUR';

/** The active items of a stored catalog in the inline catalog's shape, and the version they are. */
export interface PricingCatalog {
  version: number;
  catalog: Catalog;
}

/** Organisations whose active catalog is kept in memory between estimates. */
const PRICING_CACHE_SIZE = 500;
/**
 * How long a cached priced catalog is used without asking the database for its version. Changes
 * forget it at once on every instance (see createCatalogService); this bounds what a lost
 * notification, or a read racing a change, could leave stale.
 */
const PRICING_TRUST_MS = 5_000;

const notFound = (sku: string) => new HttpProblem(404, 'catalog_item_not_found', 'Not found', `The catalog has no SKU ${sku}.`);

function priceProblem(path: string, price: number, currency: string) {
  const digits = minorUnitDigits(currency);
  return new HttpProblem(400, 'validation_failed', 'Invalid request', `${currency} prices have ${digits} decimal place(s).`, {
    errors: [{ path, message: `${currency} prices have ${digits} decimal place(s); ${price} is not a whole number of minor units.` }],
  });
}

/** A stored row as the API shows it: the kind's fields, price in major units, active. */
export function itemView(row: ItemRow, currency: string): StoredCatalogItem {
  return {
    sku: row.sku,
    kind: row.kind,
    ...(row.description !== null ? { description: row.description } : {}),
    ...(row.unitPriceMinor !== null ? { unitPrice: toMajorUnits(row.unitPriceMinor, currency) } : {}),
    ...row.fields,
    active: row.active,
  } as StoredCatalogItem;
}

/** The columns of an item: what is not sku, kind, description, price or active goes in `fields`. */
export function itemColumns(item: StoredCatalogItem, currency: string, path = 'unitPrice') {
  const { sku, kind, description, unitPrice, active, ...fields } = item;
  let unitPriceMinor: number | null = null;
  if (unitPrice !== undefined) {
    unitPriceMinor = toMinorUnits(unitPrice, currency);
    if (unitPriceMinor === null) throw priceProblem(path, unitPrice, currency);
  }
  return { sku, kind, description: description ?? null, fields: fields as Record<string, unknown>, unitPriceMinor, active: active ?? true };
}

/**
 * The stored catalog of an organisation. Every change runs in one transaction with the bump of
 * the catalog's version, so a version always names one exact set of items and prices.
 */
export function createCatalogService({ db, clock, onChange = () => undefined }: { db: Db; clock: () => Date; onChange?: (organizationId: string) => void }) {
  /**
   * The priced catalog per organisation, trusted for PRICING_TRUST_MS without reading the database:
   * a change made here forgets it at once, and `onChange` tells the other instances (through the
   * database's notifications) to forget theirs, so a price change is in force everywhere within
   * milliseconds, and within PRICING_TRUST_MS even if a notification were lost.
   */
  const pricingCache = new Map<string, { version: number; catalog: Catalog | null; checkedAt: number }>();
  /** Runs one change in its transaction, then forgets the cached catalog here and on the other instances. */
  async function changing<T>(organizationId: string, work: (tx: Db) => Promise<T>): Promise<T> {
    try {
      return await db.transaction(work);
    } finally {
      pricingCache.delete(organizationId);
      onChange(organizationId);
    }
  }
  async function catalogRow(tx: Db, organizationId: string): Promise<CatalogRow | undefined> {
    const [row] = await tx.select().from(catalogs).where(eq(catalogs.organizationId, organizationId));
    return row;
  }

  /** The catalog row, created on the first write, locked for the rest of the transaction. */
  async function forWrite(tx: Db, organizationId: string): Promise<CatalogRow> {
    await tx
      .insert(catalogs)
      .values({ organizationId, currency: DEFAULT_CURRENCY, version: 0, createdAt: clock(), updatedAt: clock() })
      .onConflictDoNothing();
    const [row] = await tx.select().from(catalogs).where(eq(catalogs.organizationId, organizationId)).for('update');
    return row;
  }

  async function bump(tx: Db, organizationId: string): Promise<number> {
    const [row] = await tx
      .update(catalogs)
      .set({ version: sql`${catalogs.version} + 1`, updatedAt: clock() })
      .where(eq(catalogs.organizationId, organizationId))
      .returning({ version: catalogs.version });
    return row.version;
  }

  async function findItem(tx: Db, organizationId: string, sku: string): Promise<ItemRow | undefined> {
    const [row] = await tx
      .select()
      .from(catalogItems)
      .where(and(eq(catalogItems.organizationId, organizationId), eq(catalogItems.sku, sku)));
    return row;
  }

  return {
    async get(organizationId: string): Promise<StoredCatalog> {
      const row = await catalogRow(db, organizationId);
      const counts = await db
        .select({ n: count(), active: sql<number>`count(*) filter (where ${catalogItems.active})`.mapWith(Number) })
        .from(catalogItems)
        .where(eq(catalogItems.organizationId, organizationId));
      return {
        currency: row?.currency ?? DEFAULT_CURRENCY,
        taxRatePercent: (row?.taxRateBasisPoints ?? 0) / 100,
        version: row?.version ?? 0,
        itemCount: counts[0]?.n ?? 0,
        activeItemCount: counts[0]?.active ?? 0,
        updatedAt: row && row.version > 0 ? row.updatedAt.toISOString() : null,
      };
    },

    async update(organizationId: string, patch: PatchCatalog): Promise<{ changed: boolean }> {
      return changing(organizationId, async (tx) => {
        const row = await forWrite(tx, organizationId);
        const set: Partial<CatalogRow> = {};
        if (patch.currency !== undefined && patch.currency !== row.currency) {
          // Prices are kept in minor units: a currency with other decimals would change every price.
          if (minorUnitDigits(patch.currency) !== minorUnitDigits(row.currency)) {
            const [{ n }] = await tx
              .select({ n: count() })
              .from(catalogItems)
              .where(and(eq(catalogItems.organizationId, organizationId), sql`${catalogItems.unitPriceMinor} is not null`));
            if (n > 0) {
              throw new HttpProblem(409, 'currency_decimals_differ', 'Currency not changeable', `${patch.currency} has other decimals than ${row.currency}; remove or re-import the prices first.`);
            }
          }
          set.currency = patch.currency;
        }
        if (patch.taxRatePercent !== undefined) {
          const bp = Math.round(patch.taxRatePercent * 100);
          if (bp !== row.taxRateBasisPoints) set.taxRateBasisPoints = bp;
        }
        if (Object.keys(set).length === 0) return { changed: false };
        await tx.update(catalogs).set(set).where(eq(catalogs.organizationId, organizationId));
        await bump(tx, organizationId);
        return { changed: true };
      });
    },

    async list(organizationId: string, query: CatalogItemQuery): Promise<Page<StoredCatalogItem>> {
      const after = decodeCursor(query.cursor, z.string().min(1).max(64));
      const currency = (await catalogRow(db, organizationId))?.currency ?? DEFAULT_CURRENCY;
      const rows = await db
        .select()
        .from(catalogItems)
        .where(
          and(
            eq(catalogItems.organizationId, organizationId),
            query.kind ? eq(catalogItems.kind, query.kind) : undefined,
            query.active !== undefined ? eq(catalogItems.active, query.active) : undefined,
            after !== undefined ? gt(catalogItems.sku, after) : undefined,
          ),
        )
        .orderBy(asc(catalogItems.sku))
        .limit(query.limit + 1);
      return toPage(rows, query.limit, (r) => itemView(r, currency), (r) => r.sku);
    },

    async getItem(organizationId: string, sku: string): Promise<StoredCatalogItem> {
      const row = await findItem(db, organizationId, sku);
      if (!row) throw notFound(sku);
      const currency = (await catalogRow(db, organizationId))?.currency ?? DEFAULT_CURRENCY;
      return itemView(row, currency);
    },

    /** Creates an item; 409 when the SKU exists (PUT replaces one). */
    async create(organizationId: string, item: StoredCatalogItem): Promise<{ item: StoredCatalogItem; version: number }> {
      return changing(organizationId, async (tx) => {
        const catalog = await forWrite(tx, organizationId);
        if (await findItem(tx, organizationId, item.sku)) {
          throw new HttpProblem(409, 'sku_exists', 'SKU exists', `The catalog already has SKU ${item.sku}; PUT /v1/catalog/items/${item.sku} replaces it.`);
        }
        const [row] = await tx
          .insert(catalogItems)
          .values({ organizationId, ...itemColumns(item, catalog.currency), createdAt: clock(), updatedAt: clock() })
          .returning();
        return { item: itemView(row, catalog.currency), version: await bump(tx, organizationId) };
      });
    },

    /** Replaces an item's kind and fields (creates it when new); `created` tells which. */
    async replace(organizationId: string, item: StoredCatalogItem): Promise<{ item: StoredCatalogItem; created: boolean; changed: boolean }> {
      return changing(organizationId, async (tx) => {
        const catalog = await forWrite(tx, organizationId);
        const existing = await findItem(tx, organizationId, item.sku);
        const columns = itemColumns(item, catalog.currency);
        if (existing && sameItem(existing, columns)) return { item: itemView(existing, catalog.currency), created: false, changed: false };
        const [row] = existing
          ? await tx.update(catalogItems).set({ ...columns, updatedAt: clock() }).where(eq(catalogItems.id, existing.id)).returning()
          : await tx.insert(catalogItems).values({ organizationId, ...columns, createdAt: clock(), updatedAt: clock() }).returning();
        await bump(tx, organizationId);
        return { item: itemView(row, catalog.currency), created: !existing, changed: true };
      });
    },

    async patch(organizationId: string, sku: string, patch: PatchCatalogItem): Promise<{ item: StoredCatalogItem; changed: boolean }> {
      return changing(organizationId, async (tx) => {
        const catalog = await forWrite(tx, organizationId);
        const existing = await findItem(tx, organizationId, sku);
        if (!existing) throw notFound(sku);
        const set: Partial<ItemRow> = {};
        if (patch.description !== undefined) set.description = patch.description;
        if (patch.active !== undefined) set.active = patch.active;
        if (patch.unitPrice !== undefined) {
          if (patch.unitPrice === null) set.unitPriceMinor = null;
          else {
            const minor = toMinorUnits(patch.unitPrice, catalog.currency);
            if (minor === null) throw priceProblem('unitPrice', patch.unitPrice, catalog.currency);
            set.unitPriceMinor = minor;
          }
        }
        const changed = Object.entries(set).some(([k, v]) => existing[k as keyof ItemRow] !== v);
        if (!changed) return { item: itemView(existing, catalog.currency), changed: false };
        const [row] = await tx.update(catalogItems).set({ ...set, updatedAt: clock() }).where(eq(catalogItems.id, existing.id)).returning();
        await bump(tx, organizationId);
        return { item: itemView(row, catalog.currency), changed: true };
      });
    },

    /**
     * The active items as an inline catalog for the engine, with the version that holds them;
     * null when the organisation has no active item. One primary-key read per call: the items
     * are read again only when the version moved (any change bumps it, on any instance).
     */
    async pricingCatalog(organizationId: string): Promise<PricingCatalog | null> {
      const known = pricingCache.get(organizationId);
      const now = performance.now();
      if (known && now - known.checkedAt < PRICING_TRUST_MS) return known.catalog && { version: known.version, catalog: known.catalog };
      const row = await catalogRow(db, organizationId);
      if (!row) {
        pricingCache.set(organizationId, { version: 0, catalog: null, checkedAt: now });
        return null;
      }
      if (known && known.version === row.version) {
        known.checkedAt = now;
        return known.catalog && { version: known.version, catalog: known.catalog };
      }
      const rows = await db
        .select()
        .from(catalogItems)
        .where(and(eq(catalogItems.organizationId, organizationId), eq(catalogItems.active, true)))
        .orderBy(asc(catalogItems.sku));
      const items = rows.map((r) => {
        const { active: _active, ...item } = itemView(r, row.currency);
        return item as CatalogItem;
      });
      const catalog: Catalog | null =
        items.length > 0 ? { currency: row.currency, taxRatePercent: row.taxRateBasisPoints / 100, items } : null;
      if (pricingCache.size >= PRICING_CACHE_SIZE) pricingCache.delete(pricingCache.keys().next().value as string);
      pricingCache.set(organizationId, { version: row.version, catalog, checkedAt: now });
      return catalog && { version: row.version, catalog };
    },

    /** Every item, active and retired, by SKU (for the CSV export), with the catalog's currency. */
    async allItems(organizationId: string): Promise<{ currency: string; items: StoredCatalogItem[] }> {
      const currency = (await catalogRow(db, organizationId))?.currency ?? DEFAULT_CURRENCY;
      const rows = await db.select().from(catalogItems).where(eq(catalogItems.organizationId, organizationId)).orderBy(asc(catalogItems.sku));
      return { currency, items: rows.map((r) => itemView(r, currency)) };
    },

    async currencyOf(organizationId: string): Promise<string> {
      return (await catalogRow(db, organizationId))?.currency ?? DEFAULT_CURRENCY;
    },

    /**
     * Writes imported items all-or-nothing in one transaction: a new SKU is created, an existing
     * one replaced, an identical one left alone. The version moves once when anything changed.
     */
    async importItems(
      organizationId: string,
      items: readonly StoredCatalogItem[],
      { dryRun = false } = {},
    ): Promise<{ created: number; updated: number; unchanged: number; version: number }> {
      // A dry run does the same work and rolls it back, so its counts are exactly what an import would do.
      let outcome: { created: number; updated: number; unchanged: number; version: number } | undefined;
      try {
        return await changing(organizationId, async (tx) => {
          const catalog = await forWrite(tx, organizationId);
          let created = 0;
          let updated = 0;
          let unchanged = 0;
          for (const item of items) {
            const existing = await findItem(tx, organizationId, item.sku);
            const columns = itemColumns(item, catalog.currency);
            if (!existing) {
              await tx.insert(catalogItems).values({ organizationId, ...columns, createdAt: clock(), updatedAt: clock() });
              created++;
            } else if (sameItem(existing, columns)) {
              unchanged++;
            } else {
              await tx.update(catalogItems).set({ ...columns, updatedAt: clock() }).where(eq(catalogItems.id, existing.id));
              updated++;
            }
          }
          const version = created + updated > 0 ? await bump(tx, organizationId) : catalog.version;
          outcome = { created, updated, unchanged, version };
          if (dryRun) throw new DryRunRollback();
          return outcome;
        });
      } catch (err) {
        if (err instanceof DryRunRollback && outcome) return outcome;
        throw err;
      }
    },

    /** Forgets the cached catalog of an organisation (another instance changed it). */
    forget(organizationId: string): void {
      pricingCache.delete(organizationId);
    },

    /** Retires an item: it stays (old estimates name it) but is never picked again. */
    async retire(organizationId: string, sku: string): Promise<{ item: StoredCatalogItem; changed: boolean }> {
      return this.patch(organizationId, sku, { active: false });
    },
  };
}

class DryRunRollback extends Error {}

function sameItem(row: ItemRow, columns: ReturnType<typeof itemColumns>): boolean {
  return (
    row.kind === columns.kind &&
    row.description === columns.description &&
    row.unitPriceMinor === columns.unitPriceMinor &&
    row.active === columns.active &&
    JSON.stringify(sortKeys(row.fields)) === JSON.stringify(sortKeys(columns.fields))
  );
}

function sortKeys(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(sortKeys);
  if (value !== null && typeof value === 'object') {
    return Object.fromEntries(Object.keys(value).sort().map((k) => [k, sortKeys((value as Record<string, unknown>)[k])]));
  }
  return value;
}

export type CatalogService = ReturnType<typeof createCatalogService>;
