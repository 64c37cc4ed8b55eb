import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { type Observable, map } from 'rxjs';

import type { AuditEventPage, MemberPage } from '../core/api-types.js';

export const ACTIVITY_PAGE_SIZE = 25;

/** The organisation's audit trail, newest first, through /v1/audit-events. */
@Injectable({ providedIn: 'root' })
export class ActivityApi {
  private readonly http = inject(HttpClient);

  page(filter: { action?: string; cursor?: string }): Observable<AuditEventPage> {
    const params: Record<string, string | number> = { limit: ACTIVITY_PAGE_SIZE };
    if (filter.action) params['action'] = filter.action;
    if (filter.cursor) params['cursor'] = filter.cursor;
    return this.http.get<AuditEventPage>('/v1/audit-events', { params });
  }

  /** Members by user id, so the trail names people rather than ids (former members stay ids). */
  memberNames(): Observable<Map<string, string>> {
    return this.http
      .get<MemberPage>('/v1/members', { params: { limit: 200 } })
      .pipe(map((page) => new Map(page.items.map((m) => [m.userId, m.name ? `${m.name} (${m.email})` : m.email]))));
  }
}
