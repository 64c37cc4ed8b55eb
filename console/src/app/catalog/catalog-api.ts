import { HttpClient, type HttpResponse } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { type Observable, EMPTY, expand, map, reduce } from 'rxjs';

import type { CatalogImportReport, PatchCatalogItem, StoredCatalog, StoredCatalogItem, StoredCatalogItemPage } from '../core/api-types.js';

// The largest page the API answers (shared/schemas/page.ts PAGE_LIMIT_MAX).
const PAGE_SIZE = 200;

/** The organisation's stored catalog, through /v1/catalog. */
@Injectable({ providedIn: 'root' })
export class CatalogApi {
  private readonly http = inject(HttpClient);

  catalog(): Observable<StoredCatalog> {
    return this.http.get<StoredCatalog>('/v1/catalog');
  }

  /** Every item, active and retired, page after page: the table sorts and filters them all. */
  allItems(): Observable<StoredCatalogItem[]> {
    const page = (cursor?: string) =>
      this.http.get<StoredCatalogItemPage>('/v1/catalog/items', { params: cursor ? { limit: PAGE_SIZE, cursor } : { limit: PAGE_SIZE } });
    return page().pipe(
      expand((p) => (p.nextCursor ? page(p.nextCursor) : EMPTY)),
      map((p) => p.items),
      reduce((all, items) => [...all, ...items], [] as StoredCatalogItem[]),
    );
  }

  /** `dryRun` answers the row-by-row report and writes nothing. */
  import(file: File, dryRun: boolean): Observable<CatalogImportReport> {
    const body = new FormData();
    body.append('file', file, file.name);
    return this.http.post<CatalogImportReport>('/v1/catalog/imports', body, { params: { dryRun: String(dryRun) } });
  }

  patchItem(sku: string, patch: PatchCatalogItem): Observable<StoredCatalogItem> {
    return this.http.patch<StoredCatalogItem>(`/v1/catalog/items/${encodeURIComponent(sku)}`, patch);
  }

  /** Retires the SKU: kept for old estimates, never picked again. */
  retire(sku: string): Observable<StoredCatalogItem> {
    return this.http.delete<StoredCatalogItem>(`/v1/catalog/items/${encodeURIComponent(sku)}`);
  }

  export(): Observable<HttpResponse<Blob>> {
    return this.http.get('/v1/catalog/export', { observe: 'response', responseType: 'blob' });
  }
}
