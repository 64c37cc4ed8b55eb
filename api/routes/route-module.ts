import type { Router } from 'express';
import type { AppDeps } from '../deps.js';
import type { DocsRegistrar } from '../openapi/document.js';

/** A resource's router and its OpenAPI entries, side by side. */
export interface RouteModule {
  /** Mount point, e.g. `/v1/health`. */
  basePath: string;
  router(deps: AppDeps): Router;
  docs: DocsRegistrar;
}
