import { Injectable, InjectionToken, inject } from '@angular/core';
import { Observable } from 'rxjs';
import type { KitOptionsRequest, KitOptionsResponse, StoredCatalogItemPage, StoredCatalogStrip } from './api-types.js';
import { originRefused, problemFromAnswer, unreachable, type ShopperProblem } from './shopper-problem.js';

/** The browser's fetch; a token so specs hand in a fake server. */
export const FETCH = new InjectionToken<typeof fetch>('fetch', { factory: () => globalThis.fetch.bind(globalThis) });

export interface ApiTarget {
  apiUrl: string;
  embedKey: string;
}

/** Thrown into the observable's error channel: always something the shopper can read. */
export class ShopperError extends Error {
  constructor(readonly problem: ShopperProblem) {
    super(problem.message);
  }
}

/**
 * The two calls the element makes with the shop's embed key. Each is an observable whose
 * unsubscription aborts the request, so switchMap cancels a superseded estimate on the wire.
 */
@Injectable({ providedIn: 'root' })
export class EstimatorApi {
  private readonly fetch = inject(FETCH);

  /** Ranked kits from the shop's stored catalog (POST /v1/estimates/options). */
  kitOptions(target: ApiTarget, body: KitOptionsRequest): Observable<KitOptionsResponse> {
    return this.call<KitOptionsResponse>(target, '/v1/estimates/options', { method: 'POST', body: JSON.stringify(body) });
  }

  /** The shop's active strips (embed keys see active items only), the choices the shopper picks from. */
  strips(target: ApiTarget): Observable<StoredCatalogStrip[]> {
    return new Observable<StoredCatalogStrip[]>((subscriber) =>
      this.call<StoredCatalogItemPage>(target, '/v1/catalog/items?kind=strip&limit=100', { method: 'GET' }).subscribe({
        next: (page) => subscriber.next(page.items.filter((item): item is StoredCatalogStrip => item.kind === 'strip')),
        error: (err) => subscriber.error(err),
        complete: () => subscriber.complete(),
      }),
    );
  }

  private call<T>(target: ApiTarget, path: string, init: RequestInit): Observable<T> {
    const base = target.apiUrl.replace(/\/+$/, '');
    return new Observable<T>((subscriber) => {
      const abort = new AbortController();
      const headers: Record<string, string> = { authorization: `Bearer ${target.embedKey}`, accept: 'application/json' };
      if (init.body) headers['content-type'] = 'application/json';
      this.fetch(`${base}${path}`, { ...init, headers, signal: abort.signal, credentials: 'omit', mode: 'cors' })
        .then(async (res) => {
          const body = await res.json().catch(() => null);
          if (res.ok) {
            subscriber.next(body as T);
            subscriber.complete();
          } else {
            subscriber.error(new ShopperError(problemFromAnswer(res.status, body, res.headers.get('retry-after'))));
          }
        })
        .catch(async (err: unknown) => {
          if (abort.signal.aborted) return; // superseded: nobody waits for this answer
          if (err instanceof ShopperError) return subscriber.error(err);
          subscriber.error(new ShopperError(await this.whyUnreadable(base)));
        });
      return () => abort.abort();
    });
  }

  /**
   * A browser hides why a cross-origin call failed. The API answers a page whose origin the key
   * does not allow without CORS headers, which looks like a network error; the script's manifest
   * is open to every origin, so reaching it tells the two apart (the API is up: the origin was refused).
   */
  private async whyUnreadable(base: string): Promise<ShopperProblem> {
    try {
      await this.fetch(`${base}/embed/v1/manifest.json`, { mode: 'cors', credentials: 'omit', cache: 'no-store' });
      return originRefused();
    } catch {
      return unreachable();
    }
  }
}
