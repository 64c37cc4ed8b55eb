import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { type Observable, map } from 'rxjs';

import type { OrganizationPage, OrganizationRef } from '../core/api-types.js';

// The operator's switcher lists one page; a platform with more organisations than this wants a search.
const SWITCHER_PAGE_SIZE = 200;

@Injectable({ providedIn: 'root' })
export class OrganizationsApi {
  private readonly http = inject(HttpClient);

  /** Organisations the caller may read: their own, or every one for the operator. */
  list(): Observable<OrganizationRef[]> {
    return this.http
      .get<OrganizationPage>('/v1/organizations', { params: { limit: SWITCHER_PAGE_SIZE } })
      .pipe(map((page) => page.items.map(({ id, slug, name }) => ({ id, slug, name }))));
  }
}
