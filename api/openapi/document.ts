import { OpenAPIRegistry, OpenApiGeneratorV31 } from '@asteasolutions/zod-to-openapi';
import { problemSchema } from '../../shared/schemas/problem.js';
import { API_VERSION } from '../version.js';

/** Each route module documents its own paths next to its handlers. */
export type DocsRegistrar = (registry: OpenAPIRegistry) => void;

export const problemResponse = (description: string) => ({
  description,
  content: { 'application/problem+json': { schema: problemSchema } },
});

export function buildOpenApiDocument(registrars: readonly DocsRegistrar[]) {
  const registry = new OpenAPIRegistry();
  registry.registerComponent('securitySchemes', 'bearer', {
    type: 'http',
    scheme: 'bearer',
    description:
      'An API key (`tw_server_…` from servers, `tw_embed_…` from allowed browser origins) or a console access token from `POST /v1/auth/sign-in`. ' +
      'The access token names the organisation its user acts in; `POST /v1/auth/switch-organization` issues one for another.',
  });
  for (const register of registrars) register(registry);
  return new OpenApiGeneratorV31(registry.definitions).generateDocument({
    openapi: '3.1.0',
    info: {
      title: 'Treadwise API',
      version: API_VERSION,
      // The package is UNLICENSED: the API and its document are not licensed for reuse.
      license: { name: 'Proprietary', identifier: 'LicenseRef-Proprietary' },
      description:
        'Sizing for motion-activated LED lighting on stairs and corridors: strip per tread, ' +
        'controller outputs, drivers, cable and voltage drop, pixel data, reels, sensors and the ' +
        'bill of materials. Errors are RFC 9457 problem+json; every response carries `X-Request-Id`. Lists answer `{ items, nextCursor }` (`nextCursor` is null on the last page). A replayed `Idempotency-Key` request answers the stored response byte for byte, its `requestId` that of the first call.\n\n' +
        'Figures are estimates from nominal data. Mains work is for a licensed electrician; local codes prevail.',
    },
    servers: [{ url: '/' }],
    tags: [
      { name: 'Health', description: 'Liveness and readiness.' },
      { name: 'Calculations', description: 'Stateless sizing calculations (scope sizing:run; estimator role).' },
      { name: 'API keys', description: 'Server and embed keys (admin role or keys:manage scope).' },
      { name: 'Auth', description: 'Console sign-in, sessions, password reset and invitations.' },
      { name: 'Members', description: 'People in an organisation and their roles (admin, estimator, viewer).' },
      { name: 'Organizations', description: 'Partner organisations and their plans (created by the operator).' },
      { name: 'Usage', description: 'Calls counted per key, day, route and status, with latency.' },
      { name: 'Audit', description: 'Who did what, when and from where.' },
      { name: 'Operations', description: 'Metrics for the platform operator’s scraper (outside /v1).' },
      { name: 'Development', description: 'Local stand-ins for hosted services (only without real configuration).' },
    ],
  });
}
