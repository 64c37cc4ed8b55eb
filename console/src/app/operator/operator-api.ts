import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';

import type { Organization, OrganizationPage, OutboxPage } from '../core/api-types.js';

const PAGE_SIZE = 50;

/** The operator's calls: every organisation and its plan, and the local mail sink. */
@Injectable({ providedIn: 'root' })
export class OperatorApi {
  private readonly http = inject(HttpClient);

  organizations(cursor?: string): Observable<OrganizationPage> {
    return this.http.get<OrganizationPage>('/v1/organizations', { params: paged(cursor) });
  }

  changePlan(id: string, planId: string): Observable<Organization> {
    return this.http.patch<Organization>(`/v1/organizations/${encodeURIComponent(id)}`, { planId });
  }

  outbox(cursor?: string): Observable<OutboxPage> {
    return this.http.get<OutboxPage>('/v1/dev/outbox', { params: paged(cursor) });
  }
}

function paged(cursor: string | undefined): Record<string, string | number> {
  return cursor ? { limit: PAGE_SIZE, cursor } : { limit: PAGE_SIZE };
}
