import type { StoredCatalogItem } from '../core/api-types.js';

// Fields the table shows in columns of their own.
const OWN_COLUMNS = new Set(['sku', 'kind', 'description', 'unitPrice', 'active']);

function show(value: unknown): string {
  if (Array.isArray(value)) return value.map(show).join(', ');
  if (value !== null && typeof value === 'object') {
    return Object.entries(value)
      .map(([key, inner]) => `${key} ${show(inner)}`)
      .join(', ');
  }
  return String(value);
}

/** The kind's own figures in one line (`voltageV 24 · ratingW 100`), for the table and the filter. */
export function catalogItemDetails(item: StoredCatalogItem): string {
  return Object.entries(item)
    .filter(([key, value]) => !OWN_COLUMNS.has(key) && value !== undefined)
    .map(([key, value]) => `${key} ${show(value)}`)
    .join(' · ');
}

/** What the filter box matches: SKU, kind, name, figures and state. */
export function catalogItemFilterText(item: StoredCatalogItem): string {
  return [item.sku, item.kind, item.description ?? '', catalogItemDetails(item), item.active === false ? 'retired' : 'active'].join(' ').toLowerCase();
}
