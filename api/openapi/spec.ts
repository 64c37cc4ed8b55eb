import type { Config } from '../config.js';
import { routeModules } from '../routes/index.js';
import { metricsDocs } from '../routes/metrics.js';
import { enabledModules } from '../routes/route-module.js';
import { buildOpenApiDocument } from './document.js';

export type OpenApiDocument = ReturnType<typeof buildOpenApiDocument>;

const cache = new Map<string, OpenApiDocument>();

/**
 * The document for a configuration (modules it disables are left out); without one, every
 * module — the committed openapi/openapi.json. Built once per process and configuration.
 */
export function openApiDocument(config?: Config): OpenApiDocument {
  const modules = config ? enabledModules(routeModules, config) : routeModules;
  const key = modules.map((m) => m.basePath).join(',');
  let doc = cache.get(key);
  if (!doc) {
    doc = buildOpenApiDocument([...modules.map((m) => m.docs), metricsDocs]);
    cache.set(key, doc);
  }
  return doc;
}
