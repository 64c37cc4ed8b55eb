import { calculationRoutes } from './calculations.js';
import { healthRoutes } from './health.js';
import type { RouteModule } from './route-module.js';

/** Every resource the API mounts, in one list: the app and the OpenAPI document both use it. */
export const routeModules: readonly RouteModule[] = [healthRoutes, calculationRoutes];
