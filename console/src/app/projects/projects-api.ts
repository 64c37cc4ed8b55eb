import { HttpClient, HttpHeaders, type HttpResponse } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { type Observable, EMPTY, expand, map, reduce } from 'rxjs';

import type {
  CreateProjectRequest,
  CreateStairRequest,
  KitOptionsRequest,
  KitOptionsResponse,
  PatchStairRequest,
  Project,
  ProjectPage,
  RerunEstimate,
  Stair,
  StairPage,
  StoredEstimate,
  StoredEstimatePage,
  StoredEstimateSummary,
} from '../core/api-types.js';

// The largest page the API answers (shared/schemas/page.ts PAGE_LIMIT_MAX).
const PAGE_SIZE = 200;

/** The files a stored estimate can be downloaded as (api/routes/estimate-exports.ts). */
export type EstimateDocument = 'wiring-schedule.csv' | 'bom.csv' | 'document.pdf';

const enc = encodeURIComponent;

/** Projects, their stairs and stored estimates, and kit options, through the public API. */
@Injectable({ providedIn: 'root' })
export class ProjectsApi {
  private readonly http = inject(HttpClient);

  /** Every page of a cursor-paged list, joined. */
  private all<T>(url: string): Observable<T[]> {
    const page = (cursor?: string) => this.http.get<{ items: T[]; nextCursor: string | null }>(url, { params: cursor ? { limit: PAGE_SIZE, cursor } : { limit: PAGE_SIZE } });
    return page().pipe(
      expand((p) => (p.nextCursor ? page(p.nextCursor) : EMPTY)),
      map((p) => p.items),
      reduce((all, items) => [...all, ...items], [] as T[]),
    );
  }

  projects(): Observable<Project[]> {
    return this.all<ProjectPage['items'][number]>('/v1/projects');
  }

  project(id: string): Observable<Project> {
    return this.http.get<Project>(`/v1/projects/${enc(id)}`);
  }

  /** `idempotencyKey` stays the same for retries of one creation, so a lost answer never makes two. */
  createProject(request: CreateProjectRequest, idempotencyKey: string): Observable<Project> {
    return this.http.post<Project>('/v1/projects', request, { headers: new HttpHeaders({ 'Idempotency-Key': idempotencyKey }) });
  }

  stairs(projectId: string): Observable<Stair[]> {
    return this.all<StairPage['items'][number]>(`/v1/projects/${enc(projectId)}/stairs`);
  }

  stair(projectId: string, stairId: string): Observable<Stair> {
    return this.http.get<Stair>(`/v1/projects/${enc(projectId)}/stairs/${enc(stairId)}`);
  }

  createStair(projectId: string, request: CreateStairRequest, idempotencyKey: string): Observable<Stair> {
    return this.http.post<Stair>(`/v1/projects/${enc(projectId)}/stairs`, request, { headers: new HttpHeaders({ 'Idempotency-Key': idempotencyKey }) });
  }

  patchStair(projectId: string, stairId: string, patch: PatchStairRequest): Observable<Stair> {
    return this.http.patch<Stair>(`/v1/projects/${enc(projectId)}/stairs/${enc(stairId)}`, patch);
  }

  /** Runs the stair's stored request and stores the estimate. */
  run(projectId: string, stairId: string): Observable<StoredEstimate> {
    return this.http.post<StoredEstimate>(`/v1/projects/${enc(projectId)}/stairs/${enc(stairId)}/estimates`, {});
  }

  estimates(projectId: string, stairId: string): Observable<StoredEstimateSummary[]> {
    return this.all<StoredEstimatePage['items'][number]>(`/v1/projects/${enc(projectId)}/stairs/${enc(stairId)}/estimates`);
  }

  estimate(estimateId: string): Observable<StoredEstimate> {
    return this.http.get<StoredEstimate>(`/v1/estimates/${enc(estimateId)}`);
  }

  /** Runs the same input again with today's engine and catalog, and says what changed. */
  rerun(estimateId: string): Observable<RerunEstimate> {
    return this.http.post<RerunEstimate>(`/v1/estimates/${enc(estimateId)}/rerun`, {});
  }

  /** Through HttpClient, so the access token goes with it; the caller saves the Blob. */
  download(estimateId: string, document: EstimateDocument): Observable<HttpResponse<Blob>> {
    return this.http.get(`/v1/estimates/${enc(estimateId)}/${document}`, { observe: 'response', responseType: 'blob' });
  }

  kitOptions(request: KitOptionsRequest): Observable<KitOptionsResponse> {
    return this.http.post<KitOptionsResponse>('/v1/estimates/options', request);
  }
}
