import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';

import type { EmbedManifest } from '../core/api-types.js';

/** The current `<treadwise-estimator>` script's version and SRI hash (api/routes/embed-script.ts). */
@Injectable({ providedIn: 'root' })
export class EmbedManifestApi {
  private readonly http = inject(HttpClient);

  manifest(): Observable<EmbedManifest> {
    return this.http.get<EmbedManifest>('/embed/v1/manifest.json');
  }
}
