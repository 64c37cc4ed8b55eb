import type { Router } from 'express';
import type { Config } from '../config.js';
import type { AppDeps } from '../deps.js';
import type { DocsRegistrar } from '../openapi/document.js';
import type { Services } from '../services/container.js';

/** A resource's router and its OpenAPI entries, side by side. */
export interface RouteModule {
  /** Mount point, e.g. `/v1/health`. */
  basePath: string;
  router(deps: AppDeps, services: Services): Router;
  docs: DocsRegistrar;
  /** False when this configuration must not expose the module at all (not mounted, not documented). */
  enabled?(config: Config): boolean;
}

export function enabledModules<M extends RouteModule>(modules: readonly M[], config: Config): M[] {
  return modules.filter((m) => m.enabled?.(config) ?? true);
}
