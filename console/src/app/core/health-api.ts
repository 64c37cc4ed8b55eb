import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';

// The wire types come from the zod schemas the API validates and documents its answers with.
// Type-only imports, so zod itself stays out of the console bundle.
import type { Health, Readiness } from '../../../../shared/schemas/health.js';

export type { Health, Readiness };

// A health check that hangs is as bad as one that fails; give up well before a user would.
const HEALTH_TIMEOUT_MS = 10_000;

@Injectable({ providedIn: 'root' })
export class HealthApi {
  private readonly http = inject(HttpClient);

  liveness(): Observable<Health> {
    return this.http.get<Health>('/v1/health', { timeout: HEALTH_TIMEOUT_MS });
  }

  readiness(): Observable<Readiness> {
    return this.http.get<Readiness>('/v1/health/ready', { timeout: HEALTH_TIMEOUT_MS });
  }
}
