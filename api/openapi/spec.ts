import { routeModules } from '../routes/index.js';
import { buildOpenApiDocument } from './document.js';

export type OpenApiDocument = ReturnType<typeof buildOpenApiDocument>;

let cached: OpenApiDocument | undefined;

/** The document is the same for the life of the process: build it once. */
export function openApiDocument(): OpenApiDocument {
  cached ??= buildOpenApiDocument(routeModules.map((m) => m.docs));
  return cached;
}
