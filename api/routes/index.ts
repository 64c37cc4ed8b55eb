import { catalogRoutes } from './catalog.js';
import { calculationRoutes } from './calculations.js';
import { estimateRoutes } from './estimates.js';
import { estimateOptionRoutes } from './estimate-options.js';
import { estimateBatchRoutes } from './estimates-batch.js';
import { batchTemplateRoutes } from './batch-template.js';
import { batchRoutes } from './batches.js';
import { healthRoutes } from './health.js';
import { keyRoutes } from './keys.js';
import { auditRoutes } from './audit.js';
import { authRoutes } from './auth.js';
import { memberRoutes } from './members.js';
import { organizationRoutes } from './organizations.js';
import { projectRoutes } from './projects.js';
import { storedEstimateRoutes } from './stored-estimates.js';
import { outboxRoutes } from './outbox.js';
import { usageRoutes } from './usage.js';
import { embedScriptRoutes } from './embed-script.js';
import { billingRoutes } from './billing.js';
import type { RouteModule } from './route-module.js';

/** Every resource the API mounts, in one list: the app and the OpenAPI document both use it. */
export const routeModules: readonly RouteModule[] = [healthRoutes, calculationRoutes, estimateRoutes, estimateOptionRoutes, estimateBatchRoutes, keyRoutes, authRoutes, memberRoutes, organizationRoutes, outboxRoutes, usageRoutes, auditRoutes, catalogRoutes, projectRoutes, storedEstimateRoutes, batchTemplateRoutes, batchRoutes, embedScriptRoutes, billingRoutes];
