import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';

/** The stateless calculation endpoints, /v1/calculations/*. */
@Injectable({ providedIn: 'root' })
export class BenchApi {
  private readonly http = inject(HttpClient);

  calculate(path: string, body: unknown): Observable<unknown> {
    return this.http.post<unknown>(path, body);
  }
}
