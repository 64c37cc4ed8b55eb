import { HttpClient, type HttpResponse } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { type Observable, map } from 'rxjs';

import type { ApiKeyPage, UsageReport } from '../core/api-types.js';
import type { TrafficFilter } from './traffic-data.js';

function query(filter: TrafficFilter, keyId = filter.keyId): Record<string, string> {
  const params: Record<string, string> = { from: filter.from, to: filter.to };
  if (keyId) params['keyId'] = keyId;
  return params;
}

/** The organisation's API traffic, through /v1/usage. */
@Injectable({ providedIn: 'root' })
export class TrafficApi {
  private readonly http = inject(HttpClient);

  /** The report for the filter; `keyId` overrides the filter's key (one series of the chart). */
  report(filter: TrafficFilter, keyId?: string): Observable<UsageReport> {
    return this.http.get<UsageReport>('/v1/usage', { params: query(filter, keyId ?? filter.keyId) });
  }

  /** The same counters as CSV, as the usage export route sends them. */
  exportCsv(filter: TrafficFilter): Observable<HttpResponse<Blob>> {
    return this.http.get('/v1/usage/export', { params: query(filter), observe: 'response', responseType: 'blob' });
  }

  /** Names for key ids (admins only may list keys). */
  keyNames(): Observable<Map<string, string>> {
    return this.http.get<ApiKeyPage>('/v1/keys', { params: { limit: 200 } }).pipe(map((page) => new Map(page.items.map((k) => [k.keyId, k.name]))));
  }
}
