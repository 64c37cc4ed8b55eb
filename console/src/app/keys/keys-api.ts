import { HttpClient, HttpHeaders } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';

import type { ApiKey, ApiKeyPage, ApiKeyWithToken, CreateApiKeyRequest, RotateApiKeyRequest } from '../core/api-types.js';

const PAGE_SIZE = 100;

/** The organisation's API keys, through /v1/keys. */
@Injectable({ providedIn: 'root' })
export class KeysApi {
  private readonly http = inject(HttpClient);

  list(cursor?: string): Observable<ApiKeyPage> {
    const params: Record<string, string | number> = { limit: PAGE_SIZE };
    if (cursor) params['cursor'] = cursor;
    return this.http.get<ApiKeyPage>('/v1/keys', { params });
  }

  /** `idempotencyKey` stays the same for retries of one creation, so a lost answer never makes two keys. */
  create(request: CreateApiKeyRequest, idempotencyKey: string): Observable<ApiKeyWithToken> {
    return this.http.post<ApiKeyWithToken>('/v1/keys', request, { headers: new HttpHeaders({ 'Idempotency-Key': idempotencyKey }) });
  }

  rotate(id: string, request: RotateApiKeyRequest): Observable<ApiKeyWithToken> {
    return this.http.post<ApiKeyWithToken>(`/v1/keys/${encodeURIComponent(id)}/rotate`, request);
  }

  revoke(id: string): Observable<ApiKey> {
    return this.http.post<ApiKey>(`/v1/keys/${encodeURIComponent(id)}/revoke`, {});
  }
}
