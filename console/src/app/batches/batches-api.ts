import { HttpClient, type HttpResponse } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';

import type { Batch, BatchPage } from '../core/api-types.js';

export type BatchDetail = 'summary' | 'full';
export type ResultFormat = 'csv' | 'ndjson';

/** Batch jobs, through /v1/batches. */
@Injectable({ providedIn: 'root' })
export class BatchesApi {
  private readonly http = inject(HttpClient);

  list(cursor?: string): Observable<BatchPage> {
    return this.http.get<BatchPage>('/v1/batches', { params: cursor ? { limit: 50, cursor } : { limit: 50 } });
  }

  /** The whole response: while the job runs, its Retry-After says when to ask again. */
  get(id: string): Observable<HttpResponse<Batch>> {
    return this.http.get<Batch>(`/v1/batches/${encodeURIComponent(id)}`, { observe: 'response' });
  }

  create(file: File, name: string, detail: BatchDetail): Observable<Batch> {
    const body = new FormData();
    if (name) body.append('name', name);
    body.append('file', file, file.name);
    return this.http.post<Batch>('/v1/batches', body, { params: { detail } });
  }

  cancel(id: string): Observable<Batch> {
    return this.http.post<Batch>(`/v1/batches/${encodeURIComponent(id)}/cancel`, null);
  }

  results(id: string, format: ResultFormat): Observable<HttpResponse<Blob>> {
    return this.http.get(`/v1/batches/${encodeURIComponent(id)}/results`, { params: { format }, observe: 'response', responseType: 'blob' });
  }

  errors(id: string): Observable<HttpResponse<Blob>> {
    return this.http.get(`/v1/batches/${encodeURIComponent(id)}/errors`, { params: { format: 'csv' }, observe: 'response', responseType: 'blob' });
  }

  template(): Observable<HttpResponse<Blob>> {
    return this.http.get('/v1/batches/template.csv', { observe: 'response', responseType: 'blob' });
  }
}
